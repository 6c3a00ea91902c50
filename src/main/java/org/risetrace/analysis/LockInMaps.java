package org.risetrace.analysis;

import java.util.Arrays;

/**
 * Per board pixel lock-in accumulators, updated frame by frame in time order: for the least-squares model of
 * {@link LockInFit} each pixel keeps the sums of y b_m over the basis functions b_m (trend powers, cosine, sine) and
 * of y^2; the normal matrix G = sum b b^T is the same for every pixel and is kept once. At the end each pixel's
 * coefficients are G^-1 s, its residual sum of squares sum y^2 - s . beta and its noise sigma^2 = RSS / (N - M).
 * Memory is a fixed (M + 1) doubles per pixel whatever the number of periods or frames; nothing per frame is kept.
 *
 * <p>Values are taken relative to each pixel's first reading, so sum y^2 stays small against the board's absolute
 * temperature (no cancellation in RSS). A pixel missing from any frame of the window (outside the frame, NaN) has a
 * different normal matrix; it is left without a value rather than fitted on a different design.
 */
public final class LockInMaps {
    private final int width, height, m;
    private final double pxPerMm;
    private final LockInFit fit;
    private final double[] sums, squares;
    private final float[] offset;
    private final int[] count;
    private final double[][] gram;
    private final double[] b;
    private int frames;

    public LockInMaps(int width, int height, double pxPerMm, LockInFit fit) {
        this.width = width;
        this.height = height;
        this.pxPerMm = pxPerMm;
        this.fit = fit;
        this.m = fit.size();
        int n = width * height;
        sums = new double[n * m];
        squares = new double[n];
        offset = new float[n];
        Arrays.fill(offset, Float.NaN);
        count = new int[n];
        gram = new double[m][m];
        b = new double[m];
    }

    /** Adds one frame (in time order; frames outside the window are ignored). */
    public void add(float[] celsius, boolean[] valid, double tS) {
        if (!fit.window().contains(tS)) return;
        fit.basis(tS, b);
        for (int r = 0; r < m; r++) for (int c = 0; c < m; c++) gram[r][c] += b[r] * b[c];
        frames++;
        int n = squares.length;
        final double[] bb = b;
        final int mm = m;
        if (mm == 5) {
            addFive(celsius, valid);
            return;
        }
        for (int k = 0; k < n; k++) {
            float v = celsius[k];
            if ((valid != null && !valid[k]) || Float.isNaN(v)) continue;
            float o = offset[k];
            if (Float.isNaN(o)) {
                offset[k] = v;
                o = v;
            }
            double y = v - o;
            int base = k * mm;
            for (int r = 0; r < mm; r++) sums[base + r] += y * bb[r];
            squares[k] += y * y;
            count[k]++;
        }
    }

    /**
     * The same for the default model (trend of degree 2: 1, u, u^2, cos, sin), unrolled: the loop over the basis
     * with a variable length cost about 3 ms per 640 x 512 frame on the caller's thread, this about a quarter of it.
     */
    private void addFive(float[] celsius, boolean[] valid) {
        final double b1 = b[1], b2 = b[2], b3 = b[3], b4 = b[4]; // b[0] = 1
        final double[] s = sums, sq = squares;
        final float[] off = offset;
        final int[] cnt = count;
        int n = sq.length;
        for (int k = 0, base = 0; k < n; k++, base += 5) {
            float v = celsius[k];
            if ((valid != null && !valid[k]) || v != v) continue;
            float o = off[k];
            if (o != o) {
                off[k] = v;
                o = v;
            }
            double y = v - o;
            s[base] += y;
            s[base + 1] += y * b1;
            s[base + 2] += y * b2;
            s[base + 3] += y * b3;
            s[base + 4] += y * b4;
            sq[k] += y * y;
            cnt[k]++;
        }
    }

    public int frames() { return frames; }

    /**
     * Per pixel results (NaN where a pixel missed a frame).
     *
     * @param inPhase     a, kelvin (apparent)
     * @param quadrature  b, kelvin
     * @param amplitude   sqrt(a^2 + b^2)
     * @param lagDeg      lag behind the excitation, degrees
     * @param amplitudeSe standard error of the amplitude from the pixel's residual, kelvin
     * @param noiseK      residual sigma per frame
     */
    public record Maps(int width, int height, double pxPerMm, float[] inPhase, float[] quadrature, float[] amplitude,
                       float[] lagDeg, float[] amplitudeSe, float[] noiseK) {
    }

    public Maps finish() {
        int n = squares.length;
        float[] ip = new float[n], qd = new float[n], amp = new float[n], lag = new float[n], se = new float[n],
                noise = new float[n];
        Arrays.fill(ip, Float.NaN);
        Arrays.fill(qd, Float.NaN);
        Arrays.fill(amp, Float.NaN);
        Arrays.fill(lag, Float.NaN);
        Arrays.fill(se, Float.NaN);
        Arrays.fill(noise, Float.NaN);
        double[][] inv = frames > m ? LockInFit.invert(gram) : null;
        if (inv != null) {
            int ci = fit.cosIndex();
            double[] beta = new double[m];
            for (int k = 0; k < n; k++) {
                if (count[k] != frames) continue;
                int base = k * m;
                double rss = squares[k];
                for (int r = 0; r < m; r++) {
                    double v = 0;
                    for (int c = 0; c < m; c++) v += inv[r][c] * sums[base + c];
                    beta[r] = v;
                    rss -= v * sums[base + r];
                }
                double a = beta[ci], q = beta[ci + 1];
                double sigma = Math.sqrt(Math.max(0, rss) / (frames - m));
                ip[k] = (float) a;
                qd[k] = (float) q;
                amp[k] = (float) Math.hypot(a, q);
                lag[k] = (float) Math.toDegrees(Math.atan2(q, a));
                se[k] = (float) LockInFit.amplitudeSe(a, q, sigma, inv[ci][ci], inv[ci + 1][ci + 1]);
                noise[k] = (float) sigma;
            }
        }
        return new Maps(width, height, pxPerMm, ip, qd, amp, lag, se, noise);
    }

    /** Standard error of an amplitude per unit noise sigma: sqrt of the mean of (G^-1)_aa and (G^-1)_bb. */
    public double seFactor() {
        double[][] inv = frames > m ? LockInFit.invert(gram) : null;
        if (inv == null) return Double.NaN;
        int ci = fit.cosIndex();
        return Math.sqrt(0.5 * (inv[ci][ci] + inv[ci + 1][ci + 1]));
    }

    /** Bytes held per board pixel (for the benchmark's memory check). */
    public long bytes() {
        return (long) sums.length * 8 + squares.length * 8L + offset.length * 4L + count.length * 4L;
    }

    public int width() { return width; }
    public int height() { return height; }
    public double pxPerMm() { return pxPerMm; }
}
