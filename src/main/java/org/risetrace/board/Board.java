package org.risetrace.board;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;

import java.util.List;

/**
 * The board file ({@code board.json}): the board's size, its outline as the user marked it on a reference frame,
 * the marked parts and optional ambient areas, all in board millimetres (origin at the marked top-left corner,
 * x to the right, y down). Read and validated by {@link BoardFile}.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Board(
        @JsonProperty("name") String name,
        @JsonProperty("size_mm") double[] sizeMm,
        @JsonProperty("outline") Outline outline,
        @JsonProperty("parts") List<Part> parts,
        @JsonProperty("ambient") List<Area> ambient) {

    public double widthMm() { return sizeMm[0]; }
    public double heightMm() { return sizeMm[1]; }

    public List<Part> partsOrEmpty() { return parts == null ? List.of() : parts; }
    public List<Area> ambientOrEmpty() { return ambient == null ? List.of() : ambient; }
}
