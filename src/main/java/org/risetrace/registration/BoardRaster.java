package org.risetrace.registration;

/**
 * A frame resampled into board space: pixel (i, j) covers board point ((i + 0.5) / pxPerMm, (j + 0.5) / pxPerMm) mm.
 *
 * @param width    board-space pixels per row
 * @param height   rows
 * @param pxPerMm  resolution
 * @param celsius  temperatures row-major; NaN where invalid
 * @param valid    true where the board pixel fell inside the source frame
 */
public record BoardRaster(int width, int height, double pxPerMm, float[] celsius, boolean[] valid) {

    public double xMm(int i) { return (i + 0.5) / pxPerMm; }

    public double yMm(int j) { return (j + 0.5) / pxPerMm; }
}
