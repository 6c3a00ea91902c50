package org.risetrace.analysis;

import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

class LineFitTest {

    @Test
    void equalWeightSlopeAndErrorMatchCommonsMathSimpleRegression() {
        Random rnd = new Random(7);
        int n = 25;
        double[] t = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = i * 0.5;
            y[i] = 0.3 + 0.04 * t[i] + 0.05 * rnd.nextGaussian();
        }
        LineFit fit = LineFit.fit(t, y, null, 0, n, 0);
        // the general-purpose reference library (commons-math3 SimpleRegression: slope and its standard error,
        // Draper & Smith eqs. 1.2.9 and 3.1.6)
        SimpleRegression ref = new SimpleRegression();
        for (int i = 0; i < n; i++) ref.addData(t[i], y[i]);
        assertEquals(ref.getSlope(), fit.slope(), 1e-12);
        assertEquals(ref.getSlopeStdErr(), fit.slopeSe(), 1e-12);
    }

    @Test
    void anscombesFirstDataSetGivesThePublishedLine() {
        // Anscombe, "Graphs in Statistical Analysis", The American Statistician 27 (1973) 17-21, data set I and the
        // numbers printed with it (from memory): y = 3.00 + 0.500 x, standard error of the slope 0.118, residual
        // sum of squares 13.75 on 9 degrees of freedom (s = sqrt(13.75 / 9) = 1.236)
        double[] x = {10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5};
        double[] y = {8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68};
        LineFit fit = LineFit.fit(x, y, null, 0, x.length, 0);
        assertEquals(0.500, fit.slope(), 0.0005);
        assertEquals(3.00, fit.intercept(), 0.005);
        assertEquals(0.118, fit.slopeSe(), 0.0005);
        assertEquals(Math.sqrt(13.75 / 9), fit.residualSigma(), 0.002);
        assertEquals(11, fit.n());
    }

    @Test
    void weightedFitEqualsOrdinaryLeastSquaresOnRowsScaledBySqrtWeight() {
        // weighted least squares is OLS of sqrt(w) y on sqrt(w) and sqrt(w) t without an intercept (Draper & Smith
        // ch. 9); reference: commons-math3 OLSMultipleLinearRegression, slope and its standard error. Relative
        // weights: scaling all of them leaves both unchanged.
        Random rnd = new Random(19);
        int n = 30;
        double[] t = new double[n], y = new double[n], w = new double[n];
        double[][] x = new double[n][2];
        double[] yw = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = 0.5 * i + 0.1 * rnd.nextDouble();
            w[i] = i % 7 == 3 ? 0.5 : 1.0 + rnd.nextDouble();
            y[i] = 25 + 0.07 * t[i] + 0.04 * rnd.nextGaussian() / Math.sqrt(w[i]);
            double r = Math.sqrt(w[i]);
            x[i][0] = r;
            x[i][1] = r * t[i];
            yw[i] = r * y[i];
        }
        OLSMultipleLinearRegression ref = new OLSMultipleLinearRegression();
        ref.setNoIntercept(true);
        ref.newSampleData(yw, x);
        double[] beta = ref.estimateRegressionParameters(), se = ref.estimateRegressionParametersStandardErrors();
        LineFit fit = LineFit.fit(t, y, w, 0, n, 0);
        assertEquals(beta[0], fit.intercept(), 1e-9);
        assertEquals(beta[1], fit.slope(), 1e-10);
        assertEquals(se[1], fit.slopeSe(), 1e-10);
        double[] w3 = w.clone();
        for (int i = 0; i < n; i++) w3[i] *= 3.7;
        assertEquals(se[1], LineFit.fit(t, y, w3, 0, n, 0).slopeSe(), 1e-10);
    }

    @Test
    void weightsActLikeRepeatedPoints() {
        // a point of weight 2 is the same as the point given twice (definition of weighted least squares,
        // Draper & Smith ch. 9) - compare slopes; the standard errors differ by the degrees of freedom only
        double[] t = {0, 1, 2, 3, 4}, y = {0.1, 0.9, 2.2, 2.8, 4.1}, w = {1, 1, 2, 1, 1};
        double[] t2 = {0, 1, 2, 2, 3, 4}, y2 = {0.1, 0.9, 2.2, 2.2, 2.8, 4.1};
        assertEquals(LineFit.fit(t2, y2, null, 0, 6, 0).slope(), LineFit.fit(t, y, w, 0, 5, 0).slope(), 1e-12);
    }

    @Test
    void noiseFloorWidensAnImplausiblyTightFit() {
        double[] t = {0, 1, 2, 3}, y = {0, 1, 2, 3};
        LineFit fit = LineFit.fit(t, y, null, 0, 4, 0.1);
        // se = sigma / sqrt(Sxx), Sxx = 5 for t = 0..3 (Draper & Smith eq. 3.1.6 with s replaced by the floor)
        assertEquals(0.1 / Math.sqrt(5), fit.slopeSe(), 1e-12);
        assertNull(LineFit.fit(t, y, null, 0, 2, 0));
    }
}
