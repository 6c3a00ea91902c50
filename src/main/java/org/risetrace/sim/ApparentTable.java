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
    private final float[] table;
    private final boolean identity;

    ApparentTable(double emissivity, double reflectedC, double[] bandUm, double loC, double hiC) {
        this.loC = loC;
        this.identity = emissivity >= 1.0;
        if (identity) {
            table = null;
        } else {
            int n = (int) Math.ceil((hiC - loC) / STEP_K) + 2;
            table = new float[n];
            for (int i = 0; i < n; i++) {
                double t = loC + i * STEP_K;
                table[i] = (float) EmissivityCorrection.apparentCelsius(t, emissivity, reflectedC, bandUm);
            }
        }
    }

    double apply(double objectC) {
        if (identity) return objectC;
        double f = (objectC - loC) / STEP_K;
        if (f < 0) f = 0;
        int last = table.length - 1;
        if (f > last) f = last;
        int i = Math.min((int) f, last - 1);
        double a = f - i;
        return table[i] + a * (table[i + 1] - table[i]);
    }
}
