package org.risetrace.analysis;

import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.FDistribution;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;
import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The rise model fit: parameters against the generating values and against commons-math3's Levenberg-Marquardt,
 * standard errors against commons-math3's covariance and a Monte-Carlo spread, and the model choice against the
 * F distribution of commons-math3.
 */
class RiseModelFitTest {
    /** A package on a board (the bundled phase-short leader's fitted values): die 1.4 K in 2.3 s, board 1.3 K in 20 s. */
    static final double[] DIE_AND_BOARD = {1.4, 2.3, 1.3, 20.0};
    static final double T0 = 5, STEP = 0.5;
    static final int FRAMES = 90;

    /** FRAMES frames STEP apart, rise = sum of A (1 - exp(-(t - T0)/tau)) over the (A, tau) pairs, plus noise. */
    static double[][] series(double[] terms, double noise, Random rnd) {
        double[] t = new double[FRAMES], y = new double[FRAMES];
        for (int i = 0; i < FRAMES; i++) {
            t[i] = i * STEP;
            double v = 0;
            if (t[i] > T0) for (int k = 0; k < terms.length; k += 2) v += terms[k] * (1 - Math.exp(-(t[i] - T0) / terms[k + 1]));
            y[i] = v + (rnd == null ? 0 : noise * rnd.nextGaussian());
        }
        return new double[][]{t, y};
    }

    /** The points after T0 as t' = t - T0. */
    static double[][] afterStart(double[][] d) {
        int m = 0;
        for (double t : d[0]) if (t > T0) m++;
        double[] ts = new double[m], ys = new double[m];
        for (int i = 0, k = 0; i < d[0].length; i++)
            if (d[0][i] > T0) {
                ts[k] = d[0][i] - T0;
                ys[k++] = d[1][i];
            }
        return new double[][]{ts, ys};
    }

    /** commons-math3 LevenbergMarquardtOptimizer on the same model and points, from its own start. */
    static LeastSquaresOptimizer.Optimum commonsMath(double[] ts, double[] ys, double[] start) {
        int m = ts.length, np = start.length;
        return new LevenbergMarquardtOptimizer()
                .withCostRelativeTolerance(1e-15).withParameterRelativeTolerance(1e-15).withOrthoTolerance(1e-15)
                .optimize(new LeastSquaresBuilder()
                        .start(start)
                        .model(p -> {
                            RealVector v = new ArrayRealVector(m);
                            RealMatrix j = new Array2DRowRealMatrix(m, np);
                            for (int i = 0; i < m; i++) {
                                double s = 0;
                                for (int k = 0; k < np; k += 2) {
                                    double a = p.getEntry(k), tau = p.getEntry(k + 1), e = Math.exp(-ts[i] / tau);
                                    s += a * (1 - e);
                                    j.setEntry(i, k, 1 - e);
                                    j.setEntry(i, k + 1, -a * e * ts[i] / (tau * tau));
                                }
                                v.setEntry(i, s);
                            }
                            return new Pair<>(v, j);
                        })
                        .target(ys).maxEvaluations(100000).maxIterations(100000).build());
    }

    @Test
    void noiseFreeTwoTimeConstantsAreRecoveredWithinOnePartPerMillion() {
        // reference: the generating parameters themselves (exact data, zero residual at the truth)
        RiseModelFit fit = RiseModelFit.fit(series(DIE_AND_BOARD, 0, null)[0], series(DIE_AND_BOARD, 0, null)[1], T0);
        assertNotNull(fit);
        assertEquals(RiseModelFit.DOUBLE, fit.model(), fit.selection());
        assertEquals(2, fit.terms().size());
        for (int k = 0; k < 2; k++) {
            RiseModelFit.Term term = fit.terms().get(k);
            assertEquals(DIE_AND_BOARD[2 * k], term.dtK(), 1e-6 * DIE_AND_BOARD[2 * k]);
            assertEquals(DIE_AND_BOARD[2 * k + 1], term.tauS(), 1e-6 * DIE_AND_BOARD[2 * k + 1]);
        }
        assertEquals(2.7, fit.dtInfK(), 1e-6 * 2.7);
        assertEquals(0.0, fit.rmsK(), 1e-7);
    }

    @Test
    void noiseFreeOneTimeConstantIsRecoveredAndKeptSingle() {
        double[][] d = series(new double[]{2.0, 12.0}, 0, null);
        RiseModelFit fit = RiseModelFit.fit(d[0], d[1], T0);
        assertNotNull(fit);
        // exact one-constant data: the second term adds nothing (F = 0 or the two-constant fit runs off)
        assertEquals(RiseModelFit.SINGLE, fit.model(), fit.selection());
        assertEquals(2.0, fit.terms().get(0).dtK(), 1e-6 * 2.0);
        assertEquals(12.0, fit.terms().get(0).tauS(), 1e-6 * 12.0);
    }

    @Test
    void oneTimeConstantAgreesWithCommonsMathOnNoisyData() {
        double[][] p = afterStart(series(new double[]{4.0, 12.0}, 0.05, new Random(11)));
        RiseModelFit.Optimum ours = RiseModelFit.fitSingle(p[0], p[1]);
        assertNotNull(ours);
        LeastSquaresOptimizer.Optimum ref = commonsMath(p[0], p[1], new double[]{3, 8});
        assertSameOptimum(ours, ref, p[0].length);
    }

    @Test
    void twoTimeConstantsAgreeWithCommonsMathOnNoisyData() {
        double[][] p = afterStart(series(DIE_AND_BOARD, 0.02, new Random(12)));
        RiseModelFit.Optimum ours = RiseModelFit.fitDouble(p[0], p[1]);
        assertNotNull(ours);
        // commons-math3 starts 30 % off the generating values, independent of our grid start
        LeastSquaresOptimizer.Optimum ref = commonsMath(p[0], p[1], new double[]{1.0, 3.0, 1.7, 14.0});
        assertSameOptimum(ours, ref, p[0].length);
    }

    /**
     * Parameters equal within 1e-6 relative (issue #10); covariance s^2 (J^T J)^-1 (Bates and Watts ch. 2) equal to
     * commons-math3's getCovariances, which is (J^T J)^-1, scaled by s^2 = SSR / (n - p), within 1e-4 relative.
     */
    static void assertSameOptimum(RiseModelFit.Optimum ours, LeastSquaresOptimizer.Optimum ref, int m) {
        int np = ours.p().length;
        double[] rp = ref.getPoint().toArray();
        if (np == 4 && rp[3] < rp[1]) rp = new double[]{rp[2], rp[3], rp[0], rp[1]};
        for (int k = 0; k < np; k++) assertEquals(rp[k], ours.p()[k], 1e-6 * Math.abs(rp[k]), "parameter " + k);
        double s2 = ref.getCost() * ref.getCost() / (m - np);
        assertEquals(ref.getCost() * ref.getCost(), ours.ssr(), 1e-6 * ours.ssr());
        RealMatrix cov = ref.getCovariances(1e-14);
        boolean swapped = np == 4 && ref.getPoint().getEntry(3) < ref.getPoint().getEntry(1);
        for (int a = 0; a < np; a++) {
            int ra = swapped ? (a + 2) % 4 : a;
            double se = Math.sqrt(s2 * cov.getEntry(ra, ra));
            assertEquals(se, ours.se(a), 1e-4 * se, "standard error " + a);
        }
    }

    @Test
    void standardErrorsMatchTheMonteCarloSpread() {
        // 300 noisy replicates of the die-and-board curve, 0.02 K noise: the standard deviation of each fitted
        // parameter over the replicates against the mean reported standard error, within 15 % (the spread of a
        // standard deviation from 300 samples is about 1/sqrt(600) = 4 %, so 15 % is over 3 of its sigmas)
        int reps = 300;
        double[][] values = new double[4][reps];
        double[] seSum = new double[4];
        Random rnd = new Random(2026);
        for (int r = 0; r < reps; r++) {
            double[][] p = afterStart(series(DIE_AND_BOARD, 0.02, rnd));
            RiseModelFit.Optimum o = RiseModelFit.fitDouble(p[0], p[1]);
            assertNotNull(o, "replicate " + r);
            for (int k = 0; k < 4; k++) {
                values[k][r] = o.p()[k];
                seSum[k] += o.se(k);
            }
        }
        for (int k = 0; k < 4; k++) {
            double mean = 0, ss = 0;
            for (double v : values[k]) mean += v / reps;
            for (double v : values[k]) ss += (v - mean) * (v - mean);
            double spread = Math.sqrt(ss / (reps - 1)), se = seSum[k] / reps;
            assertEquals(spread, se, 0.15 * spread, "parameter " + k + ": spread " + spread + ", mean se " + se);
            // and unbiased within 4 standard errors of the mean of 300
            assertEquals(DIE_AND_BOARD[k], mean, 4 * spread / Math.sqrt(reps), "parameter " + k);
        }
    }

    @Test
    void fSurvivalFunctionEqualsCommonsMathFDistribution() {
        // P(F > f) for F(2, nu) in closed form against commons-math3's regularised incomplete beta
        for (int nu : new int[]{4, 10, 49, 75, 1196})
            for (double f : new double[]{0.01, 0.5, 1, 2.5, 4.6, 10, 100}) {
                double ref = 1 - new FDistribution(2, nu).cumulativeProbability(f);
                assertEquals(ref, RiseModelFit.fSurvivalTwo(f, nu), 1e-10 + 1e-9 * ref, "nu " + nu + " f " + f);
            }
    }

    @Test
    void oneTimeConstantDataChoosesOneAndTheFTestRejectsNearItsLevel() {
        // 1000 series of one constant (2 K, 12 s) with 0.02 K noise. The F-test rejects "one constant" at the 1 %
        // level, so no more than about 1 % of them may give p < 0.01. F(2, n - 4) is exact for linear models and the
        // usual approximation for nonlinear nested ones (Bates and Watts 3.5); here it is conservative: under one
        // constant the two-constant optimum often lies at a limit (tau2 beyond the series: one extra ramp, one
        // effective parameter instead of two), and a search from 180 starts found a lower sum of squares in only
        // 1 of 40 series. Measured (seed 77): 3 of 1000 at the 1 % level, 73 at the 10 % level. Allowed: up to the
        // 99.9 % quantile of Binomial(1000, level) from commons-math3 at either level, and at least half the nominal
        // rate at 10 % (a p-value off by a factor, e.g. F(1, n - 4) or SSR not halved, falls outside); at least 95 %
        // must come out single (issue #10: >= 95 % of 200, here of 1000).
        int trials = 1000, rejected = 0, rejectedAtTenth = 0, single = 0, fitted = 0;
        Random rnd = new Random(77);
        for (int r = 0; r < trials; r++) {
            double[][] d = series(new double[]{2.0, 12.0}, 0.02, rnd);
            RiseModelFit fit = RiseModelFit.fit(d[0], d[1], T0);
            if (fit == null) continue;
            fitted++;
            assertNotNull(fit.pValue(), fit.selection());
            if (fit.pValue() < RiseModelFit.P_LEVEL) rejected++;
            if (fit.pValue() < 0.1) rejectedAtTenth++;
            if (fit.model().equals(RiseModelFit.SINGLE)) single++;
        }
        BinomialDistribution level = new BinomialDistribution(trials, RiseModelFit.P_LEVEL);
        int high = level.inverseCumulativeProbability(0.999);
        // the same at the 10 % level, where 1000 trials tell a wrong distribution apart more sharply
        BinomialDistribution tenth = new BinomialDistribution(trials, 0.1);
        int lowTenth = trials / 20, highTenth = tenth.inverseCumulativeProbability(0.999);
        System.out.printf("one-constant data: %d of %d fitted, F-test p < 0.01 in %d (allowed ..%d), p < 0.1 in %d "
                        + "(allowed %d..%d), single chosen %d%n", fitted, trials, rejected, high, rejectedAtTenth,
                lowTenth, highTenth, single);
        assertEquals(trials, fitted);
        assertTrue(rejected <= high, rejected + " rejections of " + trials);
        assertTrue(rejectedAtTenth >= lowTenth && rejectedAtTenth <= highTenth, rejectedAtTenth + " at the 10 % level");
        assertTrue(single >= 0.95 * trials, single + " of " + trials + " single");
    }

    @Test
    void clearTwoTimeConstantDataChoosesTwo() {
        // the die-and-board curve with 0.02 K noise (the bundled phase-short leader's): F is about 1000 there
        int trials = 100, two = 0;
        Random rnd = new Random(78);
        for (int r = 0; r < trials; r++) {
            double[][] d = series(DIE_AND_BOARD, 0.02, rnd);
            RiseModelFit fit = RiseModelFit.fit(d[0], d[1], T0);
            if (fit != null && fit.isDouble()) two++;
        }
        assertEquals(trials, two);
    }

    @Test
    void closeTimeConstantsAreNotCalledTwo() {
        // two terms 1.3 times apart are nearly collinear: with noise the fit may improve a little but the model
        // rule (tau2 >= 2 tau1, every parameter at least 2 standard errors) keeps one constant
        double[][] d = series(new double[]{1.0, 10.0, 1.0, 13.0}, 0.02, new Random(5));
        RiseModelFit fit = RiseModelFit.fit(d[0], d[1], T0);
        assertNotNull(fit);
        assertEquals(RiseModelFit.SINGLE, fit.model(), fit.selection());
    }

    @Test
    void straightLineGivesNoTimeConstant() {
        // a rise still straight at the end of the series: no time constant is determined, so no fit
        double[] t = new double[40], y = new double[40];
        Random rnd = new Random(9);
        for (int i = 0; i < t.length; i++) {
            t[i] = i;
            y[i] = (t[i] > T0 ? 0.01 * (t[i] - T0) : 0) + 0.01 * rnd.nextGaussian();
        }
        assertNull(RiseModelFit.fit(t, y, T0));
    }

    @Test
    void modelValueIsZeroUpToTheStartAndTheSumAfter() {
        double[][] d = series(DIE_AND_BOARD, 0, null);
        RiseModelFit fit = RiseModelFit.fit(d[0], d[1], T0);
        assertNotNull(fit);
        assertEquals(0.0, fit.at(T0), 0.0);
        assertEquals(0.0, fit.at(T0 - 1), 0.0);
        for (int i = 0; i < FRAMES; i++) assertEquals(d[1][i], fit.at(d[0][i]), 1e-7);
    }
}
