package org.risetrace.report;

/**
 * CIELAB (CIE 15:2004, D65 white) to sRGB (IEC 61966-2-1) for building the colour maps. Only the maps use it.
 */
final class Cielab {
    // D65 reference white, CIE 1931 2-degree observer (IEC 61966-2-1 white point)
    private static final double XN = 0.95047, YN = 1.0, ZN = 1.08883;

    private Cielab() { }

    /** Linear sRGB of a CIELAB colour, possibly outside [0, 1]. */
    static double[] toLinearSrgb(double l, double a, double b) {
        double fy = (l + 16) / 116, fx = fy + a / 500, fz = fy - b / 200;
        double x = XN * finv(fx), y = YN * finv(fy), z = ZN * finv(fz);
        // XYZ -> linear sRGB, IEC 61966-2-1 matrix
        return new double[]{
                3.2406 * x - 1.5372 * y - 0.4986 * z,
                -0.9689 * x + 1.8758 * y + 0.0415 * z,
                0.0557 * x - 0.2040 * y + 1.0570 * z};
    }

    private static double finv(double f) {
        double d = 6.0 / 29;
        return f > d ? f * f * f : 3 * d * d * (f - 4.0 / 29);
    }

    private static boolean inGamut(double[] rgb) {
        for (double c : rgb) if (c < -1e-9 || c > 1 + 1e-9) return false;
        return true;
    }

    /** The colour itself when sRGB can show it, else the same L* and hue with the largest chroma that fits. */
    static double[] intoGamut(double l, double a, double b) {
        if (inGamut(toLinearSrgb(l, a, b))) return new double[]{l, a, b};
        double lo = 0, hi = 1;
        for (int i = 0; i < 40; i++) {
            double mid = (lo + hi) / 2;
            if (inGamut(toLinearSrgb(l, a * mid, b * mid))) lo = mid; else hi = mid;
        }
        return new double[]{l, a * lo, b * lo};
    }

    /** 0xRRGGBB of a colour inside the gamut (see {@link #intoGamut}). */
    static int toSrgb(double[] lab) {
        double[] rgb = toLinearSrgb(lab[0], lab[1], lab[2]);
        int r = encode(rgb[0]), g = encode(rgb[1]), bl = encode(rgb[2]);
        return (r << 16) | (g << 8) | bl;
    }

    /**
     * CIE94 colour difference (CIE 116-1995, graphic-arts weights kL = 1, K1 = 0.045, K2 = 0.015) between two
     * nearby colours, with the chroma and hue terms scaled by {@code w} (1 = CIE94); the length element when
     * spacing a map's colours evenly.
     */
    static double deltaE94(double[] p, double[] q, double w) {
        double c1 = Math.hypot(p[1], p[2]), c2 = Math.hypot(q[1], q[2]);
        double dl = p[0] - q[0], dc = c1 - c2;
        double da = p[1] - q[1], db = p[2] - q[2];
        double dh2 = Math.max(0, da * da + db * db - dc * dc);
        double sc = 1 + 0.045 * c1, sh = 1 + 0.015 * c1;
        return Math.sqrt(dl * dl + w * ((dc / sc) * (dc / sc) + dh2 / (sh * sh)));
    }

    /** IEC 61966-2-1 sRGB transfer function, linear [0, 1] to an 8-bit code. */
    private static int encode(double c) {
        c = Math.max(0, Math.min(1, c));
        double v = c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
        return (int) Math.round(v * 255);
    }
}
