package org.risetrace.sim;

/**
 * A plane projective mapping (homography), row-major 3 x 3: (x', y', w') = H (x, y, 1), point = (x'/w', y'/w').
 * The simulator's own small copy, so that the simulator does not depend on the registration stage; truth.json
 * stores its rows, which {@code org.risetrace.registration.Homography.fromRows} reads.
 */
public final class PlaneMapping {
    private final double[] h;

    public PlaneMapping(double[] rowMajor9) {
        if (rowMajor9.length != 9) throw new IllegalArgumentException("homography needs 9 values");
        this.h = rowMajor9.clone();
    }

    public static PlaneMapping fromRows(double[][] rows) {
        double[] v = new double[9];
        for (int r = 0; r < 3; r++) for (int c = 0; c < 3; c++) v[r * 3 + c] = rows[r][c];
        return new PlaneMapping(v);
    }

    public static PlaneMapping identity() {
        return new PlaneMapping(new double[]{1, 0, 0, 0, 1, 0, 0, 0, 1});
    }

    public double[][] rows() {
        return new double[][]{{h[0], h[1], h[2]}, {h[3], h[4], h[5]}, {h[6], h[7], h[8]}};
    }

    public double get(int row, int col) { return h[row * 3 + col]; }

    public double[] values() { return h.clone(); }

    /** Maps (x, y); returns {x', y'}. */
    public double[] apply(double x, double y) {
        double w = h[6] * x + h[7] * y + h[8];
        return new double[]{(h[0] * x + h[1] * y + h[2]) / w, (h[3] * x + h[4] * y + h[5]) / w};
    }

    /** this after other: p -> this(other(p)). */
    public PlaneMapping compose(PlaneMapping other) {
        return new PlaneMapping(CameraModel.multiply(h, other.h));
    }

    /** The inverse by the adjugate (cofactor) matrix. */
    public PlaneMapping inverse() {
        double a = h[0], b = h[1], c = h[2], d = h[3], e = h[4], f = h[5], g = h[6], hh = h[7], i = h[8];
        double ca = e * i - f * hh, cb = -(d * i - f * g), cc = d * hh - e * g;
        double det = a * ca + b * cb + c * cc;
        if (det == 0 || !Double.isFinite(det)) throw new ArithmeticException("singular homography");
        return new PlaneMapping(new double[]{
                ca / det, -(b * i - c * hh) / det, (b * f - c * e) / det,
                cb / det, (a * i - c * g) / det, -(a * f - c * d) / det,
                cc / det, -(a * hh - b * g) / det, (a * e - b * d) / det});
    }

    /** Scaled so that h[8] = 1. */
    public PlaneMapping normalized() {
        double s = Math.abs(h[8]) > 1e-300 ? h[8] : 1.0;
        double[] v = new double[9];
        for (int k = 0; k < 9; k++) v[k] = h[k] / s;
        return new PlaneMapping(v);
    }
}
