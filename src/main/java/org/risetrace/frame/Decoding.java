package org.risetrace.frame;

/**
 * How a frame was decoded: the container format, the stored sample depth and the calibration profile applied.
 *
 * @param container e.g. "png", "tiff", "pgm", "jpeg", "bmp", "csv"
 * @param bitDepth  bits per stored sample (8, 16, 32); 0 for text matrices
 * @param profile   name of the calibration profile that mapped samples to temperature
 * @param detail    free text, e.g. "LZW, tiled, little-endian"; may be empty
 */
public record Decoding(String container, int bitDepth, String profile, String detail) {
}
