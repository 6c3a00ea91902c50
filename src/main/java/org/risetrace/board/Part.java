package org.risetrace.board;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * A marked part: a rectangle in board millimetres given by its centre, size and rotation.
 *
 * @param ref         designator, unique on the board (e.g. "Q4")
 * @param kind        optional free word: mosfet, inductor, capacitor, ic, resistor ...
 * @param material    optional material name from calibration/materials.json (sets emissivity)
 * @param xMm         centre x
 * @param yMm         centre y
 * @param wMm         width along the part's own x axis
 * @param hMm         height along the part's own y axis
 * @param rotationDeg counter-clockwise rotation as seen in the board's x-right, y-down frame; may be null (0)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Part(
        @JsonProperty("ref") String ref,
        @JsonProperty("kind") String kind,
        @JsonProperty("material") String material,
        @JsonProperty("x_mm") double xMm,
        @JsonProperty("y_mm") double yMm,
        @JsonProperty("w_mm") double wMm,
        @JsonProperty("h_mm") double hMm,
        @JsonProperty("rotation_deg") Double rotationDeg) {

    public double rotationOrZero() { return rotationDeg == null ? 0.0 : rotationDeg; }

    /** True when board point (x, y) mm lies inside the part's footprint rectangle. */
    public boolean contains(double x, double y) {
        double a = Math.toRadians(rotationOrZero());
        double dx = x - xMm, dy = y - yMm;
        // rotate the point into the part's frame (inverse rotation)
        double u = dx * Math.cos(a) - dy * Math.sin(a);
        double v = dx * Math.sin(a) + dy * Math.cos(a);
        return Math.abs(u) <= wMm / 2 && Math.abs(v) <= hMm / 2;
    }
}
