package org.risetrace.registration;

import org.junit.jupiter.api.Test;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Accuracy against ground truth: every frame is rendered through a known board-to-frame homography
 * ({@link SyntheticScene}), so the true board corners in each frame are known exactly. Limits are the
 * requirements of issue #4 (0.15 px stand, 0.25 px hand-held mean corner error over ok frames, no ok frame above
 * 1 px, at most 1 % of hand-held frames failed, at least 20 series per case).
 */
class RegistrationAccuracyTest {
    static final int W = 160, H = 128, SERIES = 20, FRAMES = 6;
    /** Sensor noise: 50 mK NETD, a typical uncooled microbolometer figure (common practice). */
    static final double NETD_K = 0.05;

    record Outcome(int ok, int weak, int failed, double meanOkError, double maxOkError) {
    }

    private static Outcome run(boolean handHeld, long seed) {
        Random r = new Random(seed);
        int ok = 0, weak = 0, failed = 0;
        double sum = 0, max = 0;
        for (int s = 0; s < SERIES; s++) {
            SyntheticScene scene = new SyntheticScene(seed * 1000 + s);
            double[][] rc = SyntheticScene.referenceCorners(W, H);
            Board board = scene.board("ref.png", rc);
            Frame ref = scene.render(W, H, Homographies.boardToFrame(board, rc), 0, NETD_K, s, "ref.png");
            Registrar reg = Registrars.create(ref, board, RegistrationConfig.defaults());
            double[][] drift = rc;
            for (int f = 1; f <= FRAMES; f++) {
                double[][] truth;
                if (handHeld) {
                    // the motion range of issue #4 item 3: +-10 % zoom, +-5 degrees, shift up to 15 % of the width
                    truth = SyntheticScene.moved(rc, W, H, (2 * r.nextDouble() - 1) * 5, 1 + (2 * r.nextDouble() - 1) * 0.1,
                            (2 * r.nextDouble() - 1) * 0.15 * W, (2 * r.nextDouble() - 1) * 0.15 * W * H / W);
                } else {
                    // a stand drifting by sub-pixel steps
                    drift = SyntheticScene.moved(drift, W, H, (2 * r.nextDouble() - 1) * 0.05, 1,
                            (2 * r.nextDouble() - 1) * 0.4, (2 * r.nextDouble() - 1) * 0.4);
                    truth = drift;
                }
                double heatK = 1.5 * f; // one part warming by up to 9 K over the series
                Frame frame = scene.render(W, H, Homographies.boardToFrame(board, truth), heatK, NETD_K,
                        seed * 7919 + s * 31 + f, "f" + f + ".png");
                FrameRegistration g = reg.register(frame);
                switch (g.status()) {
                    case OK -> {
                        double e = SyntheticScene.cornerError(g.boardCornersPx(), truth);
                        sum += e;
                        max = Math.max(max, e);
                        ok++;
                    }
                    case WEAK -> weak++;
                    case FAILED -> failed++;
                    default -> throw new AssertionError("unexpected " + g.status());
                }
            }
        }
        return new Outcome(ok, weak, failed, ok == 0 ? Double.NaN : sum / ok, max);
    }

    @Test
    void standFramesRegisterWithinFifteenHundredthsOfAPixel() {
        Outcome o = run(false, 11);
        System.out.println("registration accuracy, stand: " + o);
        int n = SERIES * FRAMES;
        assertTrue(o.ok() >= 0.95 * n, "ok frames " + o);
        assertTrue(o.meanOkError() <= 0.15, "mean corner error (issue #4: <= 0.15 px on a stand) " + o);
        assertTrue(o.maxOkError() <= 1.0, "no ok frame above 1 px (issue #4) " + o);
        // measured 3 December 2026: 120 of 120 ok, mean 0.016 px, max 0.026 px; regression bars at about twice
        assertTrue(o.meanOkError() <= 0.035 && o.maxOkError() <= 0.06, "regression bar " + o);
    }

    @Test
    void handHeldFramesRegisterWithinAQuarterPixelAndAlmostNeverFail() {
        Outcome o = run(true, 12);
        System.out.println("registration accuracy, hand-held: " + o);
        int n = SERIES * FRAMES;
        assertTrue(o.failed() <= 0.01 * n, "failed hand-held frames (issue #4: <= 1 %) " + o);
        assertTrue(o.ok() >= 0.9 * n, "ok frames " + o);
        assertTrue(o.meanOkError() <= 0.25, "mean corner error (issue #4: <= 0.25 px hand-held) " + o);
        assertTrue(o.maxOkError() <= 1.0, "no ok frame above 1 px (issue #4) " + o);
        // measured 3 December 2026: 120 of 120 ok, mean 0.024 px, max 0.057 px; regression bars at about twice
        assertTrue(o.meanOkError() <= 0.05 && o.maxOkError() <= 0.12, "regression bar " + o);
    }

    @Test
    void twoThreadsShareOneRegistrarAndAgreeWithTruth() throws Exception {
        SyntheticScene scene = new SyntheticScene(31);
        double[][] rc = SyntheticScene.referenceCorners(W, H);
        Board board = scene.board("ref.png", rc);
        Registrar reg = Registrars.create(scene.render(W, H, Homographies.boardToFrame(board, rc), 0, NETD_K, 1,
                "ref.png"), board, RegistrationConfig.defaults());
        Random r = new Random(3);
        List<double[][]> truths = new ArrayList<>();
        List<Frame> frames = new ArrayList<>();
        for (int f = 0; f < 12; f++) {
            double[][] t = SyntheticScene.moved(rc, W, H, (2 * r.nextDouble() - 1) * 3, 1 + (2 * r.nextDouble() - 1) * 0.05,
                    (2 * r.nextDouble() - 1) * 10, (2 * r.nextDouble() - 1) * 8);
            truths.add(t);
            frames.add(scene.render(W, H, Homographies.boardToFrame(board, t), 0.5 * f, NETD_K, 100 + f, "f" + f + ".png"));
        }
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            List<Future<FrameRegistration>> out = new ArrayList<>();
            for (Frame f : frames) out.add(pool.submit(() -> reg.register(f)));
            for (int i = 0; i < frames.size(); i++) {
                FrameRegistration g = out.get(i).get();
                assertEquals(RegistrationStatus.OK, g.status(), g.reason());
                assertNotNull(g.boardToFrame());
                // twice the hand-held maximum measured in this scene (0.057 px, above); issue #4 allows 0.25 px
                assertTrue(SyntheticScene.cornerError(g.boardCornersPx(), truths.get(i)) <= 0.12, "frame " + i);
            }
        } finally {
            pool.shutdownNow();
        }
    }
}
