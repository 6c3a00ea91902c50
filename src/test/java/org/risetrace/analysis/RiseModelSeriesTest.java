package org.risetrace.analysis;

import org.junit.jupiter.api.Test;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The rise model on whole analyses: the leading part's fit RMS against its measured noise, on the bundled simulator
 * series and on a board-space series made here from a different model (two Gaussian blobs with their own time
 * constants at one place, no heat equation, no camera).
 */
class RiseModelSeriesTest {

    static PartResult part(Analysis a, String ref) {
        return a.result().parts().stream().filter(p -> p.ref().equals(ref)).findFirst().orElseThrow();
    }

    static RiseCurve curve(Analysis a, String ref) {
        return a.curves().stream().filter(c -> c.ref().equals(ref)).findFirst().orElseThrow();
    }

    @Test
    void bundledPhaseShortLeaderIsFittedToItsNoise() {
        Path dir = Path.of("sample-frames", "phase-short");
        assertTrue(Files.isDirectory(dir), "bundled series missing");
        Analysis a = SimulatedSeriesTest.analyze(dir);
        PartResult q3 = part(a, "Q3");
        assertNotNull(q3.fit());
        System.out.printf("phase-short Q3: %s, fit RMS %.4f K, noise %.4f K, %s%n", q3.fit().model(), q3.fitRmsK(),
                q3.noiseK(), q3.fit().selection());
        // measured 2 December 2026: two time constants (1.40 K in 2.27 s, 1.27 K in 20.3 s), RMS 0.0176 K against a
        // baseline noise of 0.0170 K (1.03 x); the one-constant fit left 0.108 K (6.4 x). Asserted: RMS below
        // 1.5 x the noise, a margin that a model missing the die or the board term cannot meet.
        assertEquals(RiseModelFit.DOUBLE, q3.fit().model(), q3.fit().selection());
        assertTrue(q3.fitRmsK() < 1.5 * q3.noiseK(), q3.fitRmsK() + " K vs noise " + q3.noiseK());
        // the one-constant fit of the same curve does not follow it: the test tells the models apart
        RiseCurve c = curve(a, "Q3");
        double[][] p = afterStart(c, q3.fit().t0S());
        RiseModelFit.Optimum one = RiseModelFit.fitSingle(p[0], p[1]);
        assertTrue(Math.sqrt(one.ssr() / one.n()) > 3 * q3.noiseK());
        // the rate stays the ranking statistic and the verdict is unchanged
        assertEquals("Q3", a.result().verdict().ref());
        assertEquals(RiseModelFit.RULE, a.result().parameters().get("fit_model_rule"));
        assertNoFitWithoutOnset(a);
    }

    @Test
    void twoTimeConstantSourceInBoardSpaceIsFittedToItsNoise() {
        // a second model, not the simulator: on Q1 a die term (1.2 K, 2 s) and a board term (1.0 K, 25 s) as two
        // Gaussian blobs at the same place, on Q2 one term (0.4 K, 10 s); 0.05 K pixel noise (a typical
        // microbolometer NETD, common practice), 40 frames 1 s apart, injection at 5 s (SeriesAnalysisTest.run)
        Analysis a = SeriesAnalysisTest.run(SeriesAnalysisTest.board(), List.of(
                        new SeriesAnalysisTest.Source(10, 10, 2, 1.2, 2.0),
                        new SeriesAnalysisTest.Source(10, 10, 2, 1.0, 25.0),
                        new SeriesAnalysisTest.Source(25, 10, 2, 0.4, 10.0)),
                0.05, 4, AnalysisOptions.defaults());
        PartResult q1 = part(a, "Q1");
        assertNotNull(q1.fit());
        System.out.printf("board-space Q1: %s, fit RMS %.4f K, noise %.4f K, %s, terms %s%n", q1.fit().model(),
                q1.fitRmsK(), q1.noiseK(), q1.fit().selection(), q1.fit().terms());
        assertEquals(RiseModelFit.DOUBLE, q1.fit().model(), q1.fit().selection());
        assertTrue(q1.fitRmsK() < 1.5 * q1.noiseK(), q1.fitRmsK() + " K vs noise " + q1.noiseK());
        // the generating time constants within 4 standard errors plus 15 % (the footprint's p95 of blob + noise is
        // not exactly linear in the blob near the noise: SeriesAnalysisTest)
        RiseModelFit.Term fast = q1.fit().terms().get(0), slow = q1.fit().terms().get(1);
        assertEquals(2.0, fast.tauS(), 0.15 * 2.0 + 4 * fast.tauSe());
        assertEquals(25.0, slow.tauS(), 0.15 * 25.0 + 4 * slow.tauSe());
        assertEquals("Q1", a.result().verdict().ref());
        assertNoFitWithoutOnset(a);
    }

    /** Only a part that heated has a fitted curve. */
    static void assertNoFitWithoutOnset(Analysis a) {
        for (RiseCurve c : a.curves())
            if (c.onsetS() == null) assertNull(c.fit(), c.ref());
        for (PartResult p : a.result().parts())
            if (p.onsetS() == null) {
                assertNull(p.fit(), p.ref());
                assertNull(p.tauS(), p.ref());
            }
    }

    static double[][] afterStart(RiseCurve c, double t0) {
        int m = 0;
        for (int i = 0; i < c.tS().length; i++) if (c.tS()[i] > t0 && Double.isFinite(c.riseK()[i])) m++;
        double[] ts = new double[m], ys = new double[m];
        for (int i = 0, k = 0; i < c.tS().length; i++)
            if (c.tS()[i] > t0 && Double.isFinite(c.riseK()[i])) {
                ts[k] = c.tS()[i] - t0;
                ys[k++] = c.riseK()[i];
            }
        return new double[][]{ts, ys};
    }
}
