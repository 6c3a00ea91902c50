package org.risetrace.analysis;

import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The lock-in correlation on signals made in code, against their construction and lock-in correlation theory. */
class LockInFitTest {

    /** Frame times at about 4 per second with a seeded jitter of +-30 % of the spacing: frames need not be even. */
    private static double[] unevenTimes(int n, double spacing, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        double[] t = new double[n];
        for (int i = 0; i < n; i++) t[i] = i * spacing + (i == 0 ? 0 : (r.nextDouble() - 0.5) * 0.6 * spacing);
        return t;
    }

    @Test
    void noiseFreeSinusoidPerPixelIsRecoveredWithinOneMillionthOnUnevenFrames() {
        // reference: the construction itself; y = 25 C + a quadratic warming + A cos(theta - phi), where theta is the
        // excitation's fundamental (Excitation.referencePhase); every pixel its own A and phi
        Excitation ex = new Excitation(8.0, 3.0, 1.0, "test");
        double[] t = unevenTimes(400, 0.25, 7);
        Excitation.Window w = ex.window(t);
        assertEquals(12, w.periods()); // (99.75 + 0.25 - 1) / 8 = 12.4 whole periods
        LockInFit fit = new LockInFit(ex, w, 2);
        int width = 9, height = 7, n = width * height;
        double[] amp = new double[n], lag = new double[n];
        for (int k = 0; k < n; k++) {
            amp[k] = 0.2 + 0.05 * k;
            lag[k] = -170 + 5.3 * k;
        }
        LockInMaps maps = new LockInMaps(width, height, 1.0, fit);
        float[] raster = new float[n];
        double[][] series = new double[n][t.length];
        for (int i = 0; i < t.length; i++) {
            double th = ex.referencePhase(t[i]);
            double trend = 0.3 * (t[i] / 100) + 0.8 * (t[i] / 100) * (t[i] / 100);
            for (int k = 0; k < n; k++) {
                double v = 25 + trend + amp[k] * Math.cos(th - Math.toRadians(lag[k]));
                raster[k] = (float) v;
                series[k][i] = v;
            }
            maps.add(raster, null, t[i]);
        }
        LockInMaps.Maps m = maps.finish();
        for (int k = 0; k < n; k++) {
            // float rasters: the input itself is rounded to 2e-6 K at 25 C, far under 1e-6 of these amplitudes
            assertEquals(amp[k], m.amplitude()[k], 1e-6 * amp[k], "amplitude, pixel " + k);
            // the phase as a relative error of the complex amplitude: 1e-6 radian
            assertEquals(Math.toRadians(lag[k]), Math.toRadians(m.lagDeg()[k]), 1e-6, "lag, pixel " + k);
            assertEquals(amp[k] * Math.cos(Math.toRadians(lag[k])), m.inPhase()[k], 1e-6 * amp[k]);
            assertEquals(amp[k] * Math.sin(Math.toRadians(lag[k])), m.quadrature()[k], 1e-6 * amp[k]);
            LockInFit.SeriesFit direct = fit.fit(t, series[k]);
            assertEquals(amp[k], direct.amplitude(), 1e-9 * amp[k]);
            assertEquals(Math.toRadians(lag[k]), Math.toRadians(direct.lagDeg()), 1e-9);
        }
    }

    @Test
    void amplitudeStandardErrorIsSigmaTimesSqrtTwoOverNWithinTenPercentOver200Trials() {
        // lock-in correlation theory: with white noise sigma per frame over N frames of whole periods, the in-phase
        // and quadrature parts each carry sigma sqrt(2/N), and so does the amplitude when it is well above the noise
        // (Breitenstein, Warta and Langenkamp, Lock-in Thermography, Springer, section 2.2). 200 pixels = 200 trials.
        double sigma = 0.05, amplitude = 0.5;
        int frames = 320, trials = 200;
        Excitation ex = new Excitation(10.0, 5.0, 0.0, "test");
        double[] t = new double[frames];
        for (int i = 0; i < frames; i++) t[i] = 0.5 * i; // 160 s = 16 whole periods
        LockInFit fit = new LockInFit(ex, ex.window(t), 2);
        LockInMaps maps = new LockInMaps(trials, 1, 1.0, fit);
        SplittableRandom r = new SplittableRandom(20261202);
        float[] raster = new float[trials];
        for (int i = 0; i < frames; i++) {
            double s = amplitude * Math.cos(ex.referencePhase(t[i]) - 0.7) + 30 + 0.01 * t[i];
            for (int k = 0; k < trials; k++) raster[k] = (float) (s + sigma * gaussian(r));
            maps.add(raster, null, t[i]);
        }
        LockInMaps.Maps m = maps.finish();
        double mean = 0, meanSe = 0;
        for (int k = 0; k < trials; k++) {
            mean += m.amplitude()[k] / trials;
            meanSe += m.amplitudeSe()[k] / trials;
        }
        double ss = 0;
        for (int k = 0; k < trials; k++) ss += (m.amplitude()[k] - mean) * (m.amplitude()[k] - mean);
        double spread = Math.sqrt(ss / (trials - 1));
        double expected = sigma * Math.sqrt(2.0 / frames);
        assertEquals(expected, spread, 0.10 * expected, "scatter of the amplitude over 200 trials");
        assertEquals(expected, meanSe, 0.10 * expected, "the standard error the fit reports");
        assertEquals(amplitude, mean, 3 * expected / Math.sqrt(trials) + 1e-4, "unbiased at this SNR");
        assertEquals(Math.sqrt(2.0 / frames), maps.seFactor(), 0.01 * Math.sqrt(2.0 / frames));
    }

    @Test
    void spreadBetweenPeriodsCatchesCorrelatedNoiseThatTheResidualMisses() {
        // AR(1) noise x_i = rho x_{i-1} + e_i, rho = 0.9, 20 frames per period: its spectral density at the
        // fundamental is (1 - rho^2) / (1 - 2 rho cos(2 pi / 20) + rho^2) = 1.94 times that of white noise of the
        // same variance (Box and Jenkins, Time Series Analysis, AR(1) spectrum), so the residual's white-noise error
        // is sqrt(1.94) = 1.39 times too small; the spread of the per-period correlations (the method of batch means,
        // common practice for correlated series) sees the noise at the fundamental itself. 200 trials.
        double rho = 0.9, sigma = 0.05, amplitude = 0.3;
        int frames = 400, trials = 200;
        Excitation ex = new Excitation(10.0, 5.0, 0.0, "test");
        double[] t = new double[frames];
        for (int i = 0; i < frames; i++) t[i] = 0.5 * i; // 20 whole periods
        LockInFit fit = new LockInFit(ex, ex.window(t), 2);
        SplittableRandom r = new SplittableRandom(99);
        double[] amp = new double[trials];
        double white = 0, reported = 0;
        for (int k = 0; k < trials; k++) {
            double[] y = new double[frames];
            double x = sigma * gaussian(r);
            for (int i = 0; i < frames; i++) {
                x = rho * x + sigma * Math.sqrt(1 - rho * rho) * gaussian(r);
                y[i] = 25 + amplitude * Math.cos(ex.referencePhase(t[i]) - 1.0) + x;
            }
            LockInFit.SeriesFit f = fit.fit(t, y);
            amp[k] = f.amplitude();
            white += f.amplitudeSe() / trials;
            reported += f.se() / trials;
        }
        double mean = 0, ss = 0;
        for (double a : amp) mean += a / trials;
        for (double a : amp) ss += (a - mean) * (a - mean);
        double scatter = Math.sqrt(ss / (trials - 1));
        System.out.printf(java.util.Locale.ROOT, "AR(1) noise: amplitude scatter %.5f K, white-noise error %.5f K, "
                + "reported (with the between-period spread) %.5f K%n", scatter, white, reported);
        assertTrue(white < 0.8 * scatter, "the white-noise error alone is too small: " + white + " vs " + scatter);
        assertEquals(scatter, reported, 0.15 * scatter, "the reported error (the larger of the two)");
    }

    /** Standard normal deviate by Box-Muller (Box and Muller 1958). */
    private static double gaussian(SplittableRandom r) {
        double u = 1 - r.nextDouble(), v = r.nextDouble();
        return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    }

    @Test
    void windowHoldsWholePeriodsFromTheFirstSwitchOnOnly() {
        Excitation ex = new Excitation(10.0, 4.0, 5.0, "test");
        double[] t = new double[100];
        for (int i = 0; i < t.length; i++) t[i] = 0.5 * i; // 0 .. 49.5 s; frames stand for 0.5 s each
        Excitation.Window w = ex.window(t);
        assertEquals(5.0, w.startS(), 1e-12);
        assertEquals(4, w.periods()); // 5 .. 45 s; 45 .. 50 is half a period
        assertTrue(w.contains(5.0) && w.contains(44.5) && !w.contains(45.0) && !w.contains(4.5));
        // the fundamental of an on/off wave peaks in the middle of the on interval: here at 5 + 2 s
        assertEquals(0, ex.referencePhase(7.0), 1e-12);
    }

    @Test
    void recordedSwitchingTimesGiveTheExcitationWhenTheyKeepOnePeriod() {
        // on at 2, 10.05, 17.95, 26 s (period (26 - 2) / 3 = 8 s), off 4 s after each (mean of 4.0, 3.9, 4.1)
        Excitation ex = LockInAnalysis.fromSwitching(new double[]{2, 6, 10.05, 13.95, 17.95, 22.05, 26});
        assertEquals(8.0, ex.periodS(), 1e-12);
        assertEquals(4.0, ex.onS(), 1e-12);
        assertEquals(2.0, ex.firstOnS(), 1e-12);
        // a switch-on 0.5 s late (6 % of the period) breaks the fixed period lock-in needs
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> LockInAnalysis.fromSwitching(new double[]{2, 6, 10.5, 14, 18, 22, 26}));
        assertTrue(e.getMessage().contains("lock-in needs a steady period"), e.getMessage());
    }

    @Test
    void periodIsFoundFromTheSpectrumAndNotFromNoiseAlone() {
        double[] t = unevenTimes(300, 0.5, 3);
        double[] y = new double[t.length], noise = new double[t.length];
        SplittableRandom r = new SplittableRandom(11);
        for (int i = 0; i < t.length; i++) {
            noise[i] = 25 + 0.002 * t[i] + 0.01 * gaussian(r);
            // a square wave of period 12.5 s (its fundamental plus a third harmonic) under the same noise
            double th = 2 * Math.PI * t[i] / 12.5;
            y[i] = noise[i] + 0.01 * (Math.cos(th) - Math.cos(3 * th) / 3);
        }
        double[] found = LockInAnalyzer.strongestPeriod(t, y, 0);
        assertNotNull(found);
        // the periodogram's resolution is about period^2 / span = 1 s / 5 trial steps; the parabola refines it
        assertEquals(12.5, found[0], 0.1);
        assertNull(LockInAnalyzer.strongestPeriod(t, noise, 0), "white noise alone: no period");
    }

    private static LockInPart part(String ref, double amp, double se, Double lag, Double lagSe) {
        return new LockInPart(ref, 0, amp, se, amp / se, lag, lagSe, amp, 0, 0.9, 0.05);
    }

    private static Verdict decide(List<LockInPart> ranked) {
        double[] one = new double[ranked.size()];
        java.util.Arrays.fill(one, 1.0);
        Hotspots.Smoothed sm = new Hotspots.Smoothed(new BoardMap(1, 1, 1, new float[]{0}, "K"), 0, 0.001);
        double[] peaks = new double[ranked.size()];
        return LockInAnalysis.decide(ranked, one, one, List.of(), sm, peaks, List.of(), 0,
                AnalysisOptions.defaults(), 10);
    }

    @Test
    void verdictFollowsAmplitudeThenPhaseOnlyWhenThePhaseDifferenceExceedsItsUncertainty() {
        // clear amplitude lead, phases agree: identified by amplitude
        Verdict v = decide(List.of(part("Q3", 0.050, 0.002, 30.0, 2.3), part("C5", 0.020, 0.002, 70.0, 5.7)));
        assertEquals(VerdictStatus.IDENTIFIED, v.status());
        assertEquals("Q3", v.ref());
        // level amplitudes (1.1 combined errors), C5 leads in phase by (70 - 30) / hypot(4, 4) = 7.1 errors
        v = decide(List.of(part("Q3", 0.050, 0.003, 70.0, 4.0), part("C5", 0.045, 0.003, 30.0, 4.0)));
        assertEquals(VerdictStatus.IDENTIFIED, v.status());
        assertEquals("C5", v.ref());
        // level amplitudes and phases within their uncertainty: inconclusive
        v = decide(List.of(part("Q3", 0.050, 0.003, 40.0, 6.0), part("C5", 0.045, 0.003, 30.0, 6.0)));
        assertEquals(VerdictStatus.INCONCLUSIVE, v.status());
        // the highest amplitude lags the runner-up clearly: amplitude and phase disagree, inconclusive
        v = decide(List.of(part("Q3", 0.080, 0.002, 90.0, 1.5), part("C5", 0.040, 0.002, 20.0, 3.0)));
        assertEquals(VerdictStatus.INCONCLUSIVE, v.status());
        // a part far out lags by more than 180 degrees, which wraps to -129: that is no lead over the source
        v = decide(List.of(part("C9", 0.60, 0.011, 50.0, 1.1), part("R2", 0.010, 0.003, -129.4, 16.2)));
        assertEquals(VerdictStatus.IDENTIFIED, v.status());
        assertEquals("C9", v.ref());
        // nothing above 3 standard errors
        List<LockInPart> weak = new ArrayList<>(List.of(part("Q3", 0.004, 0.002, null, null), part("C5", 0.002, 0.002, null, null)));
        assertEquals(VerdictStatus.NO_HEATING, decide(weak).status());
    }
}
