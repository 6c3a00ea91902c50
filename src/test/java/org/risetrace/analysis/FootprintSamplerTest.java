package org.risetrace.analysis;

import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;
import org.risetrace.board.Part;

import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The footprint statistics against commons-math3 (the reference library): the 95th percentile by the same
 * definition, R-7 of Hyndman and Fan (1996), which commons-math3 names {@code Percentile.EstimationType.R_7}; the
 * mean by {@code Mean}; invalid pixels left out of both.
 */
class FootprintSamplerTest {
    @Test
    void percentileAndMeanMatchCommonsMath() {
        int w = 200, h = 120;
        double pxPerMm = 4;
        List<Part> parts = List.of(new Part("U1", "ic", null, 12, 10, 7, 5, null),
                new Part("Q2", "mosfet", null, 30, 18, 4, 6, 30.0),
                new Part("C3", "capacitor", null, 40, 8, 1.6, 0.8, null)); // small: the unshrunk footprint
        FootprintSampler fs = new FootprintSampler(parts, w, h, pxPerMm);
        Random rnd = new Random(5);
        float[] c = new float[w * h];
        boolean[] valid = new boolean[w * h];
        for (int i = 0; i < c.length; i++) {
            c[i] = (float) (25 + 3 * rnd.nextGaussian() + (rnd.nextInt(50) == 0 ? 20 : 0)); // a few hot pixels
            valid[i] = rnd.nextInt(10) != 0; // a tenth outside the frame
        }
        double[] out = new double[parts.size() * FootprintSampler.STATS];
        fs.sample(c, valid, out);
        Percentile r7 = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
        for (int p = 0; p < parts.size(); p++) {
            int[] idx = fs.indices(p);
            double[] v = java.util.Arrays.stream(idx).filter(k -> valid[k]).mapToDouble(k -> c[k]).toArray();
            assertTrue(v.length >= 3, parts.get(p).ref() + " has " + v.length + " valid pixels");
            int o = p * FootprintSampler.STATS;
            assertEquals(r7.evaluate(v, 95.0), out[o + FootprintSampler.P95], 1e-4, parts.get(p).ref() + " p95");
            assertEquals(new Mean().evaluate(v), out[o + FootprintSampler.MEAN], 1e-4, parts.get(p).ref() + " mean");
            assertEquals(v.length / (double) idx.length, out[o + FootprintSampler.VALID], 1e-12);
        }
    }
}
