package org.risetrace.io;

import org.risetrace.calibration.Profile;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.InputRejected;

import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Maps stored samples to degrees Celsius under a calibration profile, and refuses samples the profile does not fit
 * and temperatures no camera reports (below absolute zero, above {@link #MAX_CELSIUS}).
 */
public final class SampleMapping {
    /** Absolute zero in degrees Celsius: 0 K = -273.15 degC (SI definition of the degree Celsius). */
    public static final double ABSOLUTE_ZERO_C = -Profile.KELVIN_AT_ZERO_CELSIUS;
    /** Highest temperature accepted after mapping; far above any board-repair scene, so a wrong profile shows. */
    public static final double MAX_CELSIUS = 2000.0;

    /** 65536-entry count-to-Celsius tables, one per linear mapping (gain, offset, unit). */
    private static final Map<String, float[]> LUTS = new ConcurrentHashMap<>();

    private SampleMapping() {
    }

    /** The profile assumed when none is named: by the kind of samples found. */
    public static String defaultProfileName(RawSamples.Kind kind) {
        return switch (kind) {
            case COUNTS -> "u16-centikelvin";
            case GREY -> "u8-span";
            case FLOAT -> "f32-celsius";
            case TEXT -> "matrix-celsius";
        };
    }

    private static final Map<String, Profile> DEFAULTS = new ConcurrentHashMap<>();

    public static Profile defaultProfile(RawSamples.Kind kind) {
        return DEFAULTS.computeIfAbsent(defaultProfileName(kind), Profiles::load);
    }

    /**
     * Temperatures in degrees Celsius for the samples.
     *
     * @param spanC per-frame span, else the profile's {@code span_c} is used (8-bit grey only)
     */
    public static float[] toCelsius(Path file, RawSamples s, Profile p, double[] spanC) {
        String enc = p.encoding().toLowerCase(Locale.ROOT);
        checkFits(file, s, p, enc);
        if (s.kind() == RawSamples.Kind.COUNTS) return linearCounts(file, s, p);
        float[] out = switch (s.kind()) {
            case COUNTS -> throw new AssertionError();
            case GREY -> span(file, s, p, spanC);
            case FLOAT, TEXT -> enc.equals("linear") ? linearValues(s.values(), p) : temperatures(s.values(), p);
        };
        checkRange(file, out, s.width());
        return out;
    }

    private static void checkFits(Path file, RawSamples s, Profile p, String enc) {
        boolean fits = switch (s.kind()) {
            case COUNTS -> enc.equals("linear");
            case GREY -> enc.equals("span");
            case FLOAT -> enc.equals("float");
            case TEXT -> enc.equals("matrix") || enc.equals("float") || enc.equals("linear");
        };
        if (!fits) {
            String want = switch (s.kind()) {
                case COUNTS -> "a linear profile such as u16-centikelvin";
                case GREY -> "a span profile such as u8-span";
                case FLOAT -> "a float profile such as f32-celsius";
                case TEXT -> "a matrix profile such as matrix-celsius";
            };
            throw new InputRejected(file, "the file holds " + s.describe() + " but profile '" + p.name()
                    + "' expects " + expects(enc), "use " + want);
        }
    }

    private static String expects(String enc) {
        return switch (enc) {
            case "linear" -> "integer counts (linear encoding, 16-bit)";
            case "span" -> "8-bit grey levels (span encoding)";
            case "float" -> "float temperatures (float encoding, 32-bit)";
            case "matrix" -> "a text matrix (matrix encoding)";
            default -> enc;
        };
    }

    private static float[] lut(Profile p) {
        String key = p.gain() + "|" + p.offset() + "|" + p.kelvin();
        return LUTS.computeIfAbsent(key, k -> {
            float[] t = new float[65536];
            for (int c = 0; c < t.length; c++) t[c] = (float) p.countToCelsius(c);
            return t;
        });
    }

    /** Table look-up per count; the range check needs only the extreme counts, the mapping being linear. */
    private static float[] linearCounts(Path file, RawSamples s, Profile p) {
        float[] lut = lut(p);
        short[] counts = s.u16();
        float[] out = new float[counts.length];
        int lo = 65535, hi = 0;
        for (int i = 0; i < counts.length; i++) {
            int c = counts[i] & 0xFFFF;
            out[i] = lut[c];
            lo = Math.min(lo, c);
            hi = Math.max(hi, c);
        }
        float a = lut[lo], b = lut[hi];
        if (Math.min(a, b) < (float) ABSOLUTE_ZERO_C || Math.max(a, b) > MAX_CELSIUS) checkRange(file, out, s.width());
        return out;
    }

    private static float[] linearValues(float[] v, Profile p) {
        float[] out = new float[v.length];
        for (int i = 0; i < v.length; i++) out[i] = (float) p.countToCelsius(v[i]);
        return out;
    }

    private static float[] temperatures(float[] v, Profile p) {
        if (!p.kelvin()) return v; // already Celsius; the reader's array is ours to hand on
        float[] out = new float[v.length];
        for (int i = 0; i < v.length; i++) out[i] = (float) (v[i] - Profile.KELVIN_AT_ZERO_CELSIUS);
        return out;
    }

    private static float[] span(Path file, RawSamples s, Profile p, double[] spanC) {
        double[] span = spanC != null ? spanC : p.spanC();
        if (span == null)
            throw new InputRejected(file, "8-bit grey frame without a temperature span",
                    "add \"span_c\": [low, high] to series.json (for the series, or per frame under \"frames\"), "
                            + "or use a profile with span_c");
        if (span.length != 2 || !(span[1] > span[0]) || !Double.isFinite(span[0]) || !Double.isFinite(span[1]))
            throw new InputRejected(file, "temperature span must be [low, high] degrees Celsius with high > low");
        float[] lut = new float[256];
        int max = s.maxValue();
        for (int g = 0; g < 256; g++) lut[g] = (float) (span[0] + (span[1] - span[0]) * g / max);
        byte[] u8 = s.u8();
        float[] out = new float[u8.length];
        for (int i = 0; i < u8.length; i++) out[i] = lut[u8[i] & 0xFF];
        return out;
    }

    /** NaN stays NaN (a pixel without a reading); anything else must lie in [absolute zero, MAX_CELSIUS]. */
    private static void checkRange(Path file, float[] c, int width) {
        float lo = Float.POSITIVE_INFINITY, hi = Float.NEGATIVE_INFINITY;
        for (float v : c) {
            if (v < lo) lo = v;
            if (v > hi) hi = v;
        }
        if (lo >= (float) ABSOLUTE_ZERO_C && hi <= MAX_CELSIUS) return;
        if (lo == Float.POSITIVE_INFINITY && hi == Float.NEGATIVE_INFINITY) return; // all NaN
        for (int i = 0; i < c.length; i++) {
            float v = c[i];
            if (v < (float) ABSOLUTE_ZERO_C || v > MAX_CELSIUS || Float.isInfinite(v)) {
                String where = "pixel (" + (i % width) + ", " + (i / width) + ")";
                String what = v < (float) ABSOLUTE_ZERO_C
                        ? String.format(Locale.ROOT, "%.2f degC, below absolute zero (%.2f degC)", v, ABSOLUTE_ZERO_C)
                        : String.format(Locale.ROOT, "%.2f degC, above %.0f degC", v, MAX_CELSIUS);
                throw new InputRejected(file, where + " maps to " + what,
                        "check the calibration profile (encoding, gain, offset, unit)");
            }
        }
    }
}
