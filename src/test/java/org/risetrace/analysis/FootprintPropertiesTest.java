package org.risetrace.analysis;

import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.Scale;
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
        for (int k : idx) {
            double cx = (k % W + 0.5) / pxPerMm, cy = (k / W + 0.5) / pxPerMm;
            assertTrue(p.contains(cx, cy), "pixel " + k + " outside the part");
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
