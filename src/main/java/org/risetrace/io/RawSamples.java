package org.risetrace.io;

/**
 * Samples as a container stores them, before the calibration profile maps them to temperature. Exactly one of
 * {@code u16}, {@code u8} and {@code values} is set, according to {@code kind}. Arrays are row-major,
 * length width * height.
 *
 * @param width    pixels per row
 * @param height   rows
 * @param kind     what the samples are
 * @param bitDepth bits per stored sample (8, 16, 32; 0 for text)
 * @param maxValue the sample value that means "full scale" for grey samples (255 for 8-bit, a PGM's maxval)
 * @param u16      unsigned 16-bit counts (read with {@code & 0xFFFF})
 * @param u8       unsigned 8-bit grey levels (read with {@code & 0xFF})
 * @param values   float samples or text-matrix values
 * @param detail   how the container stored them, e.g. "LZW, tiled, little-endian"
 */
public record RawSamples(int width, int height, Kind kind, int bitDepth, int maxValue,
                         short[] u16, byte[] u8, float[] values, String detail) {

    public enum Kind {
        /** Integer counts of more than 8 bits: need a linear profile. */
        COUNTS,
        /** 8-bit (or PGM maxval up to 255) grey levels: need a span. */
        GREY,
        /** Floating-point samples holding temperature in the profile's unit. */
        FLOAT,
        /** Numbers from a text matrix: temperatures (matrix/float profile) or counts (linear profile). */
        TEXT
    }

    public static RawSamples counts(int w, int h, int bitDepth, short[] u16, String detail) {
        return new RawSamples(w, h, Kind.COUNTS, bitDepth, 65535, u16, null, null, detail);
    }

    public static RawSamples grey(int w, int h, int maxValue, byte[] u8, String detail) {
        return new RawSamples(w, h, Kind.GREY, 8, maxValue, null, u8, null, detail);
    }

    public static RawSamples floats(int w, int h, float[] values, String detail) {
        return new RawSamples(w, h, Kind.FLOAT, 32, 0, null, null, values, detail);
    }

    public static RawSamples text(int w, int h, float[] values, String detail) {
        return new RawSamples(w, h, Kind.TEXT, 0, 0, null, null, values, detail);
    }

    /** Human words for the kind, for messages. */
    public String describe() {
        return switch (kind) {
            case COUNTS -> bitDepth + "-bit integer counts";
            case GREY -> "8-bit grey levels";
            case FLOAT -> "32-bit float samples";
            case TEXT -> "a text matrix of numbers";
        };
    }
}
