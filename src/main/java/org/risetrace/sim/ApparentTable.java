package org.risetrace.sim;

import org.risetrace.calibration.EmissivityCorrection;

/**
 * Object temperature to apparent temperature (what a camera set to emissivity 1 reports) for one emissivity and
 * reflected temperature, through {@link EmissivityCorrection#apparentCelsius}, tabulated at 0.05 K steps over the
 * run's range and interpolated linearly (the mapping is smooth: the interpolation error is far below 1 mK).
 * That method integrates Planck's law over the camera band: L(T_app) = e L(T_obj) + (1 - e) L(T_refl).
 */
final class ApparentTable {
    static final double STEP_K = 0.05;
    private final double loC;
    private final double emissivity, reflectedC;
    private final double[] bandUm;
    private final boolean identity;
    /** Entry i holds the apparent temperature at loC + i * STEP_K; replaced by a longer copy when a hotter object comes. */
    private volatile float[] table;

    ApparentTable(double emissivity, double reflectedC, double[] bandUm, double loC, double hiC) {
        this.loC = loC;
        this.emissivity = emissivity;
        this.reflectedC = reflectedC;
        this.bandUm = bandUm.clone();
        this.identity = emissivity >= 1.0;
        this.table = identity ? null : fill(new float[0], (int) Math.ceil((hiC - loC) / STEP_K) + 2);
    }

    /** Extends the table to n entries; every entry depends on its index only, so the result is deterministic. */
    private float[] fill(float[] old, int n) {
        float[] t = java.util.Arrays.copyOf(old, n);
        for (int i = old.length; i < n; i++)
            t[i] = (float) EmissivityCorrection.apparentCelsius(loC + i * STEP_K, emissivity, reflectedC, bandUm);
        return t;
    }

    private synchronized float[] grow(double objectC) {
        float[] t = table;
        int need = (int) Math.ceil((objectC - loC) / STEP_K) + 2;
        if (need > t.length) table = t = fill(t, Math.max(need, t.length + t.length / 2));
        return t;
    }

    double apply(double objectC) {
        if (identity) return objectC;
        float[] t = table;
        double f = (objectC - loC) / STEP_K;
        if (f < 0) f = 0;
        if (f > t.length - 1) t = grow(objectC);
        int last = t.length - 1;
        if (f > last) f = last;
        int i = Math.min((int) f, last - 1);
        double a = f - i;
        return t[i] + a * (t[i + 1] - t[i]);
    }
}
