package org.risetrace.registration;

import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.Scale;
import org.risetrace.board.Board;
import org.risetrace.board.Outline;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Properties of the plane geometry (jqwik, random cases, shrunk to the smallest failing one): homography
 * composition and inversion are the group operations of 3 x 3 matrices acting on homogeneous points (Hartley and
 * Zisserman, Multiple View Geometry, 2nd ed., section 2.3), the four-point mapping hits its points, and the
 * rectifier resamples a frame that is linear in pixel coordinates exactly (bilinear interpolation reproduces linear
 * functions, common practice), on random convex outlines.
 */
class GeometryPropertiesTest {
    /** A similarity with a small perspective part, as a camera a few hundred pixels from a board gives. */
    @Provide
    Arbitrary<Homography> homographies() {
        Arbitrary<Double> angle = Arbitraries.doubles().between(-3.14159, 3.14159).ofScale(6);
        Arbitrary<Double> scale = Arbitraries.doubles().between(0.2, 5).ofScale(6);
        Arbitrary<Double> shift = Arbitraries.doubles().between(-500, 500).ofScale(6);
        Arbitrary<Double> persp = Arbitraries.doubles().between(-1e-3, 1e-3).ofScale(6);
        return Combinators.combine(angle, scale, shift, shift, persp, persp).as((a, s, tx, ty, px, py) ->
                new Homography(new double[]{s * Math.cos(a), -s * Math.sin(a), tx, s * Math.sin(a), s * Math.cos(a), ty,
                        px, py, 1}));
    }

    private static void assertNear(double[] expected, double[] actual, double tol, String what) {
        assertEquals(expected[0], actual[0], tol, what + " x");
        assertEquals(expected[1], actual[1], tol, what + " y");
    }

    @Property(edgeCases = EdgeCasesMode.NONE)
    void theInverseUndoesTheMapping(@ForAll("homographies") Homography h,
                                    @ForAll @Scale(6) @DoubleRange(min = 0, max = 300) double x,
                                    @ForAll @Scale(6) @DoubleRange(min = 0, max = 300) double y) {
        double[] q = h.apply(x, y);
        assertNear(new double[]{x, y}, h.inverse().apply(q[0], q[1]), 1e-8 * (1 + Math.abs(q[0]) + Math.abs(q[1])), "H^-1 H");
        assertNear(q, h.compose(h.inverse()).apply(q[0], q[1]), 1e-8 * (1 + Math.abs(q[0]) + Math.abs(q[1])), "H H^-1");
    }

    @Property(edgeCases = EdgeCasesMode.NONE)
    void compositionAppliesInTurnAndInvertsInReverseOrder(@ForAll("homographies") Homography a,
                                                          @ForAll("homographies") Homography b,
                                                          @ForAll @Scale(6) @DoubleRange(min = 0, max = 100) double x,
                                                          @ForAll @Scale(6) @DoubleRange(min = 0, max = 100) double y) {
        double[] bp = b.apply(x, y);
        double[] abp = a.apply(bp[0], bp[1]);
        double scale = 1 + Math.abs(abp[0]) + Math.abs(abp[1]) + Math.abs(bp[0]) + Math.abs(bp[1]);
        assertNear(abp, a.compose(b).apply(x, y), 1e-8 * scale, "(A B) p");
        // (A B)^-1 = B^-1 A^-1
        assertNear(new double[]{x, y}, b.inverse().compose(a.inverse()).apply(abp[0], abp[1]), 1e-7 * scale, "B^-1 A^-1");
        assertNear(a.compose(b).inverse().apply(abp[0], abp[1]), b.inverse().compose(a.inverse()).apply(abp[0], abp[1]),
                1e-7 * scale, "(A B)^-1");
    }

    /** Four corners of a convex quadrilateral (clockwise on screen, y down) inside a 320 x 256 frame. */
    @Provide
    Arbitrary<double[][]> convexOutlines() {
        Arbitrary<Double> centreX = Arbitraries.doubles().between(120, 200).ofScale(6), centreY = Arbitraries.doubles().between(100, 156).ofScale(6);
        Arbitrary<Double> halfW = Arbitraries.doubles().between(30, 100).ofScale(6), halfH = Arbitraries.doubles().between(25, 80).ofScale(6);
        Arbitrary<Double> angle = Arbitraries.doubles().between(-0.5, 0.5).ofScale(6);
        Arbitrary<List<Double>> jitter = Arbitraries.doubles().between(-0.2, 0.2).ofScale(6).list().ofSize(8);
        return Combinators.combine(centreX, centreY, halfW, halfH, angle, jitter).as((cx, cy, hw, hh, a, j) -> {
            double[][] unit = {{-1, -1}, {1, -1}, {1, 1}, {-1, 1}};
            double[][] c = new double[4][];
            for (int i = 0; i < 4; i++) {
                double u = (unit[i][0] + j.get(2 * i)) * hw, v = (unit[i][1] + j.get(2 * i + 1)) * hh;
                c[i] = new double[]{cx + u * Math.cos(a) - v * Math.sin(a), cy + u * Math.sin(a) + v * Math.cos(a)};
            }
            return c;
        }).filter(GeometryPropertiesTest::convexInside);
    }

    static boolean convexInside(double[][] c) {
        for (int i = 0; i < 4; i++) {
            double[] a = c[i], p = c[(i + 1) % 4], q = c[(i + 2) % 4];
            if ((p[0] - a[0]) * (q[1] - p[1]) - (p[1] - a[1]) * (q[0] - p[0]) <= 0) return false;
            if (a[0] < 1 || a[1] < 1 || a[0] > 318 || a[1] > 254) return false;
        }
        return true;
    }

    @Property(edgeCases = EdgeCasesMode.NONE)
    void theFourPointMappingHitsItsPointsBothWays(@ForAll("convexOutlines") double[][] corners) {
        Board board = new Board("b", new double[]{60, 40}, new Outline("f.png", corners, null), List.of(), null);
        Homography h = Homographies.boardToFrame(board, corners);
        double[][] mapped = Homographies.boardCorners(board, h);
        double[][] boardCorners = {{0, 0}, {60, 0}, {60, 40}, {0, 40}};
        for (int i = 0; i < 4; i++) {
            assertNear(corners[i], mapped[i], 1e-6, "corner " + i);
            assertNear(boardCorners[i], h.inverse().apply(corners[i][0], corners[i][1]), 1e-8, "back " + i);
        }
        // and the mapping from the frame back to the board is the four-point mapping the other way round
        Homography back = Homographies.fromFourPoints(corners, boardCorners);
        double[] mid = h.apply(30, 20);
        assertNear(new double[]{30, 20}, back.apply(mid[0], mid[1]), 1e-7, "centre");
    }

    @Property(tries = 200, edgeCases = EdgeCasesMode.NONE)
    void rectifyingAFrameLinearInPixelsGivesThatFunctionAtEveryBoardPixel(
            @ForAll("convexOutlines") double[][] corners,
            @ForAll @Scale(6) @DoubleRange(min = -50, max = 150) double offset,
            @ForAll @Scale(6) @DoubleRange(min = -0.2, max = 0.2) double perPxX,
            @ForAll @Scale(6) @DoubleRange(min = -0.2, max = 0.2) double perPxY,
            @ForAll @Scale(6) @DoubleRange(min = 0.5, max = 3) double pxPerMm) {
        int w = 320, hgt = 256;
        float[] frame = new float[w * hgt];
        for (int y = 0; y < hgt; y++)
            for (int x = 0; x < w; x++) frame[y * w + x] = (float) (offset + perPxX * x + perPxY * y);
        Board board = new Board("b", new double[]{60, 40}, new Outline("f.png", corners, null), List.of(), null);
        Homography h = Homographies.boardToFrame(board, corners);
        Rectifier r = new Rectifier(board, pxPerMm);
        float[] out = new float[r.width() * r.height()];
        boolean[] valid = new boolean[out.length];
        r.rectify(frame, w, hgt, h, out, valid);
        for (int j = 0; j < r.height(); j++)
            for (int i = 0; i < r.width(); i++) {
                double[] p = h.apply((i + 0.5) / pxPerMm, (j + 0.5) / pxPerMm);
                boolean inside = p[0] >= 0 && p[1] >= 0 && p[0] <= w - 1 && p[1] <= hgt - 1;
                int k = j * r.width() + i;
                assertEquals(inside, valid[k], "validity at board pixel " + i + ", " + j);
                if (!inside) continue;
                double expected = offset + perPxX * p[0] + perPxY * p[1];
                // float samples and float weights: a few units in the last place of values up to ~200
                assertEquals(expected, out[k], 1e-4 * (1 + Math.abs(offset) + 64), "board pixel " + i + ", " + j);
            }
        // the outline lies inside the frame: every board pixel centre maps inside it
        for (boolean v : valid) assertTrue(v);
    }
}
