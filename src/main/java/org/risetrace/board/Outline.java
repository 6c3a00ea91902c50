package org.risetrace.board;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;

import java.util.Map;

/**
 * Where the user marked the board's four corners: in the reference frame, and optionally in other frames
 * (those marks override automatic registration for that frame).
 *
 * @param frame     file name of the reference frame
 * @param cornersPx board top-left, top-right, bottom-right, bottom-left, each [x, y] in that frame's pixels
 * @param frames    optional user-marked corners for other frames, by file name
 */
@JsonInclude(JsonInclude.Include.NON_EMPTY)
public record Outline(
        @JsonProperty("frame") String frame,
        @JsonProperty("corners_px") double[][] cornersPx,
        @JsonProperty("frames") Map<String, double[][]> frames) {
}
