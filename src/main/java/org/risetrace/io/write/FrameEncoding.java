package org.risetrace.io.write;

import java.util.Locale;

/**
 * How a temperature raster is stored in a file, with the bundled calibration profile that reads it back.
 * Centikelvin: count = round((T + 273.15) * 100), the common radiometric export of uncooled cameras (common practice).
 */
public enum FrameEncoding {
    /** 16-bit grey PNG, counts of 0.01 K. */
    U16_CENTIKELVIN_PNG("u16-centikelvin-png", "png", "u16-centikelvin"),
    /** 16-bit grey TIFF, counts of 0.01 K. */
    U16_CENTIKELVIN_TIFF("u16-centikelvin-tiff", "tif", "u16-centikelvin"),
    /** 32-bit IEEE float TIFF (SampleFormat 3, TIFF 6.0), degrees Celsius. */
    F32_TIFF("f32-tiff", "tif", "f32-celsius"),
    /** 8-bit grey PNG, 0 at span low, 255 at span high. */
    U8_SPAN_PNG("u8-span-png", "png", "u8-span");

    private final String id;
    private final String extension;
    private final String profile;

    FrameEncoding(String id, String extension, String profile) {
        this.id = id;
        this.extension = extension;
        this.profile = profile;
    }

    /** The name used in scenario files. */
    public String id() { return id; }

    /** File name extension without the dot. */
    public String extension() { return extension; }

    /** The bundled calibration profile that decodes this encoding. */
    public String profile() { return profile; }

    /** Parses a scenario name; null when unknown. */
    public static FrameEncoding byId(String id) {
        if (id == null) return null;
        String s = id.toLowerCase(Locale.ROOT);
        for (FrameEncoding e : values()) if (e.id.equals(s)) return e;
        return null;
    }

    public static String knownIds() {
        StringBuilder sb = new StringBuilder();
        for (FrameEncoding e : values()) {
            if (sb.length() > 0) sb.append(", ");
            sb.append(e.id);
        }
        return sb.toString();
    }
}
