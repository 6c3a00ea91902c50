package org.risetrace.registration;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;

import java.util.Arrays;

/**
 * A plane projective mapping, row-major 3 x 3: (x', y', w') = H (x, y, 1), point = (x'/w', y'/w').
 * In results it maps board millimetres to frame pixels.
 */
public final class Homography {
    private final double[] h;

    public Homography(double[] rowMajor9) {
        if (rowMajor9.length != 9) throw new IllegalArgumentException("homography needs 9 values");
        this.h = rowMajor9.clone();
    }

    @JsonCreator
    public static Homography fromRows(double[][] rows) {
        double[] v = new double[9];
        for (int r = 0; r < 3; r++) for (int c = 0; c < 3; c++) v[r * 3 + c] = rows[r][c];
        return new Homography(v);
    }

    public static Homography identity() {
        return new Homography(new double[]{1, 0, 0, 0, 1, 0, 0, 0, 1});
    }

    @JsonValue
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
    public Homography compose(Homography other) {
        double[] a = h, b = other.h, c = new double[9];
        for (int r = 0; r < 3; r++)
            for (int col = 0; col < 3; col++)
                c[r * 3 + col] = a[r * 3] * b[col] + a[r * 3 + 1] * b[3 + col] + a[r * 3 + 2] * b[6 + col];
        return new Homography(c);
    }

    public Homography inverse() {
        double a = h[0], b = h[1], c = h[2], d = h[3], e = h[4], f = h[5], g = h[6], hh = h[7], i = h[8];
        double A = e * i - f * hh, B = -(d * i - f * g), C = d * hh - e * g;
        double det = a * A + b * B + c * C;
        if (det == 0 || !Double.isFinite(det)) throw new ArithmeticException("singular homography");
        double[] inv = {
                A / det, -(b * i - c * hh) / det, (b * f - c * e) / det,
                B / det, (a * i - c * g) / det, -(a * f - c * d) / det,
                C / det, -(a * hh - b * g) / det, (a * e - b * d) / det};
        return new Homography(inv);
    }

    /** Scaled so that h[8] = 1 (when possible), for comparison and printing. */
    public Homography normalized() {
        double s = Math.abs(h[8]) > 1e-300 ? h[8] : 1.0;
        double[] v = new double[9];
        for (int k = 0; k < 9; k++) v[k] = h[k] / s;
        return new Homography(v);
    }

    @Override
    public String toString() { return "Homography" + Arrays.toString(h); }
}
