package org.risetrace.registration;

import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.risetrace.board.Board;
import org.risetrace.board.Outline;
import org.risetrace.frame.Frame;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Issue #4 item 4: frames that cannot be mapped come out failed with a reason, never with a homography. */
class DegenerateFrameTest {
    static final int W = 160, H = 128;
    SyntheticScene scene;
    double[][] rc;
    Board board;
    Frame reference;
    Registrar registrar;

    @BeforeEach
    void prepare() {
        scene = new SyntheticScene(4711);
        rc = SyntheticScene.referenceCorners(W, H);
        board = scene.board("ref.png", rc);
        reference = scene.render(W, H, Homographies.boardToFrame(board, rc), 0, 0.05, 1, "ref.png");
        registrar = Registrars.create(reference, board, RegistrationConfig.defaults());
    }

    private static void assertFailed(FrameRegistration g) {
        assertEquals(RegistrationStatus.FAILED, g.status(), "status, reason: " + g.reason());
        assertNull(g.boardToFrame(), "no homography for a failed frame");
        assertNull(g.boardCornersPx());
        assertNotNull(g.reason());
        assertTrue(!g.reason().isBlank());
    }

    @Test
    void uniformFrameFails() {
        float[] u = new float[W * H];
        Random r = new Random(1);
        for (int i = 0; i < u.length; i++) u[i] = 25f + (float) (0.05 * r.nextGaussian());
        FrameRegistration g = registrar.register(new Frame(W, H, u, 1, null, Path.of("u.png"), "", reference.decoding()));
        assertFailed(g);
        assertTrue(g.reason().contains("uniform"), g.reason());
    }

    @Test
    void frameWithoutReadingsFails() {
        float[] u = new float[W * H];
        Arrays.fill(u, Float.NaN);
        assertFailed(registrar.register(new Frame(W, H, u, 1, null, Path.of("n.png"), "", reference.decoding())));
    }

    @Test
    void frameOfAnotherBoardFails() {
        for (long other : new long[]{1, 2, 3}) {
            SyntheticScene different = new SyntheticScene(other);
            double[][] c = SyntheticScene.moved(rc, W, H, 2, 1.03, 4, -3);
            assertFailed(registrar.register(different.render(W, H, Homographies.boardToFrame(board, c), 0, 0.05, 5,
                    "other" + other + ".png")));
        }
    }

    @Test
    void frameSoHotNothingMatchesFails() {
        assertFailed(registrar.register(new Frame(W, H, drowned(), 1, null, Path.of("hot.png"), "", reference.decoding())));
    }

    private float[] drowned() {
        float[] hot = scene.render(W, H, Homographies.boardToFrame(board, rc), 0, 0.05, 3, "h.png").celsius().clone();
        Random q = new Random(77);
        // forty overlapping hot spots of 10..40 K: the board's own pattern drowns
        for (int k = 0; k < 40; k++) {
            int cx = q.nextInt(W), cy = q.nextInt(H);
            double a = 10 + 30 * q.nextDouble(), sg = 3 + 10 * q.nextDouble();
            for (int y = 0; y < H; y++)
                for (int x = 0; x < W; x++)
                    hot[y * W + x] += (float) (a * Math.exp(-((x - cx) * (x - cx) + (y - cy) * (y - cy)) / (2 * sg * sg)));
        }
        return hot;
    }

    @Test
    void boardMostlyOutsideTheFrameFails() {
        double[][] c = SyntheticScene.moved(rc, W, H, 0, 1, 0.8 * W, 0);
        FrameRegistration g = registrar.register(scene.render(W, H, Homographies.boardToFrame(board, c), 0, 0.05, 5,
                "away.png"));
        assertFailed(g);
    }

    /**
     * The same degenerate frames after ok frames, when the registrar may register through a chain link to the
     * last ok frame: a link must not turn them into weak or ok mappings.
     */
    @Test
    void degenerateFramesFailAlsoWhenAChainLinkIsAvailable() {
        for (int k = 1; k <= 3; k++) {
            double[][] c = SyntheticScene.moved(rc, W, H, 0.5 * k, 1 + 0.01 * k, 2 * k, -k);
            FrameRegistration ok = registrar.register(scene.render(W, H, Homographies.boardToFrame(board, c), 0, 0.05,
                    k, "good" + k + ".png"));
            assertEquals(RegistrationStatus.OK, ok.status(), ok.reason());
        }
        for (long other : new long[]{1, 2, 3}) {
            SyntheticScene different = new SyntheticScene(other);
            double[][] c = SyntheticScene.moved(rc, W, H, 2, 1.03, 4, -3);
            assertFailed(registrar.register(different.render(W, H, Homographies.boardToFrame(board, c), 0, 0.05, 5,
                    "other" + other + ".png")));
        }
        double[][] away = SyntheticScene.moved(rc, W, H, 0, 1, 0.8 * W, 0);
        assertFailed(registrar.register(scene.render(W, H, Homographies.boardToFrame(board, away), 0, 0.05, 5,
                "away.png")));
        float[] u = new float[W * H];
        Random r = new Random(2);
        for (int i = 0; i < u.length; i++) u[i] = 25f + (float) (0.05 * r.nextGaussian());
        assertFailed(registrar.register(new Frame(W, H, u, 6, null, Path.of("u.png"), "", reference.decoding())));
        assertFailed(registrar.register(new Frame(W, H, drowned(), 7, null, Path.of("hot.png"), "", reference.decoding())));
    }

    @Test
    void frameOfAnotherSizeFails() {
        Frame small = scene.render(W / 2, H / 2, Homographies.boardToFrame(board, rc), 0, 0.05, 5, "small.png");
        assertFailed(registrar.register(small));
    }

    @Test
    void userMarkedCornersOverrideRegistration() {
        double[][] marked = {{30, 25}, {130, 24}, {129, 104}, {31, 103}};
        Board withMarks = new Board(board.name(), board.sizeMm(),
                new Outline("ref.png", rc, Map.of("f9.png", marked)), board.parts(), null);
        Registrar reg = Registrars.create(reference, withMarks, RegistrationConfig.defaults());
        // even a uniform frame: the user's marks win
        float[] u = new float[W * H];
        Arrays.fill(u, 25f);
        FrameRegistration g = reg.register(new Frame(W, H, u, 9, null, Path.of("f9.png"), "", reference.decoding()));
        assertEquals(RegistrationStatus.MARKED, g.status());
        for (int i = 0; i < 4; i++) assertArrayEquals(marked[i], g.boardCornersPx()[i], 1e-9, "corner " + i);
        FrameRegistration r = reg.register(reference);
        assertEquals(RegistrationStatus.MARKED, r.status(), "the reference frame's corners are the user's");
        for (int i = 0; i < 4; i++) assertArrayEquals(rc[i], r.boardCornersPx()[i], 1e-9, "corner " + i);
    }

    @Test
    void homographyMapsBoardCornersOntoReportedCorners() {
        double[][] c = SyntheticScene.moved(rc, W, H, 1, 1.02, 3, 2);
        FrameRegistration g = registrar.register(scene.render(W, H, Homographies.boardToFrame(board, c), 0, 0.05, 5,
                "m.png"));
        assertEquals(RegistrationStatus.OK, g.status(), g.reason());
        double[][] viaH = Homographies.boardCorners(board, g.boardToFrame());
        for (int i = 0; i < 4; i++) assertArrayEquals(viaH[i], g.boardCornersPx()[i], 1e-9);
        // and both are where the scene was rendered (the truth corners c): within issue #4's 0.25 px
        assertTrue(SyntheticScene.cornerError(g.boardCornersPx(), c) <= 0.25,
                "corner error " + SyntheticScene.cornerError(g.boardCornersPx(), c) + " px");
        assertTrue(g.inliers() >= 3 && g.rmsPx() < 1 && g.similarity() > 0.6, "quality figures present: " + g);
    }
}
