package org.risetrace.sim;


import org.risetrace.registration.Homography;
import java.util.SplittableRandom;

/**
 * The camera's geometry: a pinhole camera looking at the board plane gives a homography H = K [r1 r2 t] from board
 * millimetres to pixels (Hartley and Zisserman, Multiple View Geometry, plane-induced homography); per-frame motion
 * is an image-plane similarity about the image centre composed after it. Pixel centres sit at integer coordinates.
 */
public final class CameraModel {
    private CameraModel() {
    }

    /** The reference pose's homography, board mm to image px. */
    public static Homography basePose(Scenario.CameraSpec c, double boardWidthMm, double boardHeightMm) {
        double rot = Math.toRadians(c.rotationOrZero());
        double tilt = Math.toRadians(c.tiltOrZero());
        double axis = Math.toRadians(c.tiltAxisOrZero());
        // in-plane rotation about the optical axis
        double[] rz = {StrictMath.cos(rot), -StrictMath.sin(rot), 0, StrictMath.sin(rot), StrictMath.cos(rot), 0, 0, 0, 1};
        // tilt: rotation by 'tilt' about the unit axis (cos a, sin a, 0) (Rodrigues' formula)
        double ux = StrictMath.cos(axis), uy = StrictMath.sin(axis), ct = StrictMath.cos(tilt), st = StrictMath.sin(tilt);
        double[] rt = {
                ct + ux * ux * (1 - ct), ux * uy * (1 - ct), uy * st,
                uy * ux * (1 - ct), ct + uy * uy * (1 - ct), -ux * st,
                -uy * st, ux * st, ct};
        double[] r = multiply(rt, rz);
        double f = c.focalPx();
        double cx = (c.width() - 1) / 2.0 + c.offsetOrZero()[0];
        double cy = (c.height() - 1) / 2.0 + c.offsetOrZero()[1];
        double d = c.distanceMm();
        // [r1 r2 t] with t = (0, 0, d): board centre on the optical axis
        double[] m = {r[0], r[1], 0, r[3], r[4], 0, r[6], r[7], d};
        double[] k = {f, 0, cx, 0, f, cy, 0, 0, 1};
        double[] centre = {1, 0, -boardWidthMm / 2, 0, 1, -boardHeightMm / 2, 0, 0, 1};
        return new Homography(multiply(multiply(k, m), centre)).normalized();
    }

    /** The per-frame motion (image px to image px) of each frame; frame 0 is the reference (identity). */
    public static Homography[] motions(Scenario.CameraSpec c, int frames, long seed) {
        Homography[] out = new Homography[frames];
        SplittableRandom rnd = new SplittableRandom(seed ^ 0x6D6F74696F6EL);
        Scenario.Motion m = c.motionOrDefault();
        double cx = (c.width() - 1) / 2.0, cy = (c.height() - 1) / 2.0;
        double tx = 0, ty = 0;
        for (int k = 0; k < frames; k++) {
            if (k == 0) {
                out[k] = Homography.identity();
                continue;
            }
            double angle, scale;
            if (m.handheldKind()) {
                angle = Math.toRadians(m.rotationOrDefault()) * (2 * rnd.nextDouble() - 1);
                scale = 1 + m.scaleOrDefault() * (2 * rnd.nextDouble() - 1);
                tx = m.translationOrDefault() * c.width() * (2 * rnd.nextDouble() - 1);
                ty = m.translationOrDefault() * c.height() * (2 * rnd.nextDouble() - 1);
            } else {
                // a stand: slow mean-reverting random walk of the view, sub-pixel per frame
                angle = 0;
                scale = 1;
                tx = 0.98 * tx + m.driftOrDefault() * rnd.nextGaussian();
                ty = 0.98 * ty + m.driftOrDefault() * rnd.nextGaussian();
            }
            out[k] = similarityAbout(cx, cy, angle, scale, tx, ty);
        }
        return out;
    }

    /** p' = c + s R(angle) (p - c) + t. */
    public static Homography similarityAbout(double cx, double cy, double angle, double scale, double tx, double ty) {
        double a = scale * StrictMath.cos(angle), b = scale * StrictMath.sin(angle);
        return new Homography(new double[]{
                a, -b, cx - a * cx + b * cy + tx,
                b, a, cy - b * cx - a * cy + ty,
                0, 0, 1});
    }

    /** Board corners TL, TR, BR, BL mapped by h. */
    public static double[][] corners(Homography h, double wMm, double hMm) {
        return new double[][]{h.apply(0, 0), h.apply(wMm, 0), h.apply(wMm, hMm), h.apply(0, hMm)};
    }

    static double[] multiply(double[] a, double[] b) {
        double[] c = new double[9];
        for (int r = 0; r < 3; r++)
            for (int col = 0; col < 3; col++)
                c[r * 3 + col] = a[r * 3] * b[col] + a[r * 3 + 1] * b[3 + col] + a[r * 3 + 2] * b[6 + col];
        return c;
    }
}
