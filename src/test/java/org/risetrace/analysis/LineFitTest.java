package org.risetrace.analysis;

import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

class LineFitTest {

    @Test
    void equalWeightSlopeErrorMatchesTheOrdinaryLeastSquaresFormula() {
        Random rnd = new Random(7);
        int n = 25;
        double[] t = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = i * 0.5;
            y[i] = 0.3 + 0.04 * t[i] + 0.05 * rnd.nextGaussian();
        }
        LineFit fit = LineFit.fit(t, y, null, 0, n, 0);
        // Draper & Smith, Applied Regression Analysis, 3rd ed., eqs. 1.2.9 and 3.1.6:
        // b1 = Sxy / Sxx, se(b1) = s / sqrt(Sxx), s^2 = SSR / (n - 2), written out here independently
        double tm = 0, ym = 0;
        for (int i = 0; i < n; i++) { tm += t[i] / n; ym += y[i] / n; }
        double sxx = 0, sxy = 0;
        for (int i = 0; i < n; i++) { sxx += (t[i] - tm) * (t[i] - tm); sxy += (t[i] - tm) * (y[i] - ym); }
        double b1 = sxy / sxx, b0 = ym - b1 * tm, ssr = 0;
        for (int i = 0; i < n; i++) ssr += Math.pow(y[i] - b0 - b1 * t[i], 2);
        double se = Math.sqrt(ssr / (n - 2) / sxx);
        assertEquals(b1, fit.slope(), 1e-12);
        assertEquals(se, fit.slopeSe(), 1e-12);
        // and the general-purpose reference library agrees (commons-math3 SimpleRegression.getSlopeStdErr)
        SimpleRegression ref = new SimpleRegression();
        for (int i = 0; i < n; i++) ref.addData(t[i], y[i]);
        assertEquals(ref.getSlope(), fit.slope(), 1e-12);
        assertEquals(ref.getSlopeStdErr(), fit.slopeSe(), 1e-12);
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
