package org.risetrace.analysis;

import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

/**
 * One part's rise curve ({@link PartCurve#measure}) on hand-made series whose answer is known by construction:
 * when an onset is reported, and that the background (ambient) reading is subtracted frame by frame.
 */
class PartCurveTest {
    private static final AnalysisOptions O = AnalysisOptions.defaults();

    @Test
    void noOnsetForAPartThatIsNotRisenAtTheEnd() {
        // issue 17: onset 29.5 s shown for a part whose end rise was -0.07 K. Noise-free baseline 25 C over 10
        // frames, then two frames 0.5 K up (above any threshold of a noise near 0.01 K) and back to -0.07 K.
        int n = 60;
        double[] t = new double[n], part = new double[n];
        Random rnd = new Random(3);
        for (int i = 0; i < n; i++) {
            t[i] = 0.5 * i;
            part[i] = 25 + 0.01 * rnd.nextGaussian() + (i == 30 || i == 31 ? 0.5 : i > 31 ? -0.07 : 0);
        }
        PartCurve c = PartCurve.measure(t, part, null, null, 10, 4.75, O);
        assertNull(c.onsetS(), "end rise " + c.endRiseK() + " K is not above k sigma");
        assertNull(c.fit(), "a part that did not heat gets no rise model");

        // the same excursion that stays up: an onset at the first of the two frames (t = 15.0 s)
        for (int i = 32; i < n; i++) part[i] += 0.57;
        PartCurve up = PartCurve.measure(t, part, null, null, 10, 4.75, O);
        assertNotNull(up.onsetS());
        assertEquals(15.0, up.onsetS(), 1e-12);
    }

    @Test
    void noiseFromSecondDifferencesRecoversTheSimulatedSigmaDespiteRiseAndBends() {
        // simulator truth: white noise of sigma 0.05 K on a rise of 0.02 K/frame that bends to 0.005 K/frame half way
        // (a kink: one large second difference) and with a few single-frame spikes of 1 K. For white noise
        // var(d2) = 6 sigma^2 (1 + 4 + 1 times sigma^2), and 1.4826 MAD estimates a normal standard deviation
        // (common practice); the median ignores the kink and the spikes. 20,000 frames: the estimate's own scatter
        // is about 1 % (MAD efficiency 37 %, Rousseeuw and Croux 1993, from memory); within 3 %.
        int n = 20_000;
        double sigma = 0.05;
        double[] y = new double[n];
        Random rnd = new Random(31);
        for (int i = 0; i < n; i++) {
            double rise = i < n / 2 ? 0.02 * i : 0.02 * (n / 2) + 0.005 * (i - n / 2);
            y[i] = rise + sigma * rnd.nextGaussian() + (i % 997 == 0 ? 1.0 : 0);
        }
        assertEquals(sigma, PartCurve.secondDifferenceSigma(y), 0.03 * sigma);
        // and a baseline long enough is measured by its own standard deviation (commons-math3 StandardDeviation,
        // n - 1 in the denominator) of the rise over the baseline frames
        double[] t = new double[40], part = new double[40];
        for (int i = 0; i < 40; i++) {
            t[i] = i;
            part[i] = 25 + sigma * rnd.nextGaussian() + (i >= 20 ? 0.1 * (i - 19) : 0);
        }
        PartCurve c = PartCurve.measure(t, part, null, null, 20, 19.5, O);
        double[] base = java.util.Arrays.copyOf(c.riseK(), 20);
        assertEquals(new org.apache.commons.math3.stat.descriptive.moment.StandardDeviation().evaluate(base), c.noiseK(), 1e-12);
    }

    @Test
    void theRateWindowRecordedIsTheOneFitted() {
        // counted by hand: frames every 0.5 s from 0 to 19.5 s, injection at 5 s: a 3.5 s window holds the 7 frames
        // at 5.5-8.5 s and is widened to min_rate_frames (12): 5.5-11 s, recorded as 6 s after the start (not 3.5)
        double[] t = new double[40];
        for (int i = 0; i < t.length; i++) t[i] = 0.5 * i;
        int[] span = PartCurve.rateSpan(t, 5.0, 3.5, 12);
        assertEquals(11, span[0]);
        assertEquals(23, span[1]);
        assertEquals(6.0, PartCurve.rateSpanS(t, 5.0, 3.5, 12), 1e-12);
        // a window holding more than the fewest frames ends at its last frame within it
        assertEquals(10.0, PartCurve.rateSpanS(t, 5.0, 10.2, 12), 1e-12);
        // a series shorter than the fewest frames: all frames after the start
        assertEquals(14.5, PartCurve.rateSpanS(t, 5.0, 3.5, 100), 1e-12);
        // no frame after the start
        assertEquals(Double.NaN, PartCurve.rateSpanS(t, 19.5, 3.5, 12));
    }
}
