package org.risetrace.analysis;

import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Pull test of the rate's standard error ({@link LineFit}): over many noisy synthetic straight rises with a known
 * slope, the pull z = (fitted slope - true slope) / standard error must have the spread the error claims. For
 * Gaussian white noise and s estimated from the residuals, z follows Student's t with n - 2 degrees of freedom
 * (Draper and Smith, Applied Regression Analysis, ch. 1), so E[z^2] = nu / (nu - 2) and P(|z| < t_0.975) = 0.95; the
 * t quantile is taken from commons-math3's TDistribution (the reference library). For serially correlated noise the
 * production path widens the error by sqrt((1 + r) / (1 - r)) (Bence 1995): without it the pulls are far too wide.
 */
class RateErrorPullTest {
    static final int CURVES = 4000;

    @Test
    void whiteNoisePullsFollowStudentT() {
        int n = 20;
        double nu = n - 2, trueSlope = 0.08, sigma = 0.05;
        double tq = new TDistribution(nu).inverseCumulativeProbability(0.975);
        Random rnd = new Random(17);
        double[] t = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) t[i] = 0.5 * i;
        double sumZ2 = 0;
        int inside = 0;
        for (int k = 0; k < CURVES; k++) {
            for (int i = 0; i < n; i++) y[i] = 25 + trueSlope * t[i] + sigma * rnd.nextGaussian();
            LineFit f = LineFit.fit(t, y, null, 0, n, 0);
            double z = (f.slope() - trueSlope) / f.slopeSe();
            sumZ2 += z * z;
            if (Math.abs(z) < tq) inside++;
        }
        double meanZ2 = sumZ2 / CURVES; // measured (seed 17): 1.128, coverage 0.948
        // E[z^2] = 18 / 16 = 1.125; Var[z^2] = E z^4 - 1.125^2 = 3 nu^2 / ((nu - 2)(nu - 4)) - 1.266 = 3.07, so the
        // mean over 4000 curves has a standard error of sqrt(3.07 / 4000) = 0.028: within 4 of those
        assertEquals(nu / (nu - 2), meanZ2, 4 * 0.028, "mean z^2");
        // coverage 0.95, binomial standard error sqrt(0.95 * 0.05 / 4000) = 0.0034: within 4 of those
        assertEquals(0.95, inside / (double) CURVES, 4 * 0.0034, "coverage of the 95 % t interval");
    }

    @Test
    void serialCorrelationIsCoveredByTheWidenedError() {
        // AR(1) noise, phi = 0.5, as the frame-to-frame drift of a camera's offset can give; 60 frames
        int n = 60;
        double phi = 0.5, trueSlope = 0.05, sigma = 0.05;
        Random rnd = new Random(23);
        double[] t = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) t[i] = 0.5 * i;
        double sumPlain = 0, sumWide = 0;
        for (int k = 0; k < CURVES; k++) {
            double e = sigma * rnd.nextGaussian() / Math.sqrt(1 - phi * phi);
            for (int i = 0; i < n; i++) {
                e = phi * e + sigma * rnd.nextGaussian();
                y[i] = 25 + trueSlope * t[i] + e;
            }
            LineFit f = LineFit.fit(t, y, null, 0, n, 0);
            LineFit w = f.widenedForSerialCorrelation(f.residualLag1(t, y, null, 0, n));
            double zp = (f.slope() - trueSlope) / f.slopeSe(), zw = (w.slope() - trueSlope) / w.slopeSe();
            sumPlain += zp * zp;
            sumWide += zw * zw;
        }
        double rmsPlain = Math.sqrt(sumPlain / CURVES), rmsWide = Math.sqrt(sumWide / CURVES);
        // the plain error understates the spread by about sqrt((1 + phi) / (1 - phi)) = 1.73 (Bence 1995); measured 1.80
        assertTrue(rmsPlain > 1.4, "plain RMS pull " + rmsPlain);
        // widened: RMS pull near 1. Measured (seed 23): plain 1.80, widened 1.19. The remaining 19 % under-coverage
        // is known: the lag-1 estimate from 60 trend-removed residuals is biased low (by about (1 + 4 phi) / n for a
        // known mean, more with a fitted line; Marriott and Pope 1954, from memory) and the AR(1) inflation factor
        // is the large-n one. Bound: 1.25, i.e. a rate error at most a quarter too small for this strong correlation
        assertTrue(rmsWide > 0.85 && rmsWide < 1.25, "widened RMS pull " + rmsWide);
    }
}
