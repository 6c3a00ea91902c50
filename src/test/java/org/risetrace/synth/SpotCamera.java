package org.risetrace.synth;

import org.opencv.core.CvType;
import org.opencv.core.Mat;
import org.opencv.core.MatOfPoint2f;
import org.opencv.core.Point;
import org.opencv.imgproc.Imgproc;

import java.util.SplittableRandom;

/**
 * Where the board lies in each frame, as board-millimetre-to-frame-pixel homographies (pixel centres at integer
 * coordinates, OpenCV's convention). The series pose is given by where the four board corners land: a similarity
 * (the board covering 55-68 % of the frame, turned up to 8 degrees, off centre by up to 4 %) whose corners are then
 * pushed outwards on one side and inwards on the other by 2-6 % (a keystone, the look of a tilted camera), turned
 * into a homography by OpenCV's {@code getPerspectiveTransform}. Per frame a motion in the image plane follows:
 * a stand drifts as a random walk of fixed step length with a wandering direction plus a slow steady turn; a hand
 * holds each frame at an independent rotation, zoom, shift and small perspective change.
 */
final class SpotCamera {
    private SpotCamera() {
    }

    static Mat points(double[][] p) {
        Point[] q = new Point[p.length];
        for (int i = 0; i < p.length; i++) q[i] = new Point(p[i][0], p[i][1]);
        return new MatOfPoint2f(q);
    }

    /** OpenCV's four-point homography, row-major, scaled to h22 = 1. */
    static double[] fourPoint(double[][] from, double[][] to) {
        Mat m = Imgproc.getPerspectiveTransform(points(from), points(to), 0);
        Mat d = new Mat();
        m.convertTo(d, CvType.CV_64F);
        double[] h = new double[9];
        d.get(0, 0, h);
        return normalise(h);
    }

    static double[] normalise(double[] h) {
        double[] out = new double[9];
        for (int i = 0; i < 9; i++) out[i] = h[i] / h[8];
        return out;
    }

    static double[] multiply(double[] a, double[] b) {
        double[] c = new double[9];
        for (int r = 0; r < 3; r++)
            for (int k = 0; k < 3; k++) {
                double s = 0;
                for (int j = 0; j < 3; j++) s += a[r * 3 + j] * b[j * 3 + k];
                c[r * 3 + k] = s;
            }
        return c;
    }

    static double[] apply(double[] h, double x, double y) {
        double w = h[6] * x + h[7] * y + h[8];
        return new double[]{(h[0] * x + h[1] * y + h[2]) / w, (h[3] * x + h[4] * y + h[5]) / w};
    }

    /** The series' base pose: board mm to frame px. */
    static double[] basePose(SplittableRandom rnd, int width, int height, double wMm, double hMm) {
        double cover = 0.55 + 0.13 * rnd.nextDouble();
        double scale = cover * Math.min(width / wMm, height / hMm);
        double angle = Math.toRadians(8 * (2 * rnd.nextDouble() - 1));
        double cx = (width - 1) / 2.0 + 0.04 * width * (2 * rnd.nextDouble() - 1);
        double cy = (height - 1) / 2.0 + 0.04 * height * (2 * rnd.nextDouble() - 1);
        double key = 0.02 + 0.04 * rnd.nextDouble(), dir = 2 * Math.PI * rnd.nextDouble();
        double ux = Math.cos(dir), uy = Math.sin(dir);
        double[][] board = {{0, 0}, {wMm, 0}, {wMm, hMm}, {0, hMm}};
        double[][] frame = new double[4][];
        double half = 0.5 * Math.hypot(wMm, hMm) * scale;
        for (int i = 0; i < 4; i++) {
            double bx = (board[i][0] - wMm / 2) * scale, by = (board[i][1] - hMm / 2) * scale;
            double qx = Math.cos(angle) * bx - Math.sin(angle) * by, qy = Math.sin(angle) * bx + Math.cos(angle) * by;
            double f = 1 + key * (qx * ux + qy * uy) / half;
            frame[i] = new double[]{cx + f * qx, cy + f * qy};
        }
        return fourPoint(board, frame);
    }

    /** Per-frame image-plane motions (frame px to frame px). */
    static double[][] motions(SplittableRandom rnd, SpotSeries.Motion m, int frames, int width, int height) {
        double[][] out = new double[frames][];
        double cx = (width - 1) / 2.0, cy = (height - 1) / 2.0;
        if (m.kind() == SpotSeries.MotionKind.STAND) {
            double x = 0, y = 0, heading = 2 * Math.PI * rnd.nextDouble();
            // a steady turn that moves a point at the frame's half width by at most the drift per frame
            double turn = m.driftPxPerFrame() / (0.5 * width) * (2 * rnd.nextDouble() - 1);
            for (int k = 0; k < frames; k++) {
                if (k > 0) {
                    heading += 0.6 * (2 * rnd.nextDouble() - 1);
                    double step = m.driftPxPerFrame() * (0.5 + rnd.nextDouble());
                    x += step * Math.cos(heading);
                    y += step * Math.sin(heading);
                }
                out[k] = similarity(cx, cy, turn * k, 1, x, y);
            }
            return out;
        }
        for (int k = 0; k < frames; k++) {
            double angle = Math.toRadians(m.rotationDeg()) * (2 * rnd.nextDouble() - 1);
            double zoom = 1 + m.zoom() * (2 * rnd.nextDouble() - 1);
            double tx = m.shiftFraction() * width * (2 * rnd.nextDouble() - 1);
            double ty = m.shiftFraction() * height * (2 * rnd.nextDouble() - 1);
            double[][] corners = {{0, 0}, {width - 1, 0}, {width - 1, height - 1}, {0, height - 1}};
            double[][] moved = new double[4][];
            for (int i = 0; i < 4; i++)
                moved[i] = new double[]{corners[i][0] + m.perspective() * width * (2 * rnd.nextDouble() - 1),
                        corners[i][1] + m.perspective() * height * (2 * rnd.nextDouble() - 1)};
            double[] persp = fourPoint(corners, moved);
            out[k] = normalise(multiply(similarity(cx, cy, angle, zoom, tx, ty), persp));
        }
        return out;
    }

    /** Rotation by {@code angle} and zoom about (cx, cy), then a shift. */
    static double[] similarity(double cx, double cy, double angle, double zoom, double tx, double ty) {
        double c = zoom * Math.cos(angle), s = zoom * Math.sin(angle);
        return new double[]{c, -s, cx + tx - c * cx + s * cy, s, c, cy + ty - s * cx - c * cy, 0, 0, 1};
    }
}
