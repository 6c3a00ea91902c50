package org.risetrace.analysis;

/**
 * A scalar map in board space (rise in K, onset time in s, ...): pixel (i, j) covers board point
 * ((i + 0.5) / pxPerMm, (j + 0.5) / pxPerMm) mm. NaN where there is no value.
 */
public record BoardMap(int width, int height, double pxPerMm, float[] values, String unit) {
}
