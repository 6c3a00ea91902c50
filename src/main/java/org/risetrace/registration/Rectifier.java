package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

/**
 * Resamples frames into board space: board pixel (i, j) covers board point ((i + 0.5) / pxPerMm,
 * (j + 0.5) / pxPerMm) mm, which the board-to-frame homography sends to frame pixel coordinates (pixel centres at
 * integers), where the frame is sampled bilinearly. A board pixel is valid when all four neighbours exist and hold
 * readings. The homography's numerators and denominator are linear along a row, so each row is stepped by
 * additions. Instances are immutable and thread-safe.
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

    /** Into caller-owned buffers (length width() * height()), for loops over many frames. */
    public void rectify(float[] src, int w, int h, Homography boardToFrame, float[] out, boolean[] valid) {
        double[] m = boardToFrame.values();
        double inv = 1 / pxPerMm;
        // board pixel (i, j) -> board mm ((i + 0.5) inv, (j + 0.5) inv) -> frame px: fold the scale into H
        double a0 = m[0] * inv, a1 = m[1] * inv, a2 = m[2] + 0.5 * inv * (m[0] + m[1]);
        double b0 = m[3] * inv, b1 = m[4] * inv, b2 = m[5] + 0.5 * inv * (m[3] + m[4]);
        double c0 = m[6] * inv, c1 = m[7] * inv, c2 = m[8] + 0.5 * inv * (m[6] + m[7]);
        int wm = w - 1, hm = h - 1;
        for (int j = 0; j < height; j++) {
            double nx = a1 * j + a2, ny = b1 * j + b2, nz = c1 * j + c2;
            int row = j * width;
            for (int i = 0; i < width; i++, nx += a0, ny += b0, nz += c0) {
                double x = nx / nz, y = ny / nz;
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
                int k = y0 * w + x0;
                int kx = wm > 0 ? 1 : 0, ky = hm > 0 ? w : 0;
                float p00 = src[k], p10 = src[k + kx], p01 = src[k + ky], p11 = src[k + ky + kx];
                float top = p00 + ax * (p10 - p00), bot = p01 + ax * (p11 - p01);
                float v = top + ay * (bot - top);
                out[o] = v;
                valid[o] = v == v;
            }
        }
    }
}
