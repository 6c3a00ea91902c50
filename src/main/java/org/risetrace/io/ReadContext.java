package org.risetrace.io;

import org.risetrace.calibration.Profile;

/**
 * What a reader needs besides the file: the calibration profile, the temperature span for 8-bit grey frames and
 * the pixel limit.
 *
 * @param profile   profile that maps samples to temperature; null lets the reader assume the default for the
 *                  samples it finds (16-bit: u16-centikelvin, float: f32-celsius, 8-bit: u8-span, text: matrix-celsius)
 * @param spanC     [low, high] degrees Celsius for this frame when it is 8-bit grey (nullable: then the profile's)
 * @param maxPixels largest width * height accepted; a header claiming more is refused before any allocation
 */
public record ReadContext(Profile profile, double[] spanC, long maxPixels) {
    /** Default pixel limit: 50 megapixels (a 7072 x 7072 frame), far above any thermal camera's resolution. */
    public static final long DEFAULT_MAX_PIXELS = 50_000_000L;

    public ReadContext {
        if (maxPixels <= 0) throw new IllegalArgumentException("maxPixels must be positive: " + maxPixels);
    }

    /** The default context: profile chosen from the samples, no span, the default pixel limit. */
    public static ReadContext defaults() {
        return new ReadContext(null, null, DEFAULT_MAX_PIXELS);
    }

    public static ReadContext of(Profile profile) {
        return new ReadContext(profile, null, DEFAULT_MAX_PIXELS);
    }
}
