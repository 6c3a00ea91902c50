package org.risetrace.analysis;

import org.ddogleg.optimization.FactoryOptimization;
import org.ddogleg.optimization.UnconstrainedLeastSquares;
import org.ddogleg.optimization.functions.FunctionNtoM;
import org.ddogleg.optimization.functions.FunctionNtoMxN;
import org.ddogleg.optimization.lm.ConfigLevenbergMarquardt;
import org.ejml.data.DMatrixRMaj;

/**
 * First-order (single time constant) rise dT(t) = dT_inf (1 - exp(-(t - t0) / tau)) for t &gt; t0, with t0 fixed at
 * the injection start, fitted by Levenberg-Marquardt (ddogleg). Standard errors come from the covariance
 * s^2 (J^T J)^-1 at the optimum, s^2 = SSR / (n - 2) (Gauss-Newton linearisation; Bates and Watts, Nonlinear
 * Regression Analysis, ch. 2).
 *
 * @param t0S    fixed start
 * @param dtInfK final rise
 * @param dtInfSe its standard error
 * @param tauS   time constant
 * @param tauSe  its standard error
 * @param rmsK   residual RMS
 * @param n      points used
 */
public record FirstOrderFit(double t0S, double dtInfK, double dtInfSe, double tauS, double tauSe, double rmsK, int n) {

    /** Model value at t. */
    public double at(double t) {
        return t <= t0S ? 0 : dtInfK * (1 - Math.exp(-(t - t0S) / tauS));
    }

    /**
     * Fits the points with t &gt; t0 and finite y. Returns null when there are fewer than 4 points, the optimiser
     * does not converge, or the optimum is not physical (tau &lt;= 0, non-finite errors).
     */
    public static FirstOrderFit fit(double[] t, double[] y, double t0) {
        int n = 0;
        for (int i = 0; i < t.length; i++) if (t[i] > t0 && Double.isFinite(y[i])) n++;
        if (n < 4) return null;
        double[] ts = new double[n], ys = new double[n];
        int k = 0;
        double span = 0, yMax = 0;
        for (int i = 0; i < t.length; i++)
            if (t[i] > t0 && Double.isFinite(y[i])) {
                ts[k] = t[i] - t0;
                ys[k] = y[i];
                span = Math.max(span, ts[k]);
                if (Math.abs(y[i]) > Math.abs(yMax)) yMax = y[i];
                k++;
            }
        double[] start = initialGuess(ts, ys, span, yMax);
        double[] p = optimise(ts, ys, start);
        if (p == null) return null;
        double a = p[0], tau = p[1];
        if (!(tau > 0) || !Double.isFinite(a)) return null;
        // J^T J and residuals at the optimum
        double jaa = 0, jat = 0, jtt = 0, ssr = 0;
        for (int i = 0; i < n; i++) {
            double e = Math.exp(-ts[i] / tau);
            double da = 1 - e, dtau = -a * e * ts[i] / (tau * tau);
            jaa += da * da;
            jat += da * dtau;
            jtt += dtau * dtau;
            double r = a * da - ys[i];
            ssr += r * r;
        }
        double det = jaa * jtt - jat * jat;
        double s2 = ssr / (n - 2);
        double seA = Math.sqrt(s2 * jtt / det), seTau = Math.sqrt(s2 * jaa / det);
        if (!(det > 0) || !Double.isFinite(seA) || !Double.isFinite(seTau)) return null;
        return new FirstOrderFit(t0, a, seA, tau, seTau, Math.sqrt(ssr / n), n);
    }

    /** Starting point: tau from the time the curve reaches 63 % of its largest value, dT_inf = that value. */
    static double[] initialGuess(double[] ts, double[] ys, double span, double yMax) {
        double tau = span / 2;
        for (int i = 0; i < ts.length; i++)
            if (Math.abs(ys[i]) >= 0.632 * Math.abs(yMax)) {
                tau = Math.max(ts[i], span / ts.length);
                break;
            }
        return new double[]{yMax == 0 ? 1e-3 : yMax * 1.1, Math.max(tau, 1e-3)};
    }

    /** Levenberg-Marquardt with analytic Jacobian; null when it does not converge. */
    static double[] optimise(double[] ts, double[] ys, double[] start) {
        ConfigLevenbergMarquardt cfg = new ConfigLevenbergMarquardt();
        UnconstrainedLeastSquares<DMatrixRMaj> lm = FactoryOptimization.levenbergMarquardt(cfg, false);
        int m = ts.length;
        FunctionNtoM residuals = new FunctionNtoM() {
            @Override public void process(double[] p, double[] out) {
                for (int i = 0; i < m; i++) out[i] = p[0] * (1 - Math.exp(-ts[i] / p[1])) - ys[i];
            }
            @Override public int getNumOfInputsN() { return 2; }
            @Override public int getNumOfOutputsM() { return m; }
        };
        FunctionNtoMxN<DMatrixRMaj> jacobian = new FunctionNtoMxN<>() {
            @Override public void process(double[] p, DMatrixRMaj out) {
                for (int i = 0; i < m; i++) {
                    double e = Math.exp(-ts[i] / p[1]);
                    out.unsafe_set(i, 0, 1 - e);
                    out.unsafe_set(i, 1, -p[0] * e * ts[i] / (p[1] * p[1]));
                }
            }
            @Override public DMatrixRMaj declareMatrixMxN() { return new DMatrixRMaj(m, 2); }
            @Override public int getNumOfInputsN() { return 2; }
            @Override public int getNumOfOutputsM() { return m; }
        };
        lm.setFunction(residuals, jacobian);
        lm.initialize(start, 1e-15, 1e-15);
        for (int it = 0; it < 1000; it++) {
            boolean done;
            try {
                done = lm.iterate();
            } catch (RuntimeException e) {
                return null;
            }
            double[] p = lm.getParameters();
            if (!(p[1] > 0) || !Double.isFinite(p[0])) return null;
            if (done) return p.clone();
        }
        return lm.getParameters().clone();
    }
}
