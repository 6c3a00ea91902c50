package org.risetrace.registration;

import org.risetrace.board.Board;

/**
 * Homographies from point correspondences: the exact four-point solution (direct linear transform with h33 = 1,
 * Hartley and Zisserman, Multiple View Geometry, section 4.1), computed in normalised coordinates for conditioning.
 */
public final class Homographies {
    private Homographies() {
    }

    /** The homography mapping src[i] to dst[i], i = 0..3 (no three points collinear). */
    public static Homography fromFourPoints(double[][] src, double[][] dst) {
        if (src.length != 4 || dst.length != 4) throw new IllegalArgumentException("four point pairs needed");
        double[] ns = normaliser(src), nd = normaliser(dst);
        double[][] a = new double[8][9];
        for (int i = 0; i < 4; i++) {
            double x = (src[i][0] - ns[0]) * ns[2], y = (src[i][1] - ns[1]) * ns[2];
            double u = (dst[i][0] - nd[0]) * nd[2], v = (dst[i][1] - nd[1]) * nd[2];
            a[2 * i] = new double[]{x, y, 1, 0, 0, 0, -u * x, -u * y, u};
            a[2 * i + 1] = new double[]{0, 0, 0, x, y, 1, -v * x, -v * y, v};
        }
        double[] h = solve8(a);
        if (h == null) throw new ArithmeticException("degenerate point configuration");
        Homography hn = new Homography(new double[]{h[0], h[1], h[2], h[3], h[4], h[5], h[6], h[7], 1});
        // H = Nd^-1 * Hn * Ns
        Homography nsM = new Homography(new double[]{ns[2], 0, -ns[0] * ns[2], 0, ns[2], -ns[1] * ns[2], 0, 0, 1});
        Homography ndInv = new Homography(new double[]{1 / nd[2], 0, nd[0], 0, 1 / nd[2], nd[1], 0, 0, 1});
        return ndInv.compose(hn).compose(nsM).normalized();
    }

    /** Board millimetres to frame pixels from the four board corners (outline order) in that frame's pixels. */
    public static Homography boardToFrame(Board board, double[][] cornersPx) {
        double w = board.widthMm(), h = board.heightMm();
        return fromFourPoints(new double[][]{{0, 0}, {w, 0}, {w, h}, {0, h}}, cornersPx);
    }

    /** The four board corners (outline order) mapped into frame pixels. */
    public static double[][] boardCorners(Board board, Homography boardToFrame) {
        double w = board.widthMm(), h = board.heightMm();
        return new double[][]{boardToFrame.apply(0, 0), boardToFrame.apply(w, 0), boardToFrame.apply(w, h),
                boardToFrame.apply(0, h)};
    }

    /** centroid x, centroid y, scale so the mean distance from the centroid is sqrt(2). */
    private static double[] normaliser(double[][] p) {
        double cx = 0, cy = 0;
        for (double[] q : p) { cx += q[0]; cy += q[1]; }
        cx /= p.length; cy /= p.length;
        double d = 0;
        for (double[] q : p) d += Math.hypot(q[0] - cx, q[1] - cy);
        d /= p.length;
        return new double[]{cx, cy, d > 0 ? Math.sqrt(2) / d : 1};
    }

    /** Solves the 8 x 8 system [A | b] (b in column 8) by Gaussian elimination with partial pivoting. */
    private static double[] solve8(double[][] m) {
        int n = 8;
        for (int c = 0; c < n; c++) {
            int p = c;
            for (int r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
            if (Math.abs(m[p][c]) < 1e-12) return null;
            double[] t = m[c]; m[c] = m[p]; m[p] = t;
            for (int r = c + 1; r < n; r++) {
                double f = m[r][c] / m[c][c];
                if (f == 0) continue;
                for (int k = c; k <= n; k++) m[r][k] -= f * m[c][k];
            }
        }
        double[] x = new double[n];
        for (int r = n - 1; r >= 0; r--) {
            double s = m[r][n];
            for (int k = r + 1; k < n; k++) s -= m[r][k] * x[k];
            x[r] = s / m[r][r];
        }
        return x;
    }
}
