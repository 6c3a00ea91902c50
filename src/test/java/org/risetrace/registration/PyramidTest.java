package org.risetrace.registration;

import org.junit.jupiter.api.Test;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Level 0 made only where a mapping needs it: the coarser levels as before, level 0 NaN until asked for, equal to
 * the whole frame's filter inside the region asked for, never another frame's values outside it, and a mapped
 * board's box (plus the margin) inside the region a mapping asks for. The reference values are the filters applied
 * the plain way, over the whole frame (each checked against its definition in {@link FiltersTest}); tolerances allow
 * for float sums taken in another order. The projective image of a rectangle lies inside the box of its mapped
 * corners when every corner is in front of the camera (common practice: a homography maps convex sets with
 * positive denominators to convex sets).
 */
class PyramidTest {
    private static float[] random(int n, long seed) {
        Random r = new Random(seed);
        float[] a = new float[n];
        for (int i = 0; i < n; i++) a[i] = (float) (25 + 2 * r.nextGaussian());
        return a;
    }

    /** The pyramid made the plain way: Gaussian, then every level's band-pass over the whole image. */
    private static float[][] wholeFrame(float[] celsius, int w, int h, int levels) {
        float[][] band = new float[levels][];
        float[] smooth = new float[w * h], tmp = new float[w * h];
        Filters.gaussian1(celsius, smooth, tmp, w, h);
        int lw = w, lh = h;
        for (int l = 0; l < levels; l++) {
            if (l > 0) {
                int nw = lw / 2, nh = lh / 2;
                float[] half = new float[nw * nh];
                Filters.halve(smooth, lw, lh, half, nw, nh);
                smooth = half;
                lw = nw;
                lh = nh;
            }
            band[l] = new float[lw * lh];
            Filters.highPass(smooth, band[l], new float[lw * lh], new float[lw * lh], lw, lh, Pyramid.HIGH_PASS_RADIUS);
        }
        return band;
    }

    @Test
    void levelZeroIsMadeWhereAskedAndNaNElsewhereAcrossFrames() {
        int w = 96, h = 80, levels = 3;
        Pyramid p = new Pyramid();
        float[] a = random(w * h, 1), b = random(w * h, 2);
        float[][] fullA = wholeFrame(a, w, h, levels), fullB = wholeFrame(b, w, h, levels);
        assertTrue(p.build(a, w, h, levels));
        for (int l = 1; l < levels; l++)
            for (int i = 0; i < fullA[l].length; i++) assertEquals(fullA[l][i], p.bandPass[l][i], 1e-4, "level " + l);
        for (float v : p.bandPass[0]) assertTrue(Float.isNaN(v), "level 0 before any mapping asks for it");
        p.ensureLevel0(10, 12, 40, 50);
        p.ensureLevel0(30, 5, 60, 20); // grows to the box holding both
        int[] r = p.level0Region();
        assertEquals(10, r[0]); assertEquals(5, r[1]); assertEquals(60, r[2]); assertEquals(50, r[3]);
        checkRegion(p, fullA[0], w, h, r);
        // the next frame: nothing of the last one's level 0 survives
        assertTrue(p.build(b, w, h, levels));
        for (float v : p.bandPass[0]) assertTrue(Float.isNaN(v), "level 0 of the next frame before a mapping");
        p.ensureLevel0(70, 60, 200, 200); // clamped to the frame
        r = p.level0Region();
        assertEquals(96, r[2]); assertEquals(80, r[3]);
        checkRegion(p, fullB[0], w, h, r);
        p.ensureLevel0All();
        checkRegion(p, fullB[0], w, h, new int[]{0, 0, w, h});
    }

    @Test
    void aFrameWithoutReadingsGivesFlatLevelsAndNothingToMake() {
        int w = 64, h = 48;
        Pyramid p = new Pyramid();
        assertTrue(p.build(random(w * h, 4), w, h, 2));
        p.ensureLevel0(5, 5, 30, 30);
        float[] none = new float[w * h];
        java.util.Arrays.fill(none, Float.NaN);
        assertTrue(!p.build(none, w, h, 2), "no finite pixel: nothing to build from");
        p.ensureLevel0All(); // a reference without readings is still prepared (and matches nothing)
        for (int l = 0; l < 2; l++) for (float v : p.bandPass[l]) assertEquals(0f, v, 0f, "level " + l + " flat");
    }

    private static void checkRegion(Pyramid p, float[] full, int w, int h, int[] r) {
        for (int y = 0; y < h; y++)
            for (int x = 0; x < w; x++) {
                float v = p.bandPass[0][y * w + x];
                if (x >= r[0] && x < r[2] && y >= r[1] && y < r[3]) assertEquals(full[y * w + x], v, 1e-4, x + "," + y);
                else assertTrue(Float.isNaN(v), "outside the region at " + x + "," + y);
            }
    }

    @Test
    void aMappingAsksForTheBoardsBoxAndTheMargin() {
        int w = 160, h = 128;
        SyntheticScene scene = new SyntheticScene(99);
        double[][] rc = SyntheticScene.referenceCorners(w, h);
        Board board = scene.board("ref.png", rc);
        Frame ref = scene.render(w, h, Homographies.boardToFrame(board, rc), 0, 0.05, 1, "ref.png");
        ReferenceModel model = ReferenceModel.prepare(ref, board, RegistrationConfig.defaults());
        double[] box = model.level0Box;
        // every reference pixel a mapping samples on level 0 lies in the box
        for (double[] c : model.referenceCornersPx) assertTrue(c[0] >= box[0] && c[0] <= box[2] && c[1] >= box[1] && c[1] <= box[3]);
        ReferenceModel.Level l0 = model.level[0];
        for (int i = 0; i < l0.n; i++) assertTrue(l0.x[i] > box[0] && l0.x[i] < box[2] && l0.y[i] > box[1] && l0.y[i] < box[3]);
        // a shift and a slight rotation: the region holds the mapped box's corners with the margin
        double a = Math.toRadians(2);
        Homography m = new Homography(new double[]{Math.cos(a), -Math.sin(a), 3.5, Math.sin(a), Math.cos(a), -2.25, 0, 0, 1});
        Pyramid p = new Pyramid();
        p.build(ref.celsius(), w, h, model.levels);
        p.ensureLevel0(model, m.values());
        int[] r = p.level0Region();
        for (double x : new double[]{box[0], box[2]})
            for (double y : new double[]{box[1], box[3]}) {
                double[] q = m.apply(x, y);
                assertTrue(q[0] - Pyramid.LEVEL0_MARGIN >= r[0] || r[0] == 0, "left " + q[0] + " in " + java.util.Arrays.toString(r));
                assertTrue(q[1] - Pyramid.LEVEL0_MARGIN >= r[1] || r[1] == 0, "top");
                assertTrue(q[0] + Pyramid.LEVEL0_MARGIN < r[2] || r[2] == w, "right");
                assertTrue(q[1] + Pyramid.LEVEL0_MARGIN < r[3] || r[3] == h, "bottom");
            }
        assertTrue((r[2] - r[0]) * (r[3] - r[1]) < w * h, "smaller than the frame here: " + java.util.Arrays.toString(r));
    }
}
