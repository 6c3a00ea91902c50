package org.risetrace.registration;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.board.Outline;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.risetrace.sim.Truth;

import java.nio.file.Path;
import java.util.Locale;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Accuracy on simulated series (heat model, camera with blur, NETD noise and fixed pattern, 16-bit PNG frames read
 * back through {@link Series}) against the simulator's truth.json. Limits: issue #4 (mean board-corner error
 * <= 0.15 px on a stand and <= 0.25 px hand-held over ok frames, none above 1 px, <= 1 % of hand-held frames
 * failed, >= 20 series per case).
 *
 * <p>The simulated board.json rounds the reference outline to the nearest half pixel, as a user's clicks would;
 * that offset is the same in every frame and belongs to the marking, not to registration, so these tests mark
 * the reference outline with its true corners and measure registration alone.
 */
class SimulatedSeriesAccuracyTest {
    static final int SERIES = 20, FRAMES = 8;
    static final boolean DIAG = Boolean.getBoolean("reg.diag");

    @TempDir
    Path dir;

    record Outcome(int frames, int ok, int weak, int failed, double meanOkErrorPx, double maxOkErrorPx,
                   double meanWeakErrorPx, double maxWeakErrorPx) {
        @Override
        public String toString() {
            return String.format(Locale.ROOT, "%d frames: %d ok, %d weak, %d failed; ok corner error mean %.3f px, max %.3f px;"
                    + " weak mean %.3f px, max %.3f px", frames, ok, weak, failed, meanOkErrorPx, maxOkErrorPx,
                    meanWeakErrorPx, maxWeakErrorPx);
        }
    }

    private Outcome run(Scenario.Motion motion, long seedBase) {
        return run(motion, seedBase, SERIES, 0, 0);
    }

    /** series simulated series; width and height 0 keep the scenarios' own frame size. */
    private Outcome run(Scenario.Motion motion, long seedBase, int seriesCount, int width, int height) {
        int n = 0, ok = 0, weak = 0, failed = 0;
        double sum = 0, max = 0, weakSum = 0, weakMax = 0;
        for (int s = 0; s < seriesCount; s++) {
            long seed = seedBase + s;
            Scenario sc = (s % 2 == 0 ? Scenarios.small(1.5 + 0.1 * s).withSeed(seed) : Scenarios.random(seed, 10, 1.5))
                    .withMotion(motion).withFrames(FRAMES, 1.0, 1.0);
            if (width > 0) sc = sc.withSize(width, height);
            SimulationOutput out = Simulator.run(sc, dir.resolve("series" + seed));
            Truth truth = out.truth();
            Board clicked = BoardFile.read(out.boardFile(), null);
            String refName = clicked.outline().frame();
            Truth.TruthFrame refTruth = truth.frames().stream().filter(f -> f.file().equals(refName)).findFirst()
                    .orElseThrow();
            Board board = new Board(clicked.name(), clicked.sizeMm(),
                    new Outline(refName, refTruth.boardCornersPx(), null), clicked.parts(), clicked.ambient());
            Series series = Series.open(out.directory());
            Frame ref = null;
            for (int i = 0; i < series.size(); i++) if (series.fileName(i).equals(refName)) ref = series.read(i);
            Registrar reg = Registrars.create(ref, board, RegistrationConfig.defaults());
            for (int i = 0; i < series.size(); i++) {
                if (series.fileName(i).equals(refName)) continue;
                Frame f = series.read(i);
                Truth.TruthFrame t = truth.frames().get(i);
                assertTrue(t.file().equals(f.fileName()), "truth in frame order");
                FrameRegistration g = reg.register(f);
                n++;
                if (DIAG && g.status() != RegistrationStatus.OK || DIAG && g.boardCornersPx() != null
                        && SyntheticScene.cornerError(g.boardCornersPx(), t.boardCornersPx()) > 0.5)
                    System.out.printf(Locale.ROOT, "DIAG %s %d %s %s err=%s %s%n", motion.kind(), seed, f.fileName(),
                            g.status(), g.boardCornersPx() == null ? "-" : String.format(Locale.ROOT, "%.3f",
                                    SyntheticScene.cornerError(g.boardCornersPx(), t.boardCornersPx())), g.reason());
                if (DIAG && g.status() != RegistrationStatus.OK) diagnoseAtTruth(ref, board, f, t);
                switch (g.status()) {
                    case OK -> {
                        double e = SyntheticScene.cornerError(g.boardCornersPx(), t.boardCornersPx());
                        sum += e;
                        max = Math.max(max, e);
                        ok++;
                    }
                    case WEAK -> {
                        double e = SyntheticScene.cornerError(g.boardCornersPx(), t.boardCornersPx());
                        weakSum += e;
                        weakMax = Math.max(weakMax, e);
                        weak++;
                    }
                    case FAILED -> failed++;
                    default -> throw new AssertionError(g.status());
                }
            }
        }
        Outcome o = new Outcome(n, ok, weak, failed, ok == 0 ? Double.NaN : sum / ok, max,
                weak == 0 ? 0 : weakSum / weak, weakMax);
        return o;
    }

    /**
     * Diagnostics (-Dreg.diag=true): the grade of the true mapping, and of the alignment started at it; it told
     * that the heated frames which fail do grade ok at their true mapping, so the search, not the grading, misses.
     */
    private static void diagnoseAtTruth(Frame ref, Board board, Frame f, Truth.TruthFrame t) {
        RegistrationConfig cfg = RegistrationConfig.defaults();
        ReferenceModel model = ReferenceModel.prepare(ref, board, cfg);
        DirectRegistrar dr = new DirectRegistrar(model, cfg);
        Pyramid p = new Pyramid();
        p.build(f.celsius(), f.width(), f.height(), model.levels);
        Homography boardToFrame = Homography.fromRows(t.homography().rows());
        Homography truthRefToFrame = boardToFrame.compose(model.boardToReference.inverse()).normalized();
        DirectRegistrar.Grade atTruth = dr.evaluate(p, truthRefToFrame, true);
        DirectAligner al = new DirectAligner();
        al.model = 4;
        al.robustFromStart = true;
        Homography h = al.align(model, p, truthRefToFrame, 0);
        String from = "-";
        if (h != null) {
            DirectRegistrar.Grade g = dr.evaluate(p, h, al.converged);
            double e = SyntheticScene.cornerError(Homographies.boardCorners(board, h.compose(model.boardToReference)),
                    t.boardCornersPx());
            from = String.format(Locale.ROOT, "%s err=%.3f %s", g.status(), e, g.reason());
        }
        System.out.printf(Locale.ROOT, "   at truth: %s %s | aligned from truth: %s%n", atTruth.status(), atTruth.reason(), from);
        for (int l = model.levels - 1; l < model.levels; l++)
            CoarseSearch.clipInPlace(p.bandPass[l], p.widths[l] * p.heights[l], model.level[l].t);
        StringBuilder sb = new StringBuilder("   coarse:");
        for (CoarseSearch.Candidate c : CoarseSearch.search(model, p, 4))
            sb.append(String.format(Locale.ROOT, " %.2f@%.1fpx", c.score(), SyntheticScene.cornerError(
                    Homographies.boardCorners(board, c.refToFrame().compose(model.boardToReference)), t.boardCornersPx())));
        System.out.println(sb);
    }

    @Test
    void simulatedStandSeriesRegisterWithinFifteenHundredthsOfAPixel() {
        // drift 0.15 px per frame: five times the simulator's default, so the test exercises real motion
        Outcome o = run(Scenario.Motion.stand(0.15), 5000);
        System.out.println("simulated stand: " + o);
        assertTrue(o.meanOkErrorPx() <= 0.15, "issue #4: mean <= 0.15 px on a stand; " + o);
        assertTrue(o.maxOkErrorPx() <= 1.0, "issue #4: no ok frame above 1 px; " + o);
        // measured 3 December 2026: 138 of 140 ok, 0 failed, ok mean 0.070 px, max 0.344 px; weak mean 0.070,
        // max 0.073 px. Regression bars at about twice the measured values (the limits above are 2-3x looser)
        assertTrue(o.ok() >= 0.85 * o.frames(), o.toString());
        assertTrue(o.failed() <= 0.01 * o.frames(), "at most 1 % failed on a stand (our own bar); " + o);
        assertTrue(o.meanOkErrorPx() <= 0.14 && o.maxOkErrorPx() <= 0.7, "regression bar; " + o);
        // weak frames count half in the rate fits, so their accuracy is bounded too
        assertTrue(o.maxWeakErrorPx() <= 0.25, "weak frames within 0.25 px; " + o);
    }

    /** Hand-held: the motion range of issue #4 item 3: +-5 degrees, +-10 % zoom, shift up to 15 % of the width. */
    private Outcome handHeld() {
        return run(Scenario.Motion.handheld(5, 0.10, 0.15), 6000);
    }

    @Test
    void simulatedHandHeldOkFramesAverageWithinAQuarterPixelNoneIsAbove1PxAndAtMostOnePercentFail() {
        Outcome o = handHeld();
        System.out.println("simulated hand-held: " + o);
        assertTrue(o.meanOkErrorPx() <= 0.25, "issue #4: mean <= 0.25 px hand-held; " + o);
        assertTrue(o.maxOkErrorPx() <= 1.0, "issue #4: no ok frame above 1 px; " + o);
        assertTrue(o.failed() <= 0.01 * o.frames(), "issue #4: <= 1 % of hand-held frames failed; " + o);
        // measured 3 December 2026: 130 of 140 ok, ok mean 0.061 px, max 0.240 px; weak mean 0.056, max 0.088 px
        assertTrue(o.ok() >= 0.8 * o.frames(), o.toString());
        assertTrue(o.meanOkErrorPx() <= 0.12 && o.maxOkErrorPx() <= 0.5, "regression bar, about twice measured; " + o);
        assertTrue(o.maxWeakErrorPx() <= 0.25, "weak frames within 0.25 px; " + o);
    }

    /**
     * The benchmark's frame size, 640 x 512 (four levels of pyramid above full resolution, template caps active):
     * the same limits on fewer series (simulation at this size is slow). Measured 3 December 2026: stand 35 ok /
     * 7 weak / 0 failed, mean 0.013 px; hand-held the same counts, 0.012 px (the weak frames are one board with
     * only 2-3 textured check patches).
     */
    @Test
    void largeFramesMeetTheSameLimits() {
        for (Scenario.Motion motion : new Scenario.Motion[]{Scenario.Motion.stand(0.15), Scenario.Motion.handheld(5, 0.10, 0.15)}) {
            Outcome o = run(motion, 7000, 6, 640, 512);
            System.out.println("simulated 640x512 " + motion.kind() + ": " + o);
            assertTrue(o.meanOkErrorPx() <= 0.15, "issue #4 limits at 640 x 512; " + o);
            assertTrue(o.maxOkErrorPx() <= 1.0, "issue #4: no ok frame above 1 px; " + o);
            assertTrue(o.failed() <= 0.01 * o.frames(), "issue #4: <= 1 % failed; " + o);
            assertTrue(o.ok() >= 0.75 * o.frames(), o.toString());
            // measured 3 December 2026: ok mean 0.012-0.013 px, max 0.023 px; weak max 0.056 px: bars at about twice
            assertTrue(o.meanOkErrorPx() <= 0.03 && o.maxOkErrorPx() <= 0.05, "regression bar; " + o);
            assertTrue(o.maxWeakErrorPx() <= 0.12, "weak frames; " + o);
        }
    }
}
