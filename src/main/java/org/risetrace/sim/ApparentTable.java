package org.risetrace.sim;

import org.risetrace.calibration.EmissivityCorrection;

/**
 * Object temperature to apparent temperature (what a camera set to emissivity 1 reports) for one emissivity and
 * reflected temperature, through {@link EmissivityCorrection#apparentCelsius}, tabulated at 0.05 K steps over the
 * run's range and interpolated linearly (the mapping is smooth: the interpolation error is far below 1 mK).
 *
 * <p>While the band-radiance correction is not in the build (the calibration stage's method throws for e < 1),
 * a stand-in mixes total (Stefan-Boltzmann) radiance, T_app^4 = e T^4 + (1 - e) T_refl^4; the truth file records
 * which one was used.
 */
final class ApparentTable {
    static final double STEP_K = 0.05;
    private final double loC;
    private final float[] table;
    private final boolean identity;
    final boolean standIn;

    ApparentTable(double emissivity, double reflectedC, double[] bandUm, double loC, double hiC) {
        this.loC = loC;
        this.identity = emissivity >= 1.0;
        boolean usedStandIn = false;
        if (identity) {
            table = null;
        } else {
            int n = (int) Math.ceil((hiC - loC) / STEP_K) + 2;
            table = new float[n];
            for (int i = 0; i < n; i++) {
                double t = loC + i * STEP_K;
                double a;
                try {
                    a = EmissivityCorrection.apparentCelsius(t, emissivity, reflectedC, bandUm);
                } catch (UnsupportedOperationException e) {
                    usedStandIn = true;
                    double tk = t + 273.15, rk = reflectedC + 273.15;
                    a = Math.sqrt(Math.sqrt(emissivity * tk * tk * tk * tk + (1 - emissivity) * rk * rk * rk * rk)) - 273.15;
                }
                table[i] = (float) a;
            }
        }
        standIn = usedStandIn;
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
