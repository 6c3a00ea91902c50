package org.risetrace.calibration;

import org.ddogleg.optimization.FactoryOptimization;
import org.ddogleg.optimization.UnconstrainedLeastSquares;
import org.ddogleg.optimization.UtilOptimize;
import org.ddogleg.optimization.functions.FunctionNtoM;
import org.ddogleg.optimization.functions.FunctionNtoMxN;
import org.ddogleg.optimization.lm.ConfigLevenbergMarquardt;
import org.ejml.data.DMatrixRMaj;

/**
 * The Sakuma-Hattori equation, the interpolation equation of radiation thermometry that models a thermal camera's
 * signal as a function of blackbody temperature: S(T) = C / (exp(c2 / (A T + B)) - 1), with c2 = h c / k_B in
 * um K, A an effective wavelength in um and B a correction in um K (Sakuma and Hattori, 1982).
 *
 * @param c   signal scale, in signal units (counts)
 * @param aUm effective wavelength, micrometres
 * @param bUmK correction term, micrometre-kelvin
 */
public record SakumaHattori(double c, double aUm, double bUmK) {
    /** Second radiation constant in micrometre-kelvin (CODATA 2018 h, c, k_B). */
    public static final double C2_UM_K = Planck.C2 * 1e6;

    /** Signal of a blackbody at {@code kelvin}. */
    public double signal(double kelvin) {
        return c / Math.expm1(C2_UM_K / (aUm * kelvin + bUmK));
    }

    /** Temperature in kelvin that gives {@code signal} (the equation solved for T). */
    public double kelvin(double signal) {
        if (!(signal > 0) || !(c / signal > -1))
            throw new IllegalArgumentException("signal " + signal + " is outside the fitted curve (needs S > 0)");
        return (C2_UM_K / Math.log1p(c / signal) - bUmK) / aUm;
    }

    /**
     * Least-squares fit in signal space by Levenberg-Marquardt (ddogleg), started from A at each end and the middle of
     * the band with B = 0 and C solved linearly, keeping the best.
     *
     * @param kelvin  known blackbody temperatures, at least three distinct
     * @param signal  measured signals, all positive
     * @param bandUm  the camera band, for the starting effective wavelength
     */
    public static SakumaHattori fit(double[] kelvin, double[] signal, double[] bandUm) {
        if (kelvin.length != signal.length) throw new IllegalArgumentException("as many temperatures as signals");
        if (kelvin.length < 3) throw new IllegalArgumentException("the Sakuma-Hattori fit needs three or more points");
        double sMax = 0, tMean = 0;
        for (int i = 0; i < signal.length; i++) {
            if (!(signal[i] > 0)) throw new IllegalArgumentException("signals must be positive, got " + signal[i]);
            if (!(kelvin[i] > 0)) throw new IllegalArgumentException("temperatures must be above absolute zero");
            sMax = Math.max(sMax, Math.abs(signal[i]));
            tMean += kelvin[i] / kelvin.length;
        }
        double[] band = bandUm == null ? BandRadiance.DEFAULT_BAND_UM : bandUm;
        SakumaHattori best = null;
        double bestCost = Double.POSITIVE_INFINITY;
        for (double a0 : new double[]{(band[0] + band[1]) / 2, band[0], band[1]}) {
            SakumaHattori start = withLinearScale(kelvin, signal, a0, 0.0);
            SakumaHattori fitted = refine(kelvin, signal, start, sMax, tMean);
            double cost = cost(fitted, kelvin, signal);
            if (cost < bestCost) {
                bestCost = cost;
                best = fitted;
            }
        }
        return best;
    }

    /** The C that minimises the signal residuals for given A and B (S is linear in C). */
    private static SakumaHattori withLinearScale(double[] kelvin, double[] signal, double aUm, double bUmK) {
        double num = 0, den = 0;
        for (int i = 0; i < kelvin.length; i++) {
            double g = 1 / Math.expm1(C2_UM_K / (aUm * kelvin[i] + bUmK));
            num += g * signal[i];
            den += g * g;
        }
        return new SakumaHattori(num / den, aUm, bUmK);
    }

    private static double cost(SakumaHattori m, double[] kelvin, double[] signal) {
        double sum = 0;
        for (int i = 0; i < kelvin.length; i++) {
            double r = m.signal(kelvin[i]) - signal[i];
            sum += r * r;
        }
        return Double.isFinite(sum) ? sum : Double.POSITIVE_INFINITY;
    }

    /**
     * Levenberg-Marquardt on scaled parameters x = (C / C0, A / A0, B / (A0 T_mean)) and residuals in units of the
     * largest signal, so that all three parameters and the cost are of order one.
     */
    private static SakumaHattori refine(double[] kelvin, double[] signal, SakumaHattori start, double sMax, double tMean) {
        double cScale = start.c(), aScale = start.aUm(), bScale = start.aUm() * tMean;
        int m = kelvin.length;
        FunctionNtoM residuals = new FunctionNtoM() {
            @Override
            public void process(double[] x, double[] out) {
                double cc = x[0] * cScale, a = x[1] * aScale, b = x[2] * bScale;
                for (int i = 0; i < m; i++) out[i] = (cc / Math.expm1(C2_UM_K / (a * kelvin[i] + b)) - signal[i]) / sMax;
            }

            @Override
            public int getNumOfInputsN() { return 3; }

            @Override
            public int getNumOfOutputsM() { return m; }
        };
        FunctionNtoMxN<DMatrixRMaj> jacobian = new FunctionNtoMxN<>() {
            @Override
            public void process(double[] x, DMatrixRMaj jac) {
                double cc = x[0] * cScale, a = x[1] * aScale, b = x[2] * bScale;
                for (int i = 0; i < m; i++) {
                    double u = a * kelvin[i] + b;
                    double em1 = Math.expm1(C2_UM_K / u);
                    // dS/du = C e^(c2/u) c2 / (u^2 (e^(c2/u) - 1)^2)
                    double dSdu = cc * (1 + 1 / em1) / em1 * C2_UM_K / (u * u);
                    jac.set(i, 0, cScale / em1 / sMax);
                    jac.set(i, 1, dSdu * kelvin[i] * aScale / sMax);
                    jac.set(i, 2, dSdu * bScale / sMax);
                }
            }

            @Override
            public DMatrixRMaj declareMatrixMxN() { return new DMatrixRMaj(m, 3); }

            @Override
            public int getNumOfInputsN() { return 3; }

            @Override
            public int getNumOfOutputsM() { return m; }
        };
        ConfigLevenbergMarquardt config = new ConfigLevenbergMarquardt();
        UnconstrainedLeastSquares<DMatrixRMaj> lm = FactoryOptimization.levenbergMarquardt(config, true);
        lm.setFunction(residuals, jacobian);
        lm.initialize(new double[]{1, 1, start.bUmK() / bScale}, 1e-15, 1e-15);
        try {
            UtilOptimize.process(lm, 2000);
        } catch (RuntimeException stalled) {
            // ddogleg gives up when no step lowers the cost any more: the parameters it holds are the best found
        }
        double[] x = lm.getParameters();
        SakumaHattori fitted = new SakumaHattori(x[0] * cScale, x[1] * aScale, x[2] * bScale);
        return Double.isFinite(fitted.c()) && Double.isFinite(fitted.aUm()) && Double.isFinite(fitted.bUmK())
                ? fitted : start;
    }
}
