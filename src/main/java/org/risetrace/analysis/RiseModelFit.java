package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonIgnore;
import com.fasterxml.jackson.annotation.JsonProperty;
import org.ddogleg.optimization.FactoryOptimization;
import org.ddogleg.optimization.UnconstrainedLeastSquares;
import org.ddogleg.optimization.functions.FunctionNtoM;
import org.ddogleg.optimization.functions.FunctionNtoMxN;
import org.ddogleg.optimization.lm.ConfigLevenbergMarquardt;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;

import java.util.List;
import java.util.Locale;

/**
 * The rise of a part after the injection start t0, fitted with one or two time constants:
 * <pre>
 *   single: dT(t) = A (1 - exp(-t'/tau))
 *   double: dT(t) = A1 (1 - exp(-t'/tau1)) + A2 (1 - exp(-t'/tau2)),  tau1 &lt; tau2,   t' = t - t0
 * </pre>
 * A package on a board is at least two heat capacities: the die and its package heat in seconds, the board around
 * them in minutes, so one exponential bends too early and then too late (on the bundled phase-short series it left
 * 0.11 K RMS against 0.017 K of noise). The step response of a passive RC ladder is a sum of such terms (Foster
 * form); two are the fewest that describe die plus board.
 *
 * <p>Fitting: for fixed time constants the amplitudes are linear least squares (variable projection, Golub and
 * Pereyra 1973), so a log-spaced grid over tau (one constant) or over (tau1, tau2) with tau2 &gt; tau1 (two) gives
 * the start; Levenberg-Marquardt (ddogleg) over ln tau with the amplitudes projected out (Kaufman's Jacobian)
 * refines it. Standard errors from s^2 (J^T J)^-1 at the optimum, J the full problem's analytic Jacobian in
 * (A, tau), s^2 = SSR / (n - p) (Gauss-Newton linearisation; Bates and Watts, Nonlinear Regression Analysis,
 * ch. 2).
 *
 * <p>Choice, stated once here and in DEVELOPERS.md: two constants when (1) the extra-sum-of-squares F-test of the
 * nested models rejects one constant at the 1 % level, F = ((SSR1 - SSR2) / 2) / (SSR2 / (n - 4)) against
 * F(2, n - 4) (Bates and Watts, section 3.5; Draper and Smith, ch. 24), and (2) the two-constant fit is well
 * determined: tau2 / tau1 &gt;= 2, and each of A1, tau1, A2, tau2 at least twice its standard error (finite).
 * Otherwise one constant, kept only when tau &lt;= 5 x the fitted span and its standard error is below tau (a curve
 * still straight at the end of the series does not determine a time constant); otherwise no fit. No separate
 * linear drift term: the rise is already corrected for the ambient measured beside the board, and a slow board
 * constant longer than the series is the ramp such a term would describe.
 *
 * @param model      "single" or "double"
 * @param t0S        the fixed start (the injection start)
 * @param terms      the exponential terms, fastest first (one or two)
 * @param dtInfK     final rise, the sum of the amplitudes
 * @param dtInfSe    its standard error (with the amplitudes' covariance)
 * @param rmsK       residual RMS of the chosen model, sqrt(SSR / n)
 * @param n          points fitted (t &gt; t0, finite)
 * @param fStatistic the F statistic of two constants against one (null when two could not be fitted)
 * @param pValue     its p-value under F(2, n - 4) (null with it)
 * @param selection  the choice in plain words
 */
public record RiseModelFit(
        @JsonProperty("model") String model,
        @JsonProperty("t0_s") double t0S,
        @JsonProperty("terms") List<Term> terms,
        @JsonProperty("dt_inf_k") double dtInfK,
        @JsonProperty("dt_inf_se") double dtInfSe,
        @JsonProperty("rms_k") double rmsK,
        @JsonProperty("n") int n,
        @JsonProperty("f_statistic") Double fStatistic,
        @JsonProperty("p_value") Double pValue,
        @JsonProperty("selection") String selection) {

    public static final String SINGLE = "single";
    public static final String DOUBLE = "double";
    /** Level of the F-test. */
    public static final double P_LEVEL = 0.01;
    /** Two constants closer than this ratio are not told apart (the terms become nearly collinear). */
    public static final double MIN_TAU_RATIO = 2;
    /** Every parameter of the two-constant model must be at least this many standard errors from zero. */
    public static final double MIN_PARAMETER_SE_RATIO = 2;
    /** One constant longer than this many spans of the fitted data is not determined. */
    public static final double MAX_TAU_SPANS = 5;

    /** The choice in one line, recorded in analysis.json's parameters. */
    public static final String RULE = "two time constants when the F-test against one gives p < 0.01 (F(2, n-4)), "
            + "tau2 >= 2 tau1 and every parameter is at least 2 standard errors; else one, kept when tau <= 5 spans "
            + "and its standard error < tau; t0 = injection start";

    private static final int GRID = 40;
    private static final int MAX_ITERATIONS = 200;

    /**
     * One exponential term A (1 - exp(-t'/tau)).
     *
     * @param dtK   amplitude A (K)
     * @param dtSe  its standard error
     * @param tauS  time constant
     * @param tauSe its standard error
     */
    public record Term(@JsonProperty("dt_k") double dtK, @JsonProperty("dt_se") double dtSe,
                       @JsonProperty("tau_s") double tauS, @JsonProperty("tau_se") double tauSe) { }

    public RiseModelFit {
        terms = List.copyOf(terms);
    }

    /** Model value at series time t (0 up to t0). */
    public double at(double t) {
        if (!(t > t0S)) return 0.0;
        double v = 0;
        for (Term k : terms) v += k.dtK() * -Math.expm1(-(t - t0S) / k.tauS());
        return v;
    }

    /** The slowest term (the only one for a single constant). */
    @JsonIgnore
    public Term slow() {
        return terms.get(terms.size() - 1);
    }

    /** True for two time constants. */
    @JsonIgnore
    public boolean isDouble() {
        return DOUBLE.equals(model);
    }

    /**
     * A least-squares optimum of one model on t' &gt; 0, or the point where the search left the model's reach.
     *
     * @param p       A1, tau1 (, A2, tau2), tau1 &lt; tau2
     * @param cov     s^2 (J^T J)^-1 in those parameters (null with a problem)
     * @param ssr     sum of squared residuals
     * @param problem null, or why there is no settled interior optimum (a time constant ran beyond 1000 spans or
     *                towards zero, the two merged, the search crept or did not settle, J^T J singular): p and ssr
     *                are then where the descent stopped, an upper bound of the model's least sum of squares
     */
    record Optimum(double[] p, double[][] cov, double ssr, int n, String problem) {
        double se(int i) {
            return cov == null ? Double.NaN : Math.sqrt(cov[i][i]);
        }

    }

    /**
     * Fits the points with t &gt; t0 and finite y and chooses the model (see the class comment). Null when fewer
     * than 4 points, when the one-constant fit fails and when no model is determined.
     */
    public static RiseModelFit fit(double[] t, double[] y, double t0) {
        int n = 0;
        for (int i = 0; i < t.length; i++) if (t[i] > t0 && Double.isFinite(y[i])) n++;
        if (n < 4) return null;
        double[] ts = new double[n], ys = new double[n];
        for (int i = 0, k = 0; i < t.length; i++)
            if (t[i] > t0 && Double.isFinite(y[i])) {
                ts[k] = t[i] - t0;
                ys[k++] = y[i];
            }
        double span = 0;
        for (double v : ts) span = Math.max(span, v);

        Optimum one = fitSingle(ts, ys);
        if (one == null) return null;
        // the F-test compares least sums of squares; where a search ran off, the sum where it stopped stands for
        // the model's (its infimum lies at the limit the search was heading for)
        Optimum two = n >= 8 ? fitDouble(ts, ys) : null;
        Double f = null, p = null;
        String why;
        if (two != null) {
            double fv = fStatistic(one.ssr(), two.ssr(), n);
            f = fv;
            p = fSurvivalTwo(fv, n - 4);
            String test = String.format(Locale.ROOT, "F = %s, p = %s at 2 and %d degrees of freedom",
                    sig(fv), sig(p), n - 4);
            String undetermined = undetermined(two);
            if (!(p < P_LEVEL)) {
                why = "one time constant: a second does not improve the fit significantly (" + test + ")";
            } else if (undetermined != null) {
                why = "one time constant: two would fit better (" + test + ") but are not well determined ("
                        + undetermined + ")";
            } else {
                return result(DOUBLE, t0, two, f, p, "two time constants (" + test + ")");
            }
        } else {
            why = n < 8 ? "one time constant: too few points for two" : "one time constant: the two-constant fit failed";
        }
        double tau = one.p()[1];
        if (one.problem() != null || !(tau <= MAX_TAU_SPANS * span) || !(one.se(1) < tau)
                || !Double.isFinite(one.se(0))) return null;
        return result(SINGLE, t0, one, f, p, why);
    }

    /** Why the two-constant optimum is not well determined, or null when it is. */
    static String undetermined(Optimum two) {
        double[] q = two.p();
        if (two.problem() != null) return two.problem();
        if (!(q[3] >= MIN_TAU_RATIO * q[1]))
            return String.format(Locale.ROOT, "time constants %s and %s s less than a factor %s apart",
                    sig(q[1]), sig(q[3]), sig(MIN_TAU_RATIO));
        String[] names = {"\u0394T1", "\u03c41", "\u0394T2", "\u03c42"};
        String[] units = {" K", " s", " K", " s"};
        for (int i = 0; i < 4; i++) {
            double se = two.se(i);
            if (!Double.isFinite(se) || !(Math.abs(q[i]) >= MIN_PARAMETER_SE_RATIO * se))
                return names[i] + " = " + sig(q[i]) + " \u00b1 " + sig(se) + units[i];
        }
        return null;
    }

    static double fStatistic(double ssrOne, double ssrTwo, int n) {
        if (!(ssrTwo > 0)) return ssrOne > 0 ? Double.POSITIVE_INFINITY : 0;
        return Math.max(0, (ssrOne - ssrTwo) / 2 / (ssrTwo / (n - 4)));
    }

    /**
     * P(F &gt; f) for F(2, nu): Q = I_x(nu/2, 1) with x = nu / (nu + 2 f) (Abramowitz and Stegun 26.6.2, from
     * memory), and I_x(a, 1) = x^a, so Q = (1 + 2 f / nu)^(-nu/2). Checked against commons-math3's FDistribution
     * in the tests.
     */
    static double fSurvivalTwo(double f, int nu) {
        if (!(f > 0)) return 1.0;
        if (f == Double.POSITIVE_INFINITY) return 0.0;
        return Math.exp(-0.5 * nu * Math.log1p(2 * f / nu));
    }

    private static RiseModelFit result(String model, double t0, Optimum o, Double f, Double p, String why) {
        double[] q = o.p();
        int k = q.length / 2;
        Term[] terms = new Term[k];
        double sum = 0, var = 0;
        for (int j = 0; j < k; j++) {
            terms[j] = new Term(q[2 * j], o.se(2 * j), q[2 * j + 1], o.se(2 * j + 1));
            sum += q[2 * j];
            for (int l = 0; l < k; l++) var += o.cov()[2 * j][2 * l];
        }
        return new RiseModelFit(model, t0, List.of(terms), sum, Math.sqrt(Math.max(0, var)),
                Math.sqrt(o.ssr() / o.n()), o.n(), f, p, why);
    }

    // ---- the two least-squares problems ----

    /** One constant on t' &gt; 0 (see {@link #optimum} for a search that ran off); null when the optimiser failed. */
    static Optimum fitSingle(double[] ts, double[] ys) {
        Grid g = new Grid(ts, ys);
        double best = Double.POSITIVE_INFINITY;
        int bi = -1;
        for (int i = 0; i < GRID; i++) {
            if (!(g.gram[i][i] > 0)) continue;
            double ssr = g.yy - g.b[i] * g.b[i] / g.gram[i][i];
            if (ssr < best) {
                best = ssr;
                bi = i;
            }
        }
        if (bi < 0) return null;
        return optimum(ts, ys, new double[]{g.b[bi] / g.gram[bi][bi], g.tau[bi]}, g.span);
    }

    /**
     * Two constants on t' &gt; 0, tau1 &lt; tau2 (see {@link #optimum}); null when the optimiser failed. Three starts
     * from the grid, the lowest sum of squares wins: the best pair, the best with tau2 at the grid's longest (a
     * board still ramping) and the best with tau1 at its shortest (a near step at t0). On one-constant data the
     * best pair alone sometimes led into the collinear valley tau1 = tau2 and stopped there with F = 0 where
     * another start found a lower sum of squares.
     */
    static Optimum fitDouble(double[] ts, double[] ys) {
        Grid g = new Grid(ts, ys);
        double[] best = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY};
        double[][] starts = new double[3][];
        for (int i = 0; i < GRID; i++)
            for (int j = i + 2; j < GRID; j++) {
                double gii = g.gram[i][i], gjj = g.gram[j][j], gij = g.gram[i][j];
                double det = gii * gjj - gij * gij;
                if (!(det > 1e-12 * gii * gjj)) continue;
                double a1 = (gjj * g.b[i] - gij * g.b[j]) / det, a2 = (gii * g.b[j] - gij * g.b[i]) / det;
                double ssr = g.yy - a1 * g.b[i] - a2 * g.b[j];
                boolean[] kinds = {true, j == GRID - 1, i == 0};
                for (int k = 0; k < 3; k++)
                    if (kinds[k] && ssr < best[k]) {
                        best[k] = ssr;
                        starts[k] = new double[]{a1, g.tau[i], a2, g.tau[j]};
                    }
            }
        Optimum chosen = null;
        for (int k = 0; k < 3; k++) {
            if (starts[k] == null || (k > 0 && java.util.Arrays.equals(starts[k], starts[0]))) continue;
            Optimum o = optimum(ts, ys, starts[k], g.span);
            if (o != null && (chosen == null || o.ssr() < chosen.ssr())) chosen = o;
        }
        return chosen;
    }

    /**
     * The variable-projection grid: basis vectors 1 - exp(-t'/tau) for log-spaced tau from a third of the first
     * sample's delay (or of the mean spacing) to ten spans, their Gram matrix and their products with y.
     */
    private static final class Grid {
        final double[] tau = new double[GRID], b = new double[GRID];
        final double[][] gram = new double[GRID][GRID];
        final double yy, span;

        Grid(double[] ts, double[] ys) {
            double sp = 0, first = Double.POSITIVE_INFINITY, s = 0;
            for (int i = 0; i < ts.length; i++) {
                sp = Math.max(sp, ts[i]);
                first = Math.min(first, ts[i]);
                s += ys[i] * ys[i];
            }
            span = sp;
            yy = s;
            double lo = Math.max(first, sp / ts.length) / 3, hi = 10 * sp;
            double[][] e = new double[GRID][ts.length];
            for (int k = 0; k < GRID; k++) {
                tau[k] = lo * Math.pow(hi / lo, k / (GRID - 1.0));
                double bk = 0;
                for (int i = 0; i < ts.length; i++) {
                    e[k][i] = -Math.expm1(-ts[i] / tau[k]);
                    bk += e[k][i] * ys[i];
                }
                b[k] = bk;
            }
            for (int k = 0; k < GRID; k++)
                for (int l = k; l < GRID; l++) {
                    double d = 0;
                    for (int i = 0; i < ts.length; i++) d += e[k][i] * e[l][i];
                    gram[k][l] = gram[l][k] = d;
                }
        }
    }

    /**
     * Levenberg-Marquardt (ddogleg) over ln tau only, the amplitudes solved by linear least squares at every step:
     * variable projection (Golub and Pereyra 1973) with Kaufman's Jacobian (I - P) (dPhi/d ln tau_k) c_k (Kaufman
     * 1975), whose J^T r is the exact gradient. With the amplitudes projected out the long valleys of the full
     * problem (two constants merging, the slow one heading for infinity while its amplitude grows) are no longer
     * crept along: in the full (A, ln tau) parameters a third of the two-constant fits of one-constant data took
     * 450-500 iterations. Then the terms sorted by tau and the covariance s^2 (J^T J)^-1 of the full problem in
     * (A, tau). When a time constant runs beyond 1000 spans or below a millionth of a span, the two merge, or the
     * search stops gaining while still moving, it stops there and the optimum carries that problem; null when the
     * optimiser throws.
     */
    static Optimum optimum(double[] ts, double[] ys, double[] start, double span) {
        int nk = start.length / 2, m = ts.length;
        double[] theta = new double[nk];
        for (int k = 0; k < nk; k++) theta[k] = Math.log(start[2 * k + 1]);
        double lnMax = Math.log(1e3 * span), lnMin = Math.log(1e-6 * span);
        Projection pr = new Projection(ts, ys, nk);
        FunctionNtoM residuals = new FunctionNtoM() {
            @Override public void process(double[] th, double[] out) {
                pr.at(th);
                for (int i = 0; i < m; i++) out[i] = pr.model[i] - ys[i];
            }
            @Override public int getNumOfInputsN() { return nk; }
            @Override public int getNumOfOutputsM() { return m; }
        };
        FunctionNtoMxN<DMatrixRMaj> jacobian = new FunctionNtoMxN<>() {
            @Override public void process(double[] th, DMatrixRMaj out) {
                pr.at(th);
                for (int k = 0; k < nk; k++) {
                    double tau = Math.exp(th[k]);
                    double[] v = pr.work, phi = pr.phi[k];
                    // c_k dphi_k/d(ln tau_k) = -c_k exp(-t/tau) t / tau, exp(-t/tau) = 1 - phi_k
                    for (int i = 0; i < m; i++) v[i] = -pr.c[k] * (1 - phi[i]) * ts[i] / tau;
                    pr.removeSpan(v);
                    for (int i = 0; i < m; i++) out.unsafe_set(i, k, v[i]);
                }
            }
            @Override public DMatrixRMaj declareMatrixMxN() { return new DMatrixRMaj(m, nk); }
            @Override public int getNumOfInputsN() { return nk; }
            @Override public int getNumOfOutputsM() { return m; }
        };
        UnconstrainedLeastSquares<DMatrixRMaj> lm = FactoryOptimization.levenbergMarquardt(new ConfigLevenbergMarquardt(), false);
        lm.setFunction(residuals, jacobian);
        lm.initialize(theta, 1e-15, 1e-15);
        double[] x = theta.clone();
        String problem = null;
        // stagnation: every `check` iterations, compare with the state `check` iterations back; a settled optimum
        // has stopped moving, a search that still moves without gaining 1e-9 of its sum of squares is in a valley
        final int check = 20;
        double[] xBack = x.clone();
        double costBack = Double.POSITIVE_INFINITY;
        int it = 0;
        for (; it < MAX_ITERATIONS && problem == null; it++) {
            boolean done;
            try {
                done = lm.iterate();
            } catch (RuntimeException e) {
                return null;
            }
            double[] next = lm.getParameters();
            boolean finite = true;
            for (int k = 0; k < nk; k++) finite &= Double.isFinite(next[k]);
            if (!finite) {
                problem = "the search diverged";
                break;
            }
            x = next.clone();
            for (int k = 0; k < nk; k++)
                if (x[k] > lnMax || x[k] < lnMin)
                    problem = String.format(Locale.ROOT, "a time constant ran %s (%s s)",
                            x[k] > lnMax ? "beyond 1000 spans of the series" : "towards zero", sig(Math.exp(x[k])));
            if (nk == 2 && Math.abs(x[0] - x[1]) < 1e-4) problem = "the two time constants merged";
            if (done || problem != null) break;
            if ((it + 1) % check == 0) {
                double cost = lm.getFunctionValue();
                if (costBack - cost <= 1e-9 * cost) {
                    double moved = 0;
                    for (int k = 0; k < nk; k++) moved = Math.max(moved, Math.abs(x[k] - xBack[k]));
                    if (moved > 1e-7) problem = "the search crept along a valley of nearly equal fits";
                    break;
                }
                costBack = cost;
                xBack = x.clone();
            }
        }
        if (it >= MAX_ITERATIONS && problem == null) problem = "the search did not settle in " + MAX_ITERATIONS + " steps";
        pr.at(x);
        if (!pr.solved) return null;
        double[] p = new double[2 * nk];
        for (int k = 0; k < nk; k++) {
            p[2 * k] = pr.c[k];
            p[2 * k + 1] = Math.exp(x[k]);
        }
        if (nk == 2 && p[3] < p[1]) p = new double[]{p[2], p[3], p[0], p[1]};
        return covariance(ts, ys, p, problem);
    }

    /**
     * For given ln tau: the basis phi_k = 1 - exp(-t/tau_k), the amplitudes c = (Phi^T Phi)^-1 Phi^T y and the
     * model Phi c; and the removal of a vector's component in the span of Phi. One or two terms, solved in closed
     * form. A singular basis leaves {@code solved} false and the model NaN (the optimiser then rejects the step).
     */
    private static final class Projection {
        final double[] ts, ys, model, work;
        final double[][] phi;
        final double[] c;
        final int nk;
        double g00, g01, g11, det;
        boolean solved;
        double[] last;

        Projection(double[] ts, double[] ys, int nk) {
            this.ts = ts;
            this.ys = ys;
            this.nk = nk;
            model = new double[ts.length];
            work = new double[ts.length];
            phi = new double[nk][ts.length];
            c = new double[nk];
        }

        void at(double[] th) {
            // the optimiser asks for the Jacobian where it just evaluated the residuals: reuse the basis then
            if (last != null && java.util.Arrays.equals(th, last)) return;
            last = th.clone();
            int m = ts.length;
            for (int k = 0; k < nk; k++) {
                double tau = Math.exp(th[k]);
                for (int i = 0; i < m; i++) phi[k][i] = -Math.expm1(-ts[i] / tau);
            }
            double b0 = 0, b1 = 0;
            g00 = g01 = g11 = 0;
            for (int i = 0; i < m; i++) {
                g00 += phi[0][i] * phi[0][i];
                b0 += phi[0][i] * ys[i];
                if (nk == 2) {
                    g01 += phi[0][i] * phi[1][i];
                    g11 += phi[1][i] * phi[1][i];
                    b1 += phi[1][i] * ys[i];
                }
            }
            if (nk == 1) {
                det = g00;
                solved = g00 > 0;
                c[0] = b0 / g00;
            } else {
                det = g00 * g11 - g01 * g01;
                solved = det > 1e-14 * g00 * g11;
                c[0] = (g11 * b0 - g01 * b1) / det;
                c[1] = (g00 * b1 - g01 * b0) / det;
            }
            for (int i = 0; i < m; i++) {
                double v = c[0] * phi[0][i];
                if (nk == 2) v += c[1] * phi[1][i];
                model[i] = solved ? v : Double.NaN;
            }
        }

        /** v minus its least-squares projection on the basis: (I - P) v. */
        void removeSpan(double[] v) {
            int m = ts.length;
            double u0 = 0, u1 = 0;
            for (int i = 0; i < m; i++) {
                u0 += phi[0][i] * v[i];
                if (nk == 2) u1 += phi[1][i] * v[i];
            }
            double a0, a1 = 0;
            if (nk == 1) {
                a0 = u0 / g00;
            } else {
                a0 = (g11 * u0 - g01 * u1) / det;
                a1 = (g00 * u1 - g01 * u0) / det;
            }
            for (int i = 0; i < m; i++) {
                v[i] -= a0 * phi[0][i];
                if (nk == 2) v[i] -= a1 * phi[1][i];
            }
        }
    }

    /**
     * SSR and s^2 (J^T J)^-1 at p in (A, tau), inverted with Jacobi scaling; without covariance (and with a
     * problem) when one was given, when J^T J is singular or an error is not finite; null when the SSR is not finite.
     */
    static Optimum covariance(double[] ts, double[] ys, double[] p, String problem) {
        int np = p.length, m = ts.length;
        double[][] jtj = new double[np][np];
        double[] col = new double[np];
        double ssr = 0;
        for (int i = 0; i < m; i++) {
            double v = 0;
            for (int k = 0; k < np; k += 2) {
                double e = Math.exp(-ts[i] / p[k + 1]);
                v += p[k] * (1 - e);
                col[k] = 1 - e;
                col[k + 1] = -p[k] * e * ts[i] / (p[k + 1] * p[k + 1]);
            }
            double r = v - ys[i];
            ssr += r * r;
            for (int a = 0; a < np; a++)
                for (int c = 0; c < np; c++) jtj[a][c] += col[a] * col[c];
        }
        if (m <= np || !Double.isFinite(ssr)) return null;
        if (problem != null) return new Optimum(p, null, ssr, m, problem);
        String singular = "the normal equations are singular";
        double s2 = ssr / (m - np);
        double[] d = new double[np];
        for (int a = 0; a < np; a++) {
            d[a] = Math.sqrt(jtj[a][a]);
            if (!(d[a] > 0) || !Double.isFinite(d[a])) return new Optimum(p, null, ssr, m, singular);
        }
        DMatrixRMaj scaled = new DMatrixRMaj(np, np);
        for (int a = 0; a < np; a++)
            for (int c = 0; c < np; c++) scaled.set(a, c, jtj[a][c] / (d[a] * d[c]));
        if (!CommonOps_DDRM.invert(scaled)) return new Optimum(p, null, ssr, m, singular);
        double[][] cov = new double[np][np];
        for (int a = 0; a < np; a++)
            for (int c = 0; c < np; c++) cov[a][c] = s2 * scaled.get(a, c) / (d[a] * d[c]);
        for (int a = 0; a < np; a++)
            if (!(cov[a][a] >= 0) || !Double.isFinite(cov[a][a])) return new Optimum(p, null, ssr, m, singular);
        return new Optimum(p, cov, ssr, m, null);
    }

    static String sig(double v) {
        if (!Double.isFinite(v)) return String.valueOf(v);
        if (v != 0 && Math.abs(v) < 1e-3) return String.format(Locale.ROOT, "%.1e", v);
        if (Math.abs(v) >= 1000 && Math.abs(v) < 1e7) return String.format(Locale.ROOT, "%.0f", v);
        return String.format(Locale.ROOT, "%.3g", v);
    }
}
