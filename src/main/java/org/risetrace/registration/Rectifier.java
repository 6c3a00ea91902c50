package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

/**
 * Resamples frames into board space: board pixel (i, j) covers board point ((i + 0.5) / pxPerMm,
 * (j + 0.5) / pxPerMm) mm, which the board-to-frame homography sends to frame pixel coordinates (pixel centres at
 * integers), where the frame is sampled bilinearly. A board pixel is valid when all four neighbours exist and hold
 * readings. The homography's numerators and denominator are linear along a row, so positions are divided out every
 * few pixels only and interpolated in between, within {@link #MAX_INTERPOLATION_ERROR_PX}. Instances are immutable
 * and thread-safe.
 */
public final class Rectifier {
    private final Board board;
    private final double pxPerMm;
    private final int width, height;

    public Rectifier(Board board, double pxPerMm) {
        if (!(pxPerMm > 0) || !Double.isFinite(pxPerMm)) throw new IllegalArgumentException("pxPerMm " + pxPerMm);
        this.board = board;
        this.pxPerMm = pxPerMm;
        this.width = Math.max(1, (int) Math.round(board.widthMm() * pxPerMm));
        this.height = Math.max(1, (int) Math.round(board.heightMm() * pxPerMm));
    }

    public int width() { return width; }
    public int height() { return height; }
    public double pxPerMm() { return pxPerMm; }

    /** The reference frame's own scale: mean length of the marked outline's edges per millimetre of board. */
    public static double defaultPxPerMm(Board board) {
        double[][] c = board.outline().cornersPx();
        double top = Math.hypot(c[1][0] - c[0][0], c[1][1] - c[0][1]);
        double bottom = Math.hypot(c[2][0] - c[3][0], c[2][1] - c[3][1]);
        double left = Math.hypot(c[3][0] - c[0][0], c[3][1] - c[0][1]);
        double right = Math.hypot(c[2][0] - c[1][0], c[2][1] - c[1][1]);
        return ((top + bottom) / board.widthMm() + (left + right) / board.heightMm()) / 4;
    }

    public BoardRaster rectify(Frame frame, Homography boardToFrame) {
        float[] out = new float[width * height];
        boolean[] valid = new boolean[width * height];
        rectify(frame.celsius(), frame.width(), frame.height(), boardToFrame, out, valid);
        return new BoardRaster(width, height, pxPerMm, out, valid);
    }

    /**
     * Largest error allowed for a frame position interpolated along a row instead of divided out, frame pixels
     * (registration is known to a few hundredths of a pixel at best; see {@link #span}).
     */
    static final double MAX_INTERPOLATION_ERROR_PX = 1e-4;

    /** Into caller-owned buffers (length width() * height()), for loops over many frames. */
    public void rectify(float[] src, int w, int h, Homography boardToFrame, float[] out, boolean[] valid) {
        double[] m = boardToFrame.values();
        double inv = 1 / pxPerMm;
        // board pixel (i, j) -> board mm ((i + 0.5) inv, (j + 0.5) inv) -> frame px: fold the scale into H
        double a0 = m[0] * inv, a1 = m[1] * inv, a2 = m[2] + 0.5 * inv * (m[0] + m[1]);
        double b0 = m[3] * inv, b1 = m[4] * inv, b2 = m[5] + 0.5 * inv * (m[3] + m[4]);
        double c0 = m[6] * inv, c1 = m[7] * inv, c2 = m[8] + 0.5 * inv * (m[6] + m[7]);
        int wm = w - 1, hm = h - 1;
        int kx = wm > 0 ? 1 : 0, ky = hm > 0 ? w : 0;
        for (int j = 0; j < height; j++) {
            double nx0 = a1 * j + a2, ny0 = b1 * j + b2, nz0 = c1 * j + c2;
            int row = j * width;
            int span = span(nx0, ny0, nz0, a0, b0, c0, width);
            // frame positions exact at every span-th pixel and at the row's end, linear in between
            double xs = nx0 / nz0, ys = ny0 / nz0;
            for (int i0 = 0; i0 < width; ) {
                int i1 = Math.min(width - 1, i0 + span);
                double z1 = c0 * i1 + nz0, xe = (a0 * i1 + nx0) / z1, ye = (b0 * i1 + ny0) / z1;
                int n = i1 - i0;
                double dx = n == 0 ? 0 : (xe - xs) / n, dy = n == 0 ? 0 : (ye - ys) / n;
                int end = i1 == width - 1 ? i1 + 1 : i1;
                for (int i = i0; i < end; i++) {
                    int k = i - i0;
                    double x = k == n ? xe : xs + k * dx, y = k == n ? ye : ys + k * dy;
                    int o = row + i;
                    if (!(x >= 0 && y >= 0 && x <= wm && y <= hm)) {
                        out[o] = Float.NaN;
                        valid[o] = false;
                        continue;
                    }
                    int x0 = (int) x, y0 = (int) y;
                    if (x0 == wm && wm > 0) x0--;
                    if (y0 == hm && hm > 0) y0--;
                    float ax = (float) (x - x0), ay = (float) (y - y0);
                    int q = y0 * w + x0;
                    float p00 = src[q], p10 = src[q + kx], p01 = src[q + ky], p11 = src[q + ky + kx];
                    float top = p00 + ax * (p10 - p00), bot = p01 + ax * (p11 - p01);
                    float v = top + ay * (bot - top);
                    out[o] = v;
                    valid[o] = v == v;
                }
                xs = xe;
                ys = ye;
                i0 = end;
            }
        }
    }

    /**
     * Pixels between exact positions along a row whose frame position is (nx + a i, ny + b i) / (nz + c i),
     * i = 0 .. n - 1: the largest power of two up to 32 whose linear interpolation stays within
     * MAX_INTERPOLATION_ERROR_PX; 1 (every position exact) when the denominator gets near zero. With
     * x(i) = N / D, x' = K / D^2 and x'' = -2 c K / D^3 (K = a nz - c nx constant along the row), and a chord over
     * L pixels departs from the curve by at most L^2 / 8 max |x''| (the interpolation error of a linear fit).
     */
    static int span(double nx, double ny, double nz, double a, double b, double c, int n) {
        double d0 = nz, d1 = nz + c * (n - 1);
        if (!(d0 * d1 > 0)) return 1;
        double dMin = Math.min(Math.abs(d0), Math.abs(d1));
        double kx = a * nz - c * nx, ky = b * nz - c * ny;
        double curvature = 2 * Math.abs(c) * Math.max(Math.abs(kx), Math.abs(ky)) / (dMin * dMin * dMin);
        if (!Double.isFinite(curvature)) return 1;
        int span = 32;
        while (span > 1 && span * (double) span / 8 * curvature > MAX_INTERPOLATION_ERROR_PX) span >>= 1;
        return span;
    }
}
