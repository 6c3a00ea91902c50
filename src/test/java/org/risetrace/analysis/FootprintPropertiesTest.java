package org.risetrace.analysis;

import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.Scale;
import org.junit.jupiter.api.Test;
import org.risetrace.board.Part;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Part footprints under rotation (jqwik): the board pixels sampled for a part lie inside its rotated rectangle,
 * number its shrunk area in pixels whatever the rotation, within Nosarzewska's bound for lattice points in a convex
 * region, A - P/2 < N < A + P/2 + 1 (A area, P perimeter, in pixels; from memory), and a half turn, which maps a rectangle onto itself,
 * samples nearly the same pixels.
 */
class FootprintPropertiesTest {
    static final int W = 400, H = 300;

    private static Part part(double x, double y, double w, double h, double rot) {
        return new Part("P", null, null, x, y, w, h, rot);
    }

    @Property(tries = 300, edgeCases = EdgeCasesMode.NONE)
    void aRotatedFootprintHoldsItsAreaAndLiesInsideThePart(
            @ForAll @Scale(6) @DoubleRange(min = 30, max = 70) double xMm, @ForAll @Scale(6) @DoubleRange(min = 30, max = 45) double yMm,
            @ForAll @Scale(6) @DoubleRange(min = 2, max = 20) double wMm, @ForAll @Scale(6) @DoubleRange(min = 2, max = 20) double hMm,
            @ForAll @Scale(6) @DoubleRange(min = -360, max = 360) double rotDeg,
            @ForAll @Scale(6) @DoubleRange(min = 2, max = 4) double pxPerMm) {
        Part p = part(xMm, yMm, wMm, hMm, rotDeg);
        int[] idx = FootprintSampler.footprint(p, W, H, pxPerMm);
        // inside: by the corners of the rectangle as Part documents it, not by Part.contains (which the sampler
        // itself uses), with a small margin for pixel centres on an edge
        double[][] corners = corners(xMm, yMm, wMm, hMm, rotDeg);
        for (int k : idx) {
            double cx = (k % W + 0.5) / pxPerMm, cy = (k / W + 0.5) / pxPerMm;
            assertTrue(insideConvex(corners, cx, cy, 1e-9), "pixel " + k + " outside the part");
        }
        // shrunk by one board pixel on every side (FootprintSampler): area and perimeter in pixels
        double iw = wMm * pxPerMm - 2, ih = hMm * pxPerMm - 2;
        double area = iw * ih, perimeter = 2 * (iw + ih);
        assertTrue(idx.length > area - perimeter / 2 && idx.length < area + perimeter / 2 + 1,
                "pixels in the footprint: " + idx.length + " for area " + area + ", perimeter " + perimeter);
    }

    @Property(tries = 300, edgeCases = EdgeCasesMode.NONE)
    void aHalfTurnSamplesTheSamePixelsAndAQuarterTurnSwapsTheSides(
            @ForAll @Scale(6) @DoubleRange(min = 30, max = 70) double xMm, @ForAll @Scale(6) @DoubleRange(min = 30, max = 45) double yMm,
            @ForAll @Scale(6) @DoubleRange(min = 2, max = 20) double wMm, @ForAll @Scale(6) @DoubleRange(min = 2, max = 20) double hMm,
            @ForAll @Scale(6) @DoubleRange(min = -180, max = 180) double rotDeg,
            @ForAll @Scale(6) @DoubleRange(min = 2, max = 4) double pxPerMm) {
        int[] a = FootprintSampler.footprint(part(xMm, yMm, wMm, hMm, rotDeg), W, H, pxPerMm);
        int[] half = FootprintSampler.footprint(part(xMm, yMm, wMm, hMm, rotDeg + 180), W, H, pxPerMm);
        int[] quarter = FootprintSampler.footprint(part(xMm, yMm, hMm, wMm, rotDeg + 90), W, H, pxPerMm);
        // the same rectangle: only pixel centres within rounding of its edges may differ
        double edgePixels = 2 * (wMm + hMm) * pxPerMm;
        assertTrue(symmetricDifference(a, half) <= 1e-6 * edgePixels + 2, "half turn");
        assertTrue(symmetricDifference(a, quarter) <= 1e-6 * edgePixels + 2, "quarter turn with sides swapped");
    }

    /**
     * Corners of a part from its documented convention (Part: rotation counter-clockwise as seen in the x-right,
     * y-down board frame): on screen the part's own x axis turns up from the board's, to (cos a, -sin a), and its
     * own y axis to (sin a, cos a). In order around the rectangle.
     */
    static double[][] corners(double x, double y, double w, double h, double rotDeg) {
        double a = Math.toRadians(rotDeg);
        double[] ux = {Math.cos(a), -Math.sin(a)}, uy = {Math.sin(a), Math.cos(a)};
        double[][] c = new double[4][];
        int[][] signs = {{-1, -1}, {1, -1}, {1, 1}, {-1, 1}};
        for (int i = 0; i < 4; i++) {
            double su = signs[i][0] * w / 2, sv = signs[i][1] * h / 2;
            c[i] = new double[]{x + su * ux[0] + sv * uy[0], y + su * ux[1] + sv * uy[1]};
        }
        return c;
    }

    /** Point in a convex polygon: on the same side of every edge (cross products), within margin mm. */
    static boolean insideConvex(double[][] c, double px, double py, double margin) {
        int sign = 0;
        for (int i = 0; i < c.length; i++) {
            double[] a = c[i], b = c[(i + 1) % c.length];
            double ex = b[0] - a[0], ey = b[1] - a[1];
            double cross = (ex * (py - a[1]) - ey * (px - a[0])) / Math.hypot(ex, ey); // signed distance to the edge
            if (Math.abs(cross) <= margin) continue;
            int s = cross > 0 ? 1 : -1;
            if (sign != 0 && s != sign) return false;
            sign = s;
        }
        return true;
    }

    @Test
    void rotationTurnsThePartCounterClockwiseOnScreen() {
        // a 10 x 2 mm part at 30 degrees, 4 px/mm: counter-clockwise as seen on the y-down board (Part's
        // documentation) puts the point 4 mm along its +x axis up and to the right of the centre, at
        // (40 + 4 cos 30, 30 - 4 sin 30) = (43.46, 28.00) mm; its mirror image (43.46, 32.00), where a clockwise turn
        // would put it, is 3.5 mm off the part's axis
        double px = 4;
        int[] idx = FootprintSampler.footprint(part(40, 30, 10, 2, 30.0), W, H, px);
        java.util.Set<Integer> in = new java.util.HashSet<>();
        for (int k : idx) in.add(k);
        int col = (int) Math.floor(43.46 * px);
        assertTrue(in.contains((int) Math.floor(28.0 * px) * W + col), "pixel up and right of the centre along the part");
        assertTrue(!in.contains((int) Math.floor(32.0 * px) * W + col), "pixel at the mirror image");
        double[][] c = corners(40, 30, 10, 2, 30.0);
        assertEquals(40 + 5 * Math.cos(Math.PI / 6) + Math.sin(Math.PI / 6), c[2][0], 1e-12);
    }

    private static int symmetricDifference(int[] a, int[] b) {
        int[] x = a.clone(), y = b.clone();
        Arrays.sort(x);
        Arrays.sort(y);
        int i = 0, j = 0, d = 0;
        while (i < x.length || j < y.length) {
            if (j >= y.length || (i < x.length && x[i] < y[j])) { d++; i++; }
            else if (i >= x.length || y[j] < x[i]) { d++; j++; }
            else { i++; j++; }
        }
        return d;
    }
}
