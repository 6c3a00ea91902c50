package org.risetrace.analysis;

import org.junit.jupiter.api.Test;

import java.util.List;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

class HotspotsTest {
    private static final int W = 120, H = 80;
    private static final double PX_PER_MM = 4;

    /** Rise map: Gaussian bumps (amplitude K, centre and sigma in px) on Gaussian noise of 0.02 K. */
    private static float[] map(double[][] bumps, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        float[] v = new float[W * H];
        for (int y = 0; y < H; y++)
            for (int x = 0; x < W; x++) {
                double s = 0.02 * gauss(rnd);
                for (double[] b : bumps) {
                    double dx = x - b[1], dy = y - b[2];
                    s += b[0] * Math.exp(-(dx * dx + dy * dy) / (2 * b[3] * b[3]));
                }
                v[y * W + x] = (float) s;
            }
        return v;
    }

    private static double gauss(SplittableRandom r) {
        double u = 1 - r.nextDouble(), w = r.nextDouble();
        return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * w);
    }

    private static List<Hotspot> find(float[] v) {
        Hotspots.Smoothed sm = Hotspots.smoothed(v, W, H, PX_PER_MM, 1.0, "K");
        return Hotspots.find(sm, 5.0, 2.0, 10, List.of());
    }

    @Test
    void twoSeparateSpotsAreBothReportedHottestFirst() {
        // bumps 40 px apart, each 3 px wide: the valley between them falls to the noise floor
        List<Hotspot> spots = find(map(new double[][]{{2.0, 30, 40, 3}, {1.0, 70, 40, 3}}, 1));
        assertEquals(2, spots.size(), spots.toString());
        assertEquals((30 + 0.5) / PX_PER_MM, spots.get(0).xMm(), 0.1);
        assertEquals((70 + 0.5) / PX_PER_MM, spots.get(1).xMm(), 0.1);
        assertNull(spots.get(0).ref());
    }

    @Test
    void noiseOnAHeatedPlateauIsOneSpot() {
        // a package at one uniform rise (3 K over 30 x 20 px, edges softened by the 1 px blur): the camera noise on
        // its flat top makes many shallow local maxima, none of them k sigma above the valley to the hottest one
        float[] v = map(new double[0][], 2);
        for (int y = 30; y < 50; y++)
            for (int x = 45; x < 75; x++) v[y * W + x] += 3.0f;
        List<Hotspot> spots = find(v);
        assertEquals(1, spots.size(), spots.toString());
        assertEquals(60 / PX_PER_MM, spots.get(0).xMm(), 15 / PX_PER_MM);
    }

    @Test
    void valleyDepthIsThePeakMinusTheLowestPointOnThePath() {
        // 1-D profile 5, 3, 4, 6 along x: from the peak at x = 0 (5) to the hotter one at x = 3 the lowest value is 3
        float[] v = {5, 3, 4, 6};
        assertEquals(2.0, Hotspots.valleyDepth(v, 4, new int[]{0, 0}, new int[]{3, 0}), 1e-9);
    }

    @Test
    void hotSpotIsLocatedToATenthOfAPixelBetweenPixelCentres() {
        // issue 17: bumps only on whole pixels with a one-pixel tolerance could not catch a sub-pixel error. A 2 K
        // Gaussian bump (sigma 3 px, 3.16 px after the 1 px blur) centred between pixel centres, on 0.02 K noise;
        // the three-point parabola through a Gaussian's samples is biased by under 0.005 px at this width (worked
        // out: vertex of the parabola through exp(-(x - d)^2 / 20) at x = -1, 0, 1 is 0.2453 for d = 0.25), the
        // noise moves it by a few hundredths: within 0.1 px, a tenth of the old tolerance
        double[][] offsets = {{0.25, 0.0}, {0.5, 0.3}, {0.75, 0.6}, {0.1, 0.9}, {0.4, 0.45}};
        long seed = 11;
        for (double[] o : offsets) {
            double cx = 50 + o[0], cy = 35 + o[1];
            List<Hotspot> spots = find(map(new double[][]{{2.0, cx, cy, 3}}, seed++));
            assertEquals(1, spots.size(), spots.toString());
            // map pixel i has its centre at (i + 0.5) / pxPerMm mm (BoardMap convention)
            assertEquals((cx + 0.5) / PX_PER_MM, spots.get(0).xMm(), 0.1 / PX_PER_MM, "x for " + cx);
            assertEquals((cy + 0.5) / PX_PER_MM, spots.get(0).yMm(), 0.1 / PX_PER_MM, "y for " + cy);
        }
    }
}
