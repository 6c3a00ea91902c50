package org.risetrace.board;

import com.fasterxml.jackson.annotation.JsonProperty;

/** An axis-aligned rectangle in board millimetres given by its centre and size (ambient reference areas). */
public record Area(
        @JsonProperty("x_mm") double xMm,
        @JsonProperty("y_mm") double yMm,
        @JsonProperty("w_mm") double wMm,
        @JsonProperty("h_mm") double hMm) {

    public boolean contains(double x, double y) {
        return Math.abs(x - xMm) <= wMm / 2 && Math.abs(y - yMm) <= hMm / 2;
    }
}
