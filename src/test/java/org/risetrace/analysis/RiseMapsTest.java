package org.risetrace.analysis;

import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The per-pixel accumulators ({@link RiseMaps}) against simulated truth: a board raster of white noise of known sigma
 * on a room that warms, one block of pixels heating at a known rate from a known time.
 */
class RiseMapsTest {
    static final int W = 128, H = 96, BASELINE = 5, LAST = 5, FRAMES = 25;
    static final double SIGMA = 0.05, DRIFT_K_PER_S = 0.01, RATE_K_PER_S = 0.5, HEAT_FROM_S = 5.0, START_S = 4.5;

    static boolean heated(int x, int y) {
        return x >= 40 && x < 80 && y >= 30 && y < 60;
    }

    @Test
    void noiseRiseAndOnsetMatchTheSimulation() {
        RiseMaps maps = new RiseMaps(W, H, 4.0, 3.0, 2, START_S, LAST);
        Random rnd = new Random(41);
        for (int f = 0; f < FRAMES; f++) {
            double t = f; // one frame a second
            double ambient = 25 + DRIFT_K_PER_S * t;
            float[] c = new float[W * H];
            for (int y = 0; y < H; y++)
                for (int x = 0; x < W; x++) {
                    double heat = heated(x, y) && t > HEAT_FROM_S ? RATE_K_PER_S * (t - HEAT_FROM_S) : 0;
                    c[y * W + x] = (float) (ambient + heat + SIGMA * rnd.nextGaussian());
                }
            maps.add(c, null, t, ambient, f < BASELINE, false);
        }
        // pixel noise from the first two frames: 12,288 differences, the MAD estimate scatters by about 1 %
        // (efficiency 37 %, Rousseeuw and Croux 1993, from memory); within 5 %
        assertEquals(SIGMA, maps.pixelSigma(), 0.05 * SIGMA);

        // rise: mean of the last 5 frames (t = 20..24 s) minus the baseline mean, the room's warming removed through
        // the ambient readings: heated block 0.5 K/s x (22 - 5) s = 8.5 K, elsewhere 0. Each pixel's estimate
        // scatters by sigma sqrt(1/5 + 1/5) = 0.032 K; the block's mean (1,200 pixels) by under 0.001 K
        float[] rise = maps.riseMap();
        double hot = 0, cold = 0;
        int nh = 0, nc = 0;
        for (int y = 0; y < H; y++)
            for (int x = 0; x < W; x++) {
                if (heated(x, y)) { hot += rise[y * W + x]; nh++; } else { cold += rise[y * W + x]; nc++; }
            }
        assertEquals(8.5, hot / nh, 0.005);
        assertEquals(0.0, cold / nc, 0.005, "the room's 0.2 K warming is not heating");

        // onset: the first of two frames above 3 sigma, in seconds from the start (4.5 s): the block is 0.5 K up at
        // t = 6 s (10 sigma), so 1.5 s, or 0.5 s where the noise alone passed the threshold in the frame before (the
        // rise's sigma is sigma sqrt(1 + 1/5) = 0.055 K, threshold 0.15 K = 2.74 of those: P = 0.0031, about 4 of the
        // 1,200 block pixels; allowed 15). A cold pixel passes it twice in a row with a chance of about 1e-5 per frame
        // pair: a few of 11,000 at most
        float[] onset = maps.onsetMap().values();
        int falseOnsets = 0, early = 0;
        for (int y = 0; y < H; y++)
            for (int x = 0; x < W; x++) {
                float o = onset[y * W + x];
                if (heated(x, y)) {
                    assertTrue(o == 1.5f || o == 0.5f, "pixel " + x + "," + y + " onset " + o);
                    if (o == 0.5f) early++;
                } else if (!Float.isNaN(o)) falseOnsets++;
            }
        assertTrue(early <= 15, early + " block pixels with the onset one frame early");
        assertTrue(falseOnsets <= 11, falseOnsets + " cold pixels with an onset");
    }
}
