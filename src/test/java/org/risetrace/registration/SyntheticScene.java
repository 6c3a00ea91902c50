package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.board.Outline;
import org.risetrace.board.Part;
import org.risetrace.frame.Decoding;
import org.risetrace.frame.Frame;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * Test scenes made by code: a board in millimetres with parts of differing emissivity (so an unpowered board still
 * shows contrast, as thermal images of boards do), copper traces and a warm background, rendered through a known
 * board-to-frame homography with 2 x 2 supersampling per pixel, optional heating blob and Gaussian sensor noise.
 */
final class SyntheticScene {
    final double widthMm, heightMm;
    final List<double[]> rects = new ArrayList<>(); // x0, y0, x1, y1, deltaK
    final List<Part> parts = new ArrayList<>();
    final long seed;

    SyntheticScene(long seed) {
        this.seed = seed;
        Random r = new Random(seed);
        widthMm = 80;
        heightMm = 60;
        for (int i = 0; i < 22; i++) {
            double w = 2 + r.nextDouble() * 10, h = 2 + r.nextDouble() * 8;
            double x = 2 + r.nextDouble() * (widthMm - w - 4), y = 2 + r.nextDouble() * (heightMm - h - 4);
            double d = (r.nextBoolean() ? 1 : -1) * (0.4 + r.nextDouble() * 1.6);
            rects.add(new double[]{x, y, x + w, y + h, d});
            parts.add(new Part("U" + (i + 1), "ic", null, x + w / 2, y + h / 2, w, h, null));
        }
        for (int i = 0; i < 10; i++) { // traces
            boolean horizontal = r.nextBoolean();
            double a = 3 + r.nextDouble() * ((horizontal ? heightMm : widthMm) - 6);
            double t = 0.5 + r.nextDouble();
            double d = -0.5 - r.nextDouble() * 0.5;
            if (horizontal) rects.add(new double[]{1, a, widthMm - 1, a + t, d});
            else rects.add(new double[]{a, 1, a + t, heightMm - 1, d});
        }
    }

    /** Apparent temperature at board point (x, y) mm; outside the board a smooth background. */
    double valueAt(double x, double y, double heatK, double heatX, double heatY) {
        double inside = edge(x) * edge(widthMm - x) * edge(y) * edge(heightMm - y);
        double board = 25.0 + 0.3 * Math.sin(x * 0.35) * Math.cos(y * 0.27);
        for (double[] q : rects) {
            if (x < q[0] - 1.5 || x > q[2] + 1.5 || y < q[1] - 1.5 || y > q[3] + 1.5) continue;
            board += q[4] * edge(x - q[0]) * edge(q[2] - x) * edge(y - q[1]) * edge(q[3] - y);
        }
        if (heatK != 0) {
            double dx = x - heatX, dy = y - heatY;
            board += heatK * Math.exp(-(dx * dx + dy * dy) / (2 * 3.0 * 3.0));
        }
        double background = 22.0 + 0.02 * x + 0.4 * Math.sin(y * 0.1 + x * 0.05);
        return background + inside * (board - background);
    }

    /** Smooth step over about 0.3 mm (a slightly soft edge, as optics and heat spreading give). */
    private static double edge(double d) {
        if (d > 1.5) return 1;
        if (d < -1.5) return 0;
        return 1 / (1 + Math.exp(-d / 0.12));
    }

    Frame render(int w, int h, Homography boardToFrame, double heatK, double noiseK, long noiseSeed, String name) {
        Homography frameToBoard = boardToFrame.inverse();
        float[] px = new float[w * h];
        Random r = new Random(noiseSeed);
        double heatX = rects.get(0)[0] + 3, heatY = rects.get(0)[1] + 3;
        for (int y = 0; y < h; y++)
            for (int x = 0; x < w; x++) {
                double s = 0;
                for (int k = 0; k < 4; k++) {
                    double[] b = frameToBoard.apply(x - 0.25 + 0.5 * (k & 1), y - 0.25 + 0.5 * (k >> 1));
                    s += valueAt(b[0], b[1], heatK, heatX, heatY);
                }
                px[y * w + x] = (float) (s / 4 + noiseK * r.nextGaussian());
            }
        return new Frame(w, h, px, 0, null, Path.of(name), "", new Decoding("synthetic", 32, "f32-celsius", ""));
    }

    /** Reference mapping for a w x h frame: the board fills about 70 % of the width, slightly perspective. */
    static double[][] referenceCorners(int w, int h) {
        return new double[][]{{0.16 * w, 0.17 * h}, {0.84 * w, 0.15 * h}, {0.83 * w, 0.84 * h}, {0.17 * w, 0.82 * h}};
    }

    Board board(String referenceName, double[][] corners) {
        return new Board("synthetic", new double[]{widthMm, heightMm},
                new Outline(referenceName, corners, null), parts, null);
    }

    /** Moves the reference corners by a similarity about the frame centre plus a shift (hand-held motion). */
    static double[][] moved(double[][] c, int w, int h, double rotDeg, double scale, double tx, double ty) {
        double a = Math.toRadians(rotDeg), ca = scale * Math.cos(a), sa = scale * Math.sin(a);
        double cx = (w - 1) / 2.0, cy = (h - 1) / 2.0;
        double[][] o = new double[4][];
        for (int i = 0; i < 4; i++) {
            double dx = c[i][0] - cx, dy = c[i][1] - cy;
            o[i] = new double[]{cx + ca * dx - sa * dy + tx, cy + sa * dx + ca * dy + ty};
        }
        return o;
    }

    static double cornerError(double[][] a, double[][] b) {
        double s = 0;
        for (int i = 0; i < 4; i++) s += Math.hypot(a[i][0] - b[i][0], a[i][1] - b[i][1]);
        return s / 4;
    }
}
