package org.risetrace.calibration;

import java.util.Locale;

/**
 * A reference target in frame pixels, with its known temperature (e.g. tape on a heated block, read by a
 * thermocouple). Written {@code x,y,w,h=T_C}, optionally {@code x,y,w,h=T_C@frame-file-name} to use only that frame.
 *
 * @param x         left column, pixels
 * @param y         top row, pixels
 * @param w         width, pixels
 * @param h         height, pixels
 * @param knownC    known temperature, degrees Celsius
 * @param frameName file name of the only frame to read the target in, or null for every frame
 */
public record ReferenceTarget(int x, int y, int w, int h, double knownC, String frameName) {
    public ReferenceTarget {
        if (x < 0 || y < 0 || w <= 0 || h <= 0)
            throw new IllegalArgumentException("target region needs x, y >= 0 and w, h > 0, not " + x + "," + y + "," + w + "," + h);
        if (!(knownC > -Profile.KELVIN_AT_ZERO_CELSIUS) || Double.isInfinite(knownC))
            throw new IllegalArgumentException("known temperature must be above absolute zero, not " + knownC + " C");
    }

    /** Parses {@code x,y,w,h=T_C[@frame]}; the message of the exception says what is wrong. */
    public static ReferenceTarget parse(String text) {
        String s = text.trim();
        String frame = null;
        int at = s.indexOf('@');
        if (at >= 0) {
            frame = s.substring(at + 1).trim();
            s = s.substring(0, at).trim();
            if (frame.isEmpty()) throw new IllegalArgumentException("target '" + text + "': empty frame name after '@'");
        }
        int eq = s.indexOf('=');
        if (eq < 0) throw new IllegalArgumentException("target '" + text + "' must be x,y,w,h=T_C (pixels = degrees Celsius)");
        String[] box = s.substring(0, eq).split(",");
        if (box.length != 4) throw new IllegalArgumentException("target '" + text + "': region must be four integers x,y,w,h");
        int[] v = new int[4];
        try {
            for (int i = 0; i < 4; i++) v[i] = Integer.parseInt(box[i].trim());
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException("target '" + text + "': region must be four integers x,y,w,h");
        }
        double t;
        try {
            t = Double.parseDouble(s.substring(eq + 1).trim());
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException("target '" + text + "': known temperature must be a number of degrees Celsius");
        }
        return new ReferenceTarget(v[0], v[1], v[2], v[3], t, frame);
    }

    @Override
    public String toString() {
        return String.format(Locale.ROOT, "%d,%d,%d,%d=%s%s", x, y, w, h, knownC, frameName == null ? "" : "@" + frameName);
    }
}
