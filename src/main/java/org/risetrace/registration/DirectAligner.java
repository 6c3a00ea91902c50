package org.risetrace.registration;

import org.risetrace.numeric.OrderStatistics;

/**
 * Inverse-compositional Gauss-Newton alignment of a frame's band-passed pyramid to the reference template
 * (Baker and Matthews, "Lucas-Kanade 20 Years On", IJCV 2004), coarse to fine, with an 8-parameter homography
 * (6-parameter affine on the top level of a deep pyramid), a robust offset per iteration, and Huber then Tukey
 * weights (scale from the median absolute residual) so heating parts do not pull the fit. One instance per thread.
 */
final class DirectAligner {
    /** Medians of residuals are taken over a regular subsample of about this many pixels. */
    static final int MEDIAN_SAMPLES = 1000;
    private float[] warped = new float[0], err = new float[0], abs = new float[0], change = new float[0];
    /**
     * Leave out template pixels whose local mean changed against the reference's by more than MASK_K robust
     * standard deviations (heat, not texture). On simulated 40-frame heated series, with chain links re-anchored,
     * ok frames were at most 0.73 px off with the mask and 1.97 px without; MASK_K 3 did no better than 4.
     */
    static final boolean MASK_CHANGED = true;
    static final double MASK_K = 4.0;
    /** True when the last level's final step moved no corner of the image by more than the tolerance. */
    boolean converged;
    int iterations;
    /** Degrees of freedom of the fitted motion: 4 similarity, 6 affine, 8 homography. */
    int model = 8;
    /** Tukey weights from the first iteration (the start is already close, e.g. the last frame's mapping). */
    boolean robustFromStart;

    /**
     * Refines startFull (reference to frame, full-resolution pixels) from level fromLevel down to level 0.
     * Returns null when the frame falls away (too few template pixels land inside the frame).
     */
    Homography align(ReferenceModel ref, Pyramid frame, Homography startFull, int fromLevel) {
        return align(ref, frame, startFull, fromLevel, 0);
    }

    /** As {@link #align(ReferenceModel, Pyramid, Homography, int)}, stopping after level toLevel. */
    Homography align(ReferenceModel ref, Pyramid frame, Homography startFull, int fromLevel, int toLevel) {
        Homography h = startFull;
        converged = false;
        iterations = 0;
        for (int l = fromLevel; l >= toLevel; l--) {
            ReferenceModel.Level lv = ref.level[l];
            if (lv.n < 16) continue;
            ensure(lv.n);
            if (l == 0) frame.ensureLevel0(ref, h.values());
            int params = Math.min(model, (l == ref.levels - 1 && l >= 2) ? 6 : 8);
            double[] hl = Pyramid.toLevel(h, l);
            int maxIter = l == 0 ? 10 : 20;
            double tol = l == 0 ? 0.02 : 0.05;
            boolean settled = false;
            for (int it = 0; it < maxIter; it++) {
                iterations++;
                boolean robust = it >= 3 || l < fromLevel || robustFromStart;
                double[] dp = step(lv, frame.bandPass[l], robust && MASK_CHANGED ? frame.lowPass[l] : null,
                        frame.widths[l], frame.heights[l], hl, params, robust);
                if (dp == null) return null;
                double[] dh = incrementInPixels(dp, lv);
                double[] inv = invert(dh);
                if (inv == null) return null;
                hl = multiply(hl, inv);
                if (!finite(hl)) return null;
                if (maxCornerShift(dh, lv.w, lv.h) < tol) { settled = true; break; }
            }
            h = Pyramid.toFull(hl, l).normalized();
            if (l == 0) converged = settled;
        }
        return h;
    }

    private void ensure(int n) {
        if (warped.length < n) { warped = new float[n]; err = new float[n]; abs = new float[n]; change = new float[n]; }
    }

    /** One Gauss-Newton step: the parameter increment (8 values, the last two 0 for affine) or null. */
    private double[] step(ReferenceModel.Level lv, float[] img, float[] low, int w, int h, double[] H, int params,
                          boolean tukey) {
        int n = lv.n, valid = 0;
        double si = 0, si2 = 0;
        // Filters.bilinear written out (same results): the quick compiler a short run uses does not inline it, and
        // the band-pass and the local mean are sampled at the same point with one set of weights
        double h0 = H[0], h1 = H[1], h2 = H[2], h3 = H[3], h4 = H[4], h5 = H[5], h6 = H[6], h7 = H[7], h8 = H[8];
        float[] tx = lv.x, ty = lv.y, tlow = lv.low;
        int wm = w - 1, hm = h - 1;
        boolean degenerate = w == 1 || h == 1;
        for (int i = 0; i < n; i++) {
            double x = tx[i], y = ty[i];
            double iz = 1 / (h6 * x + h7 * y + h8);
            double u = (h0 * x + h1 * y + h2) * iz, v = (h3 * x + h4 * y + h5) * iz;
            if (!(u >= 0 && v >= 0 && u <= wm && v <= hm)) {
                warped[i] = Float.NaN;
                continue;
            }
            if (degenerate) {
                float f = Filters.bilinear(img, w, h, u, v);
                warped[i] = f;
                if (f == f) {
                    valid++;
                    si += f; si2 += f * f;
                    if (low != null) change[i] = Filters.bilinear(low, w, h, u, v) - tlow[i];
                }
                continue;
            }
            int x0 = (int) u, y0 = (int) v;
            if (x0 >= wm) x0 = w - 2;
            if (y0 >= hm) y0 = h - 2;
            float ax = (float) (u - x0), ay = (float) (v - y0);
            int k = y0 * w + x0;
            float p00 = img[k], p10 = img[k + 1], p01 = img[k + w], p11 = img[k + w + 1];
            float top = p00 + ax * (p10 - p00), bot = p01 + ax * (p11 - p01);
            float f = top + ay * (bot - top);
            warped[i] = f;
            if (f == f) {
                valid++;
                si += f; si2 += f * f;
                if (low != null) {
                    float q00 = low[k], q10 = low[k + 1], q01 = low[k + w], q11 = low[k + w + 1];
                    float lt = q00 + ax * (q10 - q00), lb = q01 + ax * (q11 - q01);
                    change[i] = lt + ay * (lb - lt) - tlow[i];
                }
            }
        }
        if (low != null && valid > 0) maskChanged(n, valid);
        if (valid < Math.max(16, n / 4)) return null;
        double sdI = Math.sqrt(Math.max(0, si2 / valid - (si / valid) * (si / valid)));
        if (sdI < 1e-12) return null;
        // offset: median difference (robust against parts that heated); no gain, since the band-pass removes the
        // board's overall warming and a gain fitted to a frame with a hot part would shrink the board's texture
        // both medians over a regular subsample of at most about MEDIAN_SAMPLES pixels (the full-resolution levels
        // hold 5000; the median of a subsample that size is as good a robust centre and costs a fifth)
        int stride = Math.max(1, valid / MEDIAN_SAMPLES);
        int m = 0, seen = 0;
        for (int i = 0; i < n; i++) {
            float f = warped[i];
            if (f != f) continue;
            if (seen++ % stride == 0) abs[m++] = f - lv.t[i];
        }
        double offset = OrderStatistics.select(abs, m, m / 2);
        m = 0;
        seen = 0;
        for (int i = 0; i < n; i++) {
            float f = warped[i];
            if (f != f) continue;
            float e = (float) (f - offset - lv.t[i]);
            err[i] = e;
            if (seen++ % stride == 0) abs[m++] = Math.abs(e);
        }
        double sigma = Math.max(1.4826 * OrderStatistics.select(abs, m, m / 2), 1e-9);
        // Huber weights while far from the solution, then Tukey's biweight, which ignores pixels that changed
        // (parts heating) altogether (robust M-estimation, Huber 1981; Tukey constants 1.345 and 4.685 give 95 %
        // efficiency under Gaussian noise)
        double k = tukey ? 4.685 * sigma : 1.345 * sigma;
        if (params == 4) return similarityStep(lv, k, tukey);
        double[] a = new double[64], g = new double[8];
        float[] sd = lv.sd;
        for (int i = 0; i < n; i++) {
            if (warped[i] != warped[i]) continue;
            double e = err[i], wt = robustWeight(e, k, tukey);
            if (wt == 0) continue;
            int o = 8 * i;
            for (int r = 0; r < 8; r++) {
                double sr = sd[o + r] * wt;
                g[r] += sr * e;
                for (int c = r; c < 8; c++) a[r * 8 + c] += sr * sd[o + c];
            }
        }
        for (int r = 0; r < 8; r++) for (int c = 0; c < r; c++) a[r * 8 + c] = a[c * 8 + r];
        return solve(a, g, params);
    }

    /**
     * The mapping's statistical uncertainty at the board corners, from the full-resolution normal equations at the
     * final estimate: covariance of the motion parameters C = s^2 H^-1 with H = sum w sd sd^T over the template
     * pixels and s^2 = sum w e^2 / (sum w - P) (weighted least squares, Tukey weights as in the last step;
     * Bates and Watts, Nonlinear Regression Analysis, ch. 2), propagated to each reference corner through the
     * linearised increment warp, J C J^T. Returns the mean over the corners of trace(J C J^T) in squared reference
     * pixels (the expected squared corner displacement), NaN when the equations are singular. Residuals of
     * neighbouring band-passed pixels are correlated (blur, filter support), so this understates the error by a
     * roughly constant factor that {@link DirectRegistrar} calibrates.
     *
     * @param params 4 for the similarity, 8 for the homography
     */
    double cornerVariance(ReferenceModel ref, Pyramid frame, Homography h, int params) {
        ReferenceModel.Level lv = ref.level[0];
        if (lv.n < 16) return Double.NaN;
        ensure(lv.n);
        double[] H = h.normalized().values();
        frame.ensureLevel0(ref, H);
        float[] img = frame.bandPass[0];
        int w = frame.widths[0], hh = frame.heights[0], n = lv.n, valid = 0;
        for (int i = 0; i < n; i++) {
            double x = lv.x[i], y = lv.y[i];
            double z = H[6] * x + H[7] * y + H[8];
            float f = Filters.bilinear(img, w, hh, (H[0] * x + H[1] * y + H[2]) / z, (H[3] * x + H[4] * y + H[5]) / z);
            warped[i] = f;
            if (f == f) abs[valid++] = f - lv.t[i];
        }
        if (valid < 16) return Double.NaN;
        double offset = OrderStatistics.select(abs, valid, valid / 2);
        int m = 0;
        for (int i = 0; i < n; i++) {
            float f = warped[i];
            if (f != f) continue;
            float e = (float) (f - offset - lv.t[i]);
            err[i] = e;
            abs[m++] = Math.abs(e);
        }
        double sigma = Math.max(1.4826 * OrderStatistics.select(abs, m, m / 2), 1e-9), k = 4.685 * sigma;
        int p = params == 4 ? 4 : 8;
        double[] a = new double[p * p];
        double sw = 0, swe2 = 0;
        for (int i = 0; i < n; i++) {
            if (warped[i] != warped[i]) continue;
            double e = err[i], wt = robustWeight(e, k, true);
            if (wt == 0) continue;
            sw += wt;
            swe2 += wt * e * e;
            for (int r = 0; r < p; r++) {
                double sr = (p == 4 ? lv.sd4[4 * i + r] : lv.sd[8 * i + r]) * wt;
                for (int c = r; c < p; c++) a[r * p + c] += sr * (p == 4 ? lv.sd4[4 * i + c] : lv.sd[8 * i + c]);
            }
        }
        if (!(sw > p)) return Double.NaN;
        for (int r = 0; r < p; r++) for (int c = 0; c < r; c++) a[r * p + c] = a[c * p + r];
        double[] inv = invertSymmetric(a, p);
        if (inv == null) return Double.NaN;
        double s2 = swe2 / (sw - p);
        double total = 0;
        double[][] corners = ref.referenceCornersPx;
        double[] jx = new double[p], jy = new double[p];
        for (double[] c : corners) {
            double xn = (c[0] - lv.cx) / lv.sc, yn = (c[1] - lv.cy) / lv.sc, sc = lv.sc;
            if (p == 4) { // p0 = p3 = q0, p1 = q1, p2 = -q1, p4 = q2, p5 = q3
                jx[0] = xn * sc; jx[1] = -yn * sc; jx[2] = sc; jx[3] = 0;
                jy[0] = yn * sc; jy[1] = xn * sc; jy[2] = 0; jy[3] = sc;
            } else { // displacement of the increment warp N^-1 (I + dP) N, linearised at the identity
                jx[0] = xn * sc; jx[1] = 0; jx[2] = yn * sc; jx[3] = 0; jx[4] = sc; jx[5] = 0;
                jx[6] = -xn * xn * sc; jx[7] = -xn * yn * sc;
                jy[0] = 0; jy[1] = xn * sc; jy[2] = 0; jy[3] = yn * sc; jy[4] = 0; jy[5] = sc;
                jy[6] = -xn * yn * sc; jy[7] = -yn * yn * sc;
            }
            total += quadratic(inv, jx, p) + quadratic(inv, jy, p);
        }
        double v = s2 * total / corners.length;
        return Double.isFinite(v) && v >= 0 ? v : Double.NaN;
    }

    /** v^T M v for a p x p matrix M (row-major). */
    private static double quadratic(double[] mat, double[] v, int p) {
        double s = 0;
        for (int r = 0; r < p; r++) {
            double row = 0;
            for (int c = 0; c < p; c++) row += mat[r * p + c] * v[c];
            s += v[r] * row;
        }
        return s;
    }

    /** Inverse of a symmetric positive-definite p x p matrix by Gauss-Jordan with pivoting; null when singular. */
    static double[] invertSymmetric(double[] a, int p) {
        double[][] m = new double[p][2 * p];
        for (int r = 0; r < p; r++) {
            for (int c = 0; c < p; c++) m[r][c] = a[r * p + c];
            m[r][p + r] = 1;
        }
        for (int c = 0; c < p; c++) {
            int piv = c;
            for (int r = c + 1; r < p; r++) if (Math.abs(m[r][c]) > Math.abs(m[piv][c])) piv = r;
            if (Math.abs(m[piv][c]) < 1e-300) return null;
            double[] t = m[c]; m[c] = m[piv]; m[piv] = t;
            double d = m[c][c];
            for (int k = 0; k < 2 * p; k++) m[c][k] /= d;
            for (int r = 0; r < p; r++) {
                if (r == c) continue;
                double f = m[r][c];
                if (f != 0) for (int k = 0; k < 2 * p; k++) m[r][k] -= f * m[c][k];
            }
        }
        double[] inv = new double[p * p];
        for (int r = 0; r < p; r++) for (int c = 0; c < p; c++) inv[r * p + c] = m[r][p + c];
        for (double v : inv) if (!Double.isFinite(v)) return null;
        return inv;
    }

    /**
     * Marks (warped = NaN) the template pixels whose local mean moved against the reference's by more than MASK_K
     * robust standard deviations of that change over the template: heat spreading from a part shifts the local mean
     * by far more than noise or a sub-pixel misalignment does, and near such a blob the band-passed picture is
     * changed in a way that pulls the alignment.
     */
    private void maskChanged(int n, int valid) {
        // both medians over a regular subsample of at most about MEDIAN_SAMPLES pixels, as in step
        int stride = Math.max(1, valid / MEDIAN_SAMPLES);
        int m = 0, seen = 0;
        for (int i = 0; i < n; i++) if (warped[i] == warped[i] && seen++ % stride == 0) abs[m++] = change[i];
        double med = OrderStatistics.select(abs, m, m / 2);
        m = 0;
        seen = 0;
        for (int i = 0; i < n; i++)
            if (warped[i] == warped[i] && seen++ % stride == 0) abs[m++] = (float) Math.abs(change[i] - med);
        double s = 1.4826 * OrderStatistics.select(abs, m, m / 2);
        if (!(s > 0)) return;
        double lim = MASK_K * s;
        for (int i = 0; i < n; i++)
            if (warped[i] == warped[i] && Math.abs(change[i] - med) > lim) warped[i] = Float.NaN;
    }

    /** Tukey's biweight (0 beyond k) or Huber's weight (1 within k, k / |e| beyond) of residual e. */
    private static double robustWeight(double e, double k, boolean tukey) {
        double ae = Math.abs(e);
        if (tukey) {
            if (ae >= k) return 0;
            double u = ae / k, v = 1 - u * u;
            return v * v;
        }
        return ae <= k ? 1.0 : k / ae;
    }

    /**
     * The step restricted to a similarity (zoom-rotation a, b and shift): p = M q with p0 = p3 = a, p1 = b,
     * p2 = -b, p4 = tx, p5 = ty. The reduced normal equations M^T A M q = M^T g are accumulated directly from the
     * reduced steepest-descent images M^T sd (ReferenceModel.Level.sd4): 10 products per pixel instead of 36.
     */
    private double[] similarityStep(ReferenceModel.Level lv, double k, boolean tukey) {
        double[] a = new double[64], g = new double[8];
        float[] sd = lv.sd4;
        int n = lv.n;
        double a00 = 0, a01 = 0, a02 = 0, a03 = 0, a11 = 0, a12 = 0, a13 = 0, a22 = 0, a23 = 0, a33 = 0;
        double g0 = 0, g1 = 0, g2 = 0, g3 = 0;
        for (int i = 0; i < n; i++) {
            if (warped[i] != warped[i]) continue;
            double e = err[i], wt = robustWeight(e, k, tukey);
            if (wt == 0) continue;
            int o = 4 * i;
            double s0 = sd[o], s1 = sd[o + 1], s2 = sd[o + 2], s3 = sd[o + 3];
            double w0 = s0 * wt, w1 = s1 * wt, w2 = s2 * wt, w3 = s3 * wt;
            g0 += w0 * e; g1 += w1 * e; g2 += w2 * e; g3 += w3 * e;
            a00 += w0 * s0; a01 += w0 * s1; a02 += w0 * s2; a03 += w0 * s3;
            a11 += w1 * s1; a12 += w1 * s2; a13 += w1 * s3;
            a22 += w2 * s2; a23 += w2 * s3;
            a33 += w3 * s3;
        }
        double[][] rows = {{a00, a01, a02, a03}, {a01, a11, a12, a13}, {a02, a12, a22, a23}, {a03, a13, a23, a33}};
        for (int r = 0; r < 4; r++) System.arraycopy(rows[r], 0, a, 8 * r, 4);
        g[0] = g0; g[1] = g1; g[2] = g2; g[3] = g3;
        double[] q = solve(a, g, 4);
        if (q == null) return null;
        return new double[]{q[0], q[1], -q[1], q[0], q[2], q[3], 0, 0};
    }

    /** The increment warp, defined in the level's normalised coordinates, as a pixel homography N^-1 dH N. */
    private static double[] incrementInPixels(double[] p, ReferenceModel.Level lv) {
        double[] dn = {1 + p[0], p[2], p[4], p[1], 1 + p[3], p[5], p[6], p[7], 1};
        double sc = lv.sc, cx = lv.cx, cy = lv.cy;
        double[] nInv = {sc, 0, cx, 0, sc, cy, 0, 0, 1};
        double[] n = {1 / sc, 0, -cx / sc, 0, 1 / sc, -cy / sc, 0, 0, 1};
        return multiply(multiply(nInv, dn), n);
    }

    static double[] multiply(double[] a, double[] b) {
        double[] c = new double[9];
        for (int r = 0; r < 3; r++)
            for (int col = 0; col < 3; col++)
                c[r * 3 + col] = a[r * 3] * b[col] + a[r * 3 + 1] * b[3 + col] + a[r * 3 + 2] * b[6 + col];
        return c;
    }

    static double[] invert(double[] h) {
        try {
            return new Homography(h).inverse().values();
        } catch (ArithmeticException e) {
            return null;
        }
    }

    private static boolean finite(double[] h) {
        for (double v : h) if (!Double.isFinite(v)) return false;
        return true;
    }

    private static double maxCornerShift(double[] h, int w, int hh) {
        double worst = 0;
        double[][] c = {{0, 0}, {w - 1, 0}, {w - 1, hh - 1}, {0, hh - 1}};
        for (double[] p : c) {
            double z = h[6] * p[0] + h[7] * p[1] + h[8];
            double u = (h[0] * p[0] + h[1] * p[1] + h[2]) / z, v = (h[3] * p[0] + h[4] * p[1] + h[5]) / z;
            worst = Math.max(worst, Math.hypot(u - p[0], v - p[1]));
        }
        return worst;
    }

    /** Solves the leading n x n block of a (row stride 8) against g; null when singular. */
    private static double[] solve(double[] a, double[] g, int n) {
        double[][] m = new double[n][n + 1];
        for (int r = 0; r < n; r++) {
            for (int c = 0; c < n; c++) m[r][c] = a[r * 8 + c];
            m[r][n] = g[r];
        }
        for (int c = 0; c < n; c++) {
            int p = c;
            for (int r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
            if (Math.abs(m[p][c]) < 1e-300) return null;
            double[] t = m[c]; m[c] = m[p]; m[p] = t;
            for (int r = c + 1; r < n; r++) {
                double f = m[r][c] / m[c][c];
                for (int k = c; k <= n; k++) m[r][k] -= f * m[c][k];
            }
        }
        double[] x = new double[8];
        for (int r = n - 1; r >= 0; r--) {
            double s = m[r][n];
            for (int k = r + 1; k < n; k++) s -= m[r][k] * x[k];
            x[r] = s / m[r][r];
        }
        for (double v : x) if (!Double.isFinite(v)) return null;
        return x;
    }
}
