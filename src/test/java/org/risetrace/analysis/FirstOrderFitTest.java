package org.risetrace.analysis;

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

class FirstOrderFitTest {

    private static double[][] series(double t0, double a, double tau, double noise, long seed) {
        Random rnd = new Random(seed);
        int n = 60;
        double[] t = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = i * 1.0;
            y[i] = (t[i] > t0 ? a * (1 - Math.exp(-(t[i] - t0) / tau)) : 0) + noise * rnd.nextGaussian();
        }
        return new double[][]{t, y};
    }

    @Test
    void levenbergMarquardtAgreesWithCommonsMathOnTheSameData() {
        double t0 = 5;
        double[][] d = series(t0, 4.0, 12.0, 0.05, 11);
        FirstOrderFit fit = FirstOrderFit.fit(d[0], d[1], t0);
        assertNotNull(fit);

        // reference: commons-math3 LevenbergMarquardtOptimizer on the same points (t > t0) and model
        int count = 0;
        for (double t : d[0]) if (t > t0) count++;
        final int m = count;
        double[] ts = new double[m], ys = new double[m];
        for (int i = 0, k = 0; i < d[0].length; i++) if (d[0][i] > t0) { ts[k] = d[0][i] - t0; ys[k++] = d[1][i]; }
        LeastSquaresOptimizer.Optimum opt = new LevenbergMarquardtOptimizer()
                .withCostRelativeTolerance(1e-15).withParameterRelativeTolerance(1e-15)
                .optimize(new LeastSquaresBuilder()
                        .start(new double[]{3, 8})
                        .model(p -> {
                            double a = p.getEntry(0), tau = p.getEntry(1);
                            RealVector v = new ArrayRealVector(m);
                            RealMatrix j = new Array2DRowRealMatrix(m, 2);
                            for (int i = 0; i < m; i++) {
                                double e = Math.exp(-ts[i] / tau);
                                v.setEntry(i, a * (1 - e));
                                j.setEntry(i, 0, 1 - e);
                                j.setEntry(i, 1, -a * e * ts[i] / (tau * tau));
                            }
                            return new Pair<>(v, j);
                        })
                        .target(ys).maxEvaluations(10000).maxIterations(10000).build());
        double refA = opt.getPoint().getEntry(0), refTau = opt.getPoint().getEntry(1);
        // issue #5: parameters equal within 1e-6 relative
        assertEquals(refA, fit.dtInfK(), 1e-6 * Math.abs(refA));
        assertEquals(refTau, fit.tauS(), 1e-6 * Math.abs(refTau));
        // standard errors: commons-math3 getSigma(0) is sqrt(diag((J^T J)^-1)), scaled here by s = sqrt(SSR/(n-p))
        double s = Math.sqrt(opt.getCost() * opt.getCost() / (m - 2));
        assertEquals(opt.getSigma(0).getEntry(0) * s, fit.dtInfSe(), 1e-4 * fit.dtInfSe());
        assertEquals(opt.getSigma(0).getEntry(1) * s, fit.tauSe(), 1e-4 * fit.tauSe());
    }

    @Test
    void recoversTheTimeConstantOfACleanCurveWithinItsError() {
        double[][] d = series(0, 2.0, 20.0, 0.02, 3);
        FirstOrderFit fit = FirstOrderFit.fit(d[0], d[1], 0);
        assertNotNull(fit);
        // simulated truth tau = 20 s, dT_inf = 2 K: within 4 standard errors
        assertEquals(20.0, fit.tauS(), 4 * fit.tauSe());
        assertEquals(2.0, fit.dtInfK(), 4 * fit.dtInfSe());
        assertEquals(0.02, fit.rmsK(), 0.01);
    }
}
