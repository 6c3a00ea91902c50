package org.risetrace.calibration;

import java.util.Locale;

/** The curve fitted to reference points, with the fewest points each needs. */
public enum CalibrationModel {
    /** T = gain * count + offset with the base gain kept: shifts the offset only. */
    OFFSET("offset", 1),
    /** T = gain * count + offset, both fitted by least squares. */
    GAIN_OFFSET("gain-offset", 2),
    /** S(T) = C / (exp(c2 / (A T + B)) - 1), fitted in signal space; the profile gets its linearisation. */
    SAKUMA_HATTORI("sakuma-hattori", 3);

    private final String word;
    private final int minPoints;

    CalibrationModel(String word, int minPoints) {
        this.word = word;
        this.minPoints = minPoints;
    }

    public String word() { return word; }

    public int minPoints() { return minPoints; }

    public static CalibrationModel parse(String text) {
        for (CalibrationModel m : values()) if (m.word.equals(text.trim().toLowerCase(Locale.ROOT))) return m;
        throw new IllegalArgumentException("model must be offset, gain-offset or sakuma-hattori, not '" + text + "'");
    }

    @Override
    public String toString() { return word; }
}
