package org.risetrace.registration;

/** Plain float[] image operations used by registration: smoothing, band-pass, decimation, bilinear sampling. */
final class Filters {
    private Filters() {
    }

    /** Copies the raster replacing NaN/infinite pixels by the mean of the finite ones; returns that mean. */
    static double fillInvalid(float[] src, float[] dst) {
        double sum = 0;
        int n = 0;
        for (float v : src) if (Float.isFinite(v)) { sum += v; n++; }
        float mean = n == 0 ? 0f : (float) (sum / n);
        for (int i = 0; i < src.length; i++) dst[i] = Float.isFinite(src[i]) ? src[i] : mean;
        return n == 0 ? Double.NaN : mean;
    }

    /** Separable Gaussian blur, sigma 1 px, kernel radius 3, borders clamped. */
    static void gaussian1(float[] src, float[] dst, float[] tmp, int w, int h) {
        gaussian1(src, dst, tmp, w, h, 0, 0, w, h);
    }

    /**
     * The Gaussian blur of {@link #gaussian1(float[], float[], float[], int, int)} made in [ax, bx) x [ay, by) only
     * (borders still clamped at the image's edges; tmp holds the rows' pass 3 rows beyond the rectangle).
     */
    static void gaussian1(float[] src, float[] dst, float[] tmp, int w, int h, int ax, int ay, int bx, int by) {
        final float[] k = GAUSSIAN_1;
        convolveRows(src, tmp, w, k, ax, bx, Math.max(0, ay - 3), Math.min(h, by + 3));
        convolveCols(tmp, dst, w, h, k, ax, bx, ay, by);
    }

    private static final float[] GAUSSIAN_1 = kernel(1.0, 3);

    /**
     * The next pyramid level straight from the image: the Gaussian of {@link #gaussian1} followed by the 2 x 2 block
     * average of {@link #halve}, as one filter of 8 taps evaluated at every second pixel along each axis (the
     * same sums regrouped: the full-resolution blur is never made). tmp needs w2 * h values.
     */
    static void gaussianHalve(float[] src, int w, int h, float[] dst, int w2, int h2, float[] tmp) {
        final float[] k = GAUSSIAN_1;
        // taps for offsets -3 .. 4 from 2u: 0.5 (g[i] + g[i - 1])
        float[] c = new float[8];
        for (int t = 0; t < 8; t++) {
            int i = t - 3;
            float a = i >= -3 && i <= 3 ? k[i + 3] : 0f, b = i - 1 >= -3 && i - 1 <= 3 ? k[i + 2] : 0f;
            c[t] = 0.5f * (a + b);
        }
        float c0 = c[0], c1 = c[1], c2 = c[2], c3 = c[3];
        int last = w - 1;
        for (int y = 0; y < h; y++) {
            int row = y * w, out = y * w2;
            for (int u = 0; u < w2; u++) {
                int x = 2 * u;
                float s;
                if (x - 3 >= 0 && x + 4 <= last) { // the taps are symmetric about x + 1/2: pairs folded
                    int i = row + x;
                    s = c0 * (src[i - 3] + src[i + 4]) + c1 * (src[i - 2] + src[i + 3]) + c2 * (src[i - 1] + src[i + 2])
                            + c3 * (src[i] + src[i + 1]);
                } else {
                    s = 0;
                    for (int t = 0; t < 8; t++) s += c[t] * src[row + Math.min(last, Math.max(0, x - 3 + t))];
                }
                tmp[out + u] = s;
            }
        }
        int lastRow = h - 1;
        for (int v = 0; v < h2; v++) {
            int y = 2 * v, out = v * w2;
            int r0 = Math.max(0, y - 3) * w2, r1 = Math.max(0, y - 2) * w2, r2 = Math.max(0, y - 1) * w2,
                    r3 = Math.min(lastRow, y) * w2, r4 = Math.min(lastRow, y + 1) * w2, r5 = Math.min(lastRow, y + 2) * w2,
                    r6 = Math.min(lastRow, y + 3) * w2, r7 = Math.min(lastRow, y + 4) * w2;
            for (int u = 0; u < w2; u++)
                dst[out + u] = c0 * (tmp[r0 + u] + tmp[r7 + u]) + c1 * (tmp[r1 + u] + tmp[r6 + u])
                        + c2 * (tmp[r2 + u] + tmp[r5 + u]) + c3 * (tmp[r3 + u] + tmp[r4 + u]);
        }
    }

    private static float[] kernel(double sigma, int r) {
        float[] k = new float[2 * r + 1];
        double s = 0;
        for (int i = -r; i <= r; i++) { k[i + r] = (float) Math.exp(-i * i / (2 * sigma * sigma)); s += k[i + r]; }
        for (int i = 0; i < k.length; i++) k[i] /= (float) s;
        return k;
    }

    /**
     * Rows [ry0, ry1), columns [cx0, cx1) convolved with a symmetric 7-tap kernel (radius 3), borders clamped at the
     * image's edges, pairs folded. The seven samples slide along the row in locals: one array read per pixel
     * instead of seven (the quick compiler of a short run keeps them in registers; a fifth less time).
     */
    private static void convolveRows(float[] src, float[] dst, int w, float[] k, int cx0, int cx1, int ry0, int ry1) {
        float k0 = k[3], k1 = k[4], k2 = k[5], k3 = k[6];
        int last = w - 1;
        for (int y = ry0; y < ry1; y++) {
            int row = y * w;
            // a .. g hold the row at x - 3 .. x + 3, clamped to the row
            float a = src[row + Math.max(0, Math.min(last, cx0 - 3))], b = src[row + Math.max(0, Math.min(last, cx0 - 2))];
            float c = src[row + Math.max(0, Math.min(last, cx0 - 1))], d = src[row + Math.min(last, cx0)];
            float e = src[row + Math.min(cx0 + 1, last)], f = src[row + Math.min(cx0 + 2, last)];
            float g = src[row + Math.min(cx0 + 3, last)];
            for (int x = cx0; x < cx1; x++) {
                dst[row + x] = k0 * d + k1 * (c + e) + k2 * (b + f) + k3 * (a + g);
                a = b; b = c; c = d; d = e; e = f; f = g;
                int next = x + 4;
                g = src[row + (next < w ? next : last)];
            }
        }
    }

    /**
     * Rows [ry0, ry1), columns [cx0, cx1) of the columns convolved with a symmetric 7-tap kernel (radius 3), borders
     * clamped at the image's edges, pairs of rows folded.
     */
    private static void convolveCols(float[] src, float[] dst, int w, int h, float[] k, int cx0, int cx1, int ry0, int ry1) {
        float k0 = k[3], k1 = k[4], k2 = k[5], k3 = k[6];
        for (int y = ry0; y < ry1; y++) {
            int row = y * w;
            int m1 = Math.max(0, y - 1) * w, p1 = Math.min(h - 1, y + 1) * w;
            int m2 = Math.max(0, y - 2) * w, p2 = Math.min(h - 1, y + 2) * w;
            int m3 = Math.max(0, y - 3) * w, p3 = Math.min(h - 1, y + 3) * w;
            for (int x = cx0; x < cx1; x++)
                dst[row + x] = k0 * src[row + x] + k1 * (src[m1 + x] + src[p1 + x]) + k2 * (src[m2 + x] + src[p2 + x])
                        + k3 * (src[m3 + x] + src[p3 + x]);
        }
    }

    /**
     * The box mean of radius r (borders clamped at the image's edges) of src into dst over columns [cx0, cx1) and
     * rows [ry0, ry1), in one pass: acc holds the column sums over the 2r + 1 rows around the current row (moved
     * down a row by adding the row entering and subtracting the row leaving) and each output row is a running sum
     * along them. No intermediate image: the band-pass of a 640 x 480 frame took a third less time than with a pass
     * along the rows and another along the columns under the optimising compiler, the same under the quick one
     * (DEVELOPERS.md, "Fifth pass"). When minuend is given, minuend - dst also goes into difference.
     */
    private static void boxMean2d(float[] src, float[] dst, float[] minuend, float[] difference, int w, int h, int r,
                                  int cx0, int cx1, int ry0, int ry1) {
        if (cx1 <= cx0 || ry1 <= ry0) return;
        float inv = 1f / ((2 * r + 1) * (2 * r + 1));
        int last = w - 1, lastRow = h - 1;
        // the columns the running sums read: r beyond the output's, clamped to the image
        int a0 = Math.max(0, cx0 - r), a1 = Math.min(w, cx1 + r + 1);
        float[] acc = new float[w];
        for (int i = -r; i <= r; i++) {
            int yy = Math.min(lastRow, Math.max(0, ry0 + i)) * w;
            for (int x = a0; x < a1; x++) acc[x] += src[yy + x];
        }
        for (int y = ry0; y < ry1; y++) {
            int row = y * w;
            float s = 0;
            for (int i = -r; i <= r; i++) s += acc[Math.min(last, Math.max(0, cx0 + i))];
            int x = cx0;
            // left border: the sum leaving is clamped to the first column
            for (; x < cx1 && x - r < 0; x++) {
                dst[row + x] = s * inv;
                s += acc[Math.min(last, x + r + 1)] - acc[0];
            }
            // interior: neither end clamped
            for (; x < cx1 && x + r + 1 <= last; x++) {
                dst[row + x] = s * inv;
                s += acc[x + r + 1] - acc[x - r];
            }
            for (; x < cx1; x++) {
                dst[row + x] = s * inv;
                s += acc[last] - acc[Math.max(0, x - r)];
            }
            if (minuend != null) for (x = cx0; x < cx1; x++) difference[row + x] = minuend[row + x] - dst[row + x];
            if (y + 1 < ry1) { // the row entering below, the row leaving above (both clamped)
                int add = Math.min(lastRow, y + r + 1) * w, sub = Math.max(0, y - r) * w;
                for (int xx = a0; xx < a1; xx++) acc[xx] += src[add + xx] - src[sub + xx];
            }
        }
    }

    /** Box mean of radius r (borders clamped). */
    static void boxMean(float[] src, float[] dst, int w, int h, int r) {
        boxMean2d(src, dst, null, null, w, h, r, 0, w, 0, h);
    }

    /**
     * Band-pass: the image minus its local mean (two box passes of radius r, close to a Gaussian of sigma
     * r * 0.8). Removes slow offsets such as the whole board warming, keeps edges and texture. The local mean is
     * kept in low (where heat shows rather than texture); tmp is scratch. The last pass writes both.
     */
    static void highPass(float[] src, float[] band, float[] low, float[] tmp, int w, int h, int r) {
        highPass(src, band, low, tmp, w, h, r, 0, 0, w, h);
    }

    /**
     * The band-pass and local mean of {@link #highPass(float[], float[], float[], float[], int, int, int)} made in
     * the rectangle [ax, bx) x [ay, by) only, with the same values there (the filters still clamp at the image's
     * edges, and read the source up to 2 r beyond the rectangle). Outside it, band is untouched and low and tmp hold
     * intermediate values.
     */
    static void highPass(float[] src, float[] band, float[] low, float[] tmp, int w, int h, int r,
                         int ax, int ay, int bx, int by) {
        // the first mean where the second reads it (r beyond the rectangle), into tmp; the second into low
        boxMean2d(src, tmp, null, null, w, h, r, Math.max(0, ax - r), Math.min(w, bx + r), Math.max(0, ay - r),
                Math.min(h, by + r));
        boxMean2d(tmp, low, src, band, w, h, r, ax, bx, ay, by);
    }

    /** 2 x 2 block average: pixel (u, v) of the result covers source pixels 2u..2u+1, 2v..2v+1. */
    static void halve(float[] src, int w, int h, float[] dst, int w2, int h2) {
        for (int v = 0; v < h2; v++) {
            int r0 = 2 * v * w, r1 = r0 + w;
            for (int u = 0; u < w2; u++) {
                int x = 2 * u;
                dst[v * w2 + u] = 0.25f * (src[r0 + x] + src[r0 + x + 1] + src[r1 + x] + src[r1 + x + 1]);
            }
        }
    }

    /** Bilinear sample at (x, y), pixel centres at integers; NaN outside [0, w-1] x [0, h-1]. */
    static float bilinear(float[] img, int w, int h, double x, double y) {
        if (!(x >= 0 && y >= 0 && x <= w - 1 && y <= h - 1)) return Float.NaN;
        int x0 = (int) x, y0 = (int) y;
        if (x0 >= w - 1) x0 = w - 2;
        if (y0 >= h - 1) y0 = h - 2;
        if (x0 < 0) x0 = 0;
        if (y0 < 0) y0 = 0;
        float ax = (float) (x - x0), ay = (float) (y - y0);
        int i = y0 * w + x0;
        if (w == 1 || h == 1) return img[Math.min(i, img.length - 1)];
        float top = img[i] + ax * (img[i + 1] - img[i]);
        float bot = img[i + w] + ax * (img[i + w + 1] - img[i + w]);
        return top + ay * (bot - top);
    }
}
