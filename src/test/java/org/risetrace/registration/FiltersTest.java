package org.risetrace.registration;

import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The fast filters (running sums, folded kernels, unclamped interiors) against their definitions evaluated
 * directly, pixel by pixel, with clamped borders: a box mean is the average of the 2r + 1 neighbours along each
 * axis, the Gaussian the normalised exp(-i^2 / 2 sigma^2) weights of radius 3 (common practice).
 */
class FiltersTest {
    private static int clamp(int v, int n) { return Math.min(n - 1, Math.max(0, v)); }

    private static float[] random(int n, long seed) {
        Random r = new Random(seed);
        float[] a = new float[n];
        for (int i = 0; i < n; i++) a[i] = (float) (20 + 5 * r.nextGaussian());
        return a;
    }

    @Test
    void boxMeanEqualsTheDirectAverageIncludingBorders() {
        for (int[] size : new int[][]{{37, 23}, {9, 5}, {3, 12}, {64, 1}}) {
            int w = size[0], h = size[1], r = 4;
            float[] src = random(w * h, w * 31L + h);
            float[] dst = new float[w * h];
            Filters.boxMean(src, dst, w, h, r);
            for (int y = 0; y < h; y++)
                for (int x = 0; x < w; x++) {
                    double s = 0;
                    for (int j = -r; j <= r; j++)
                        for (int i = -r; i <= r; i++) s += src[clamp(y + j, h) * w + clamp(x + i, w)];
                    assertEquals(s / ((2 * r + 1) * (2 * r + 1)), dst[y * w + x], 1e-3, w + "x" + h + " at " + x + "," + y);
                }
        }
    }

    @Test
    void gaussianEqualsTheDirectWeightedSumIncludingBorders() {
        for (int[] size : new int[][]{{41, 29}, {7, 6}, {5, 9}, {3, 4}, {2, 5}, {1, 3}}) { // rows shorter than the kernel too
            int w = size[0], h = size[1];
            float[] src = random(w * h, w * 17L + h);
            float[] dst = new float[w * h], tmp = new float[w * h];
            Filters.gaussian1(src, dst, tmp, w, h);
            double[] k = new double[7];
            double sum = 0;
            for (int i = -3; i <= 3; i++) { k[i + 3] = Math.exp(-i * i / 2.0); sum += k[i + 3]; }
            for (int y = 0; y < h; y++)
                for (int x = 0; x < w; x++) {
                    double s = 0;
                    for (int j = -3; j <= 3; j++)
                        for (int i = -3; i <= 3; i++)
                            s += k[j + 3] * k[i + 3] / (sum * sum) * src[clamp(y + j, h) * w + clamp(x + i, w)];
                    assertEquals(s, dst[y * w + x], 1e-3, w + "x" + h + " at " + x + "," + y);
                }
        }
    }

    @Test
    void highPassEqualsTheSourceMinusTwoBoxMeans() {
        for (int[] size : new int[][]{{45, 31}, {6, 11}, {13, 2}}) {
            int w = size[0], h = size[1], r = 4;
            float[] src = random(w * h, w * 7L + h);
            float[] dst = new float[w * h], low = new float[w * h], t2 = new float[w * h];
            Filters.highPass(src, dst, low, t2, w, h, r);
            // the definition: two box means (each the direct average, clamped borders), subtracted from the source
            double[] twice = directBoxMean(directBoxMean(toDouble(src), w, h, r), w, h, r);
            for (int y = 0; y < h; y++)
                for (int x = 0; x < w; x++) {
                    double mean = twice[y * w + x];
                    assertEquals(src[y * w + x] - mean, dst[y * w + x], 1e-3, w + "x" + h + " at " + x + "," + y);
                    assertEquals(mean, low[y * w + x], 1e-3, "local mean, " + w + "x" + h + " at " + x + "," + y);
                }
        }
    }

    /** The box mean of radius r by its definition: the direct average of the (2r + 1)^2 neighbours, borders clamped. */
    private static double[] directBoxMean(double[] in, int w, int h, int r) {
        double[] out = new double[w * h];
        for (int y = 0; y < h; y++)
            for (int x = 0; x < w; x++) {
                double s = 0;
                for (int j = -r; j <= r; j++)
                    for (int i = -r; i <= r; i++) s += in[clamp(y + j, h) * w + clamp(x + i, w)];
                out[y * w + x] = s / ((2 * r + 1) * (2 * r + 1));
            }
        return out;
    }

    private static double[] toDouble(float[] v) {
        double[] d = new double[v.length];
        for (int i = 0; i < v.length; i++) d[i] = v[i];
        return d;
    }

    /** Against the definition (direct averages of the neighbours, clamped at the image's edges; common practice). */
    @Test
    void highPassOverARectangleEqualsTheDefinitionThereAndWritesNothingElse() {
        int w = 53, h = 41, r = 4;
        float[] src = random(w * h, 977);
        // the definition over the whole image: two box means, borders clamped at the image's edges
        double[] mean = directBoxMean(directBoxMean(toDouble(src), w, h, r), w, h, r);
        // inside, at the image's edges and corners, narrower than the radius, one pixel, the whole image
        int[][] rects = {{10, 8, 30, 25}, {0, 0, 12, 9}, {40, 30, 53, 41}, {20, 0, 23, 41}, {0, 17, 53, 18},
                {26, 20, 27, 21}, {0, 0, 53, 41}};
        for (int[] q : rects) {
            float[] band = new float[w * h], low = new float[w * h], tmp = new float[w * h];
            java.util.Arrays.fill(band, -999f);
            Filters.highPass(src, band, low, tmp, w, h, r, q[0], q[1], q[2], q[3]);
            for (int y = 0; y < h; y++)
                for (int x = 0; x < w; x++) {
                    int i = y * w + x;
                    boolean in = x >= q[0] && x < q[2] && y >= q[1] && y < q[3];
                    String at = java.util.Arrays.toString(q) + " at " + x + "," + y;
                    if (in) {
                        assertEquals(src[i] - mean[i], band[i], 1e-3, "band-pass, " + at);
                        assertEquals(mean[i], low[i], 1e-3, "local mean, " + at);
                    } else {
                        assertEquals(-999f, band[i], 0f, "outside the rectangle: untouched, " + at);
                    }
                }
        }
    }
    /**
     * Two linear filters applied one after the other equal their combined kernel, evaluated only where the second
     * one samples (common practice: convolution is associative); the two-step filters are checked against their
     * definitions above, and 1e-4 allows for float sums taken in another order.
     */
    @Test
    void gaussianHalveEqualsTheBlurThenTheBlockAverage() {
        for (int[] size : new int[][]{{64, 48}, {33, 27}, {9, 7}, {2, 2}, {3, 8}}) {
            int w = size[0], h = size[1], w2 = Math.max(1, w / 2), h2 = Math.max(1, h / 2);
            if (w < 2 || h < 2) continue;
            float[] src = random(w * h, w * 13L + h);
            float[] blur = new float[w * h], tmp = new float[w * h], expected = new float[w2 * h2], got = new float[w2 * h2];
            Filters.gaussian1(src, blur, tmp, w, h);
            Filters.halve(blur, w, h, expected, w2, h2);
            Filters.gaussianHalve(src, w, h, got, w2, h2, new float[w2 * h]);
            for (int i = 0; i < expected.length; i++)
                assertEquals(expected[i], got[i], 1e-4, w + "x" + h + " at " + (i % w2) + "," + (i / w2));
        }
    }

    /** A filter evaluated on part of the image gives the whole image's values there (common practice). */
    @Test
    void gaussianOverARectangleEqualsTheWholeImagesThere() {
        int w = 31, h = 22;
        float[] src = random(w * h, 5);
        float[] full = new float[w * h], tmp = new float[w * h];
        Filters.gaussian1(src, full, tmp, w, h);
        for (int[] q : new int[][]{{4, 5, 20, 15}, {0, 0, 3, 2}, {28, 19, 31, 22}, {10, 0, 11, 22}}) {
            float[] part = new float[w * h];
            java.util.Arrays.fill(part, -1f);
            Filters.gaussian1(src, part, new float[w * h], w, h, q[0], q[1], q[2], q[3]);
            for (int y = 0; y < h; y++)
                for (int x = 0; x < w; x++) {
                    boolean in = x >= q[0] && x < q[2] && y >= q[1] && y < q[3];
                    assertEquals(in ? full[y * w + x] : -1f, part[y * w + x], 1e-6, java.util.Arrays.toString(q) + " at " + x + "," + y);
                }
        }
    }
}
