package org.risetrace.report;

import org.junit.jupiter.api.Test;

import java.util.Locale;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The colour maps against colour science computed here, independently of the code that built them:
 * sRGB decoding per IEC 61966-2-1, relative luminance from the sRGB (ITU-R BT.709) primaries, CIE 1976 L* per
 * CIE 15:2004, colour-vision deficiency per Machado, Oliveira and Fernandes (2009), greyscale luma per ITU-R BT.601;
 * CIELAB cross-checked with OpenCV's conversion, CIE94 from hue angles (not the identity the map builder uses).
 */
class ColourMapsTest {
    /** Samples along each map: 16 equal steps, as a colour scale legend is read. */
    private static final int STEPS = 16;

    // IEC 61966-2-1 sRGB electro-optical transfer function (decode 8-bit code to linear)
    private static double linear(int code) {
        double c = code / 255.0;
        return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
    }

    private static double[] linearRgb(int rgb) {
        return new double[]{linear(rgb >> 16 & 0xff), linear(rgb >> 8 & 0xff), linear(rgb & 0xff)};
    }

    /** CIE 1976 L* (CIE 15:2004) of linear sRGB; Y from the IEC 61966-2-1 matrix row (0.2126, 0.7152, 0.0722). */
    private static double lightness(double[] lin) {
        double y = 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2];
        double d = 6.0 / 29;
        double f = y > d * d * d ? Math.cbrt(y) : y / (3 * d * d) + 4.0 / 29;
        return 116 * f - 16;
    }

    private static double[] apply(double[][] m, double[] v) {
        double[] r = new double[3];
        for (int i = 0; i < 3; i++) {
            r[i] = Math.max(0, Math.min(1, m[i][0] * v[0] + m[i][1] * v[1] + m[i][2] * v[2]));
        }
        return r;
    }

    // Machado, Oliveira & Fernandes (2009), "A Physiologically-based Model for Simulation of Color Vision
    // Deficiency", IEEE TVCG 15(6), matrices for severity 1.0, applied to linear RGB. Protanopia and deuteranopia
    // checked against a published copy of the authors' table; tritanopia from memory.
    private static final double[][] PROTANOPIA = {
            {0.152286, 1.052583, -0.204868}, {0.114503, 0.786281, 0.099216}, {-0.003882, -0.048116, 1.051998}};
    private static final double[][] DEUTERANOPIA = {
            {0.367322, 0.860646, -0.227968}, {0.280085, 0.672501, 0.047413}, {-0.011820, 0.042940, 0.968881}};
    private static final double[][] TRITANOPIA = {
            {1.255528, -0.076749, -0.178779}, {-0.078411, 0.930809, 0.147602}, {0.004733, 0.691367, 0.303900}};

    private static double[] lightnessSteps(ColourMaps map, double[][] cvd) {
        double[] steps = new double[STEPS];
        double prev = Double.NaN;
        for (int k = 0; k <= STEPS; k++) {
            double[] lin = linearRgb(map.rgb(k / (double) STEPS));
            double l = lightness(cvd == null ? lin : apply(cvd, lin));
            if (k > 0) steps[k - 1] = l - prev;
            prev = l;
        }
        return steps;
    }

    private static double min(double[] a) { double m = Double.POSITIVE_INFINITY; for (double v : a) m = Math.min(m, v); return m; }

    private static double max(double[] a) { double m = Double.NEGATIVE_INFINITY; for (double v : a) m = Math.max(m, v); return m; }

    @Test
    void lightnessRisesInNearlyEqualSteps() {
        for (ColourMaps map : ColourMaps.values()) {
            double[] steps = lightnessSteps(map, null);
            System.out.printf(Locale.ROOT, "%s L* steps min %.3f max %.3f%n", map.word(), min(steps), max(steps));
            assertTrue(min(steps) > 0, map + " L* must rise at every step");
            // the maps are spaced for even total colour difference (chroma and hue at half weight), which lets
            // L* steps vary by up to ~1.28x (measured); 8-bit rounding adds < 0.5 L* on ~5 L* steps (one sRGB code
            // step is < 1 L* above L* 5, IEC 61966-2-1 + CIE 15): bound 1.4, still "roughly linear"
            assertTrue(max(steps) / min(steps) < 1.4, map + " L* step ratio " + max(steps) / min(steps));
        }
    }

    /** CIELAB of an 8-bit sRGB colour: IEC 61966-2-1 decoding and matrix, CIE 15:2004 L*a*b* with D65 white. */
    private static double[] lab(int rgb) {
        double[] c = linearRgb(rgb);
        double x = 0.4124 * c[0] + 0.3576 * c[1] + 0.1805 * c[2];
        double y = 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
        double z = 0.0193 * c[0] + 0.1192 * c[1] + 0.9505 * c[2];
        double d = 6.0 / 29;
        java.util.function.DoubleUnaryOperator f = t -> t > d * d * d ? Math.cbrt(t) : t / (3 * d * d) + 4.0 / 29;
        double fx = f.applyAsDouble(x / 0.95047), fy = f.applyAsDouble(y), fz = f.applyAsDouble(z / 1.08883);
        return new double[]{116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)};
    }

    /**
     * CIE94 colour difference, CIE 116-1995, graphic-arts weights (kL = kC = kH = 1, K1 = 0.045, K2 = 0.015), with the
     * hue difference from the hue angles, Delta H* = 2 sqrt(C1 C2) sin(Delta h / 2) (CIE 15:2004), not from the
     * identity Delta H^2 = Delta a^2 + Delta b^2 - Delta C^2 that the code building the maps uses.
     */
    private static double deltaE94(double[] p, double[] q) {
        double c1 = Math.hypot(p[1], p[2]), c2 = Math.hypot(q[1], q[2]);
        double dh = Math.atan2(p[2], p[1]) - Math.atan2(q[2], q[1]);
        double bigDh = 2 * Math.sqrt(c1 * c2) * Math.sin(dh / 2);
        double sc = 1 + 0.045 * c1, sh = 1 + 0.015 * c1;
        return Math.sqrt(Math.pow(p[0] - q[0], 2) + Math.pow((c1 - c2) / sc, 2) + Math.pow(bigDh / sh, 2));
    }

    @Test
    void labOfEveryTableColourAgreesWithOpenCv() {
        // reference: OpenCV 4.9 (org.openpnp:opencv) cvtColor RGB2Lab on float sRGB, which decodes the sRGB curve
        // and uses D65; its white point and matrix differ from IEC 61966-2-1's in the fourth digit, it interpolates
        // the curve and its float a*, b* come in steps of 1/64: measured worst difference 0.26 Delta E*ab over both
        // tables. Bound 0.4, far under the 1-unit steps the checks here rely on (a missing sRGB decoding or a wrong
        // white point moves colours by several units)
        nu.pattern.OpenCV.loadLocally();
        for (ColourMaps map : ColourMaps.values()) {
            int[] table = map.table();
            org.opencv.core.Mat rgb = new org.opencv.core.Mat(1, table.length, org.opencv.core.CvType.CV_32FC3);
            float[] px = new float[3 * table.length];
            for (int i = 0; i < table.length; i++) {
                px[3 * i] = (table[i] >> 16 & 0xff) / 255f;
                px[3 * i + 1] = (table[i] >> 8 & 0xff) / 255f;
                px[3 * i + 2] = (table[i] & 0xff) / 255f;
            }
            rgb.put(0, 0, px);
            org.opencv.core.Mat out = new org.opencv.core.Mat();
            org.opencv.imgproc.Imgproc.cvtColor(rgb, out, org.opencv.imgproc.Imgproc.COLOR_RGB2Lab);
            float[] ref = new float[3 * table.length];
            out.get(0, 0, ref);
            for (int i = 0; i < table.length; i++) {
                double[] ours = lab(table[i]);
                double de = Math.sqrt(Math.pow(ours[0] - ref[3 * i], 2) + Math.pow(ours[1] - ref[3 * i + 1], 2)
                        + Math.pow(ours[2] - ref[3 * i + 2], 2));
                assertTrue(de < 0.4, map + " entry " + i + ": " + java.util.Arrays.toString(ours) + " vs OpenCV "
                        + ref[3 * i] + ", " + ref[3 * i + 1] + ", " + ref[3 * i + 2]);
            }
        }
        // and the sRGB primaries' published CIELAB (D65): red 53.24, 80.09, 67.20; blue 32.30, 79.19, -107.86
        // (from memory; the 4-digit IEC matrix used here moves them by up to 0.02)
        assertArrayEquals(new double[]{53.24, 80.09, 67.20}, lab(0xff0000), 0.05);
        assertArrayEquals(new double[]{32.30, 79.19, -107.86}, lab(0x0000ff), 0.05);
    }

    @Test
    void cie94ReducesToItsClosedForms() {
        // greys have no chroma: Delta E94 is the lightness difference; two colours of equal L* and chroma 30 a
        // quarter turn apart: Delta H* = 2 x 30 x sin(45 deg) = 42.43, divided by S_H = 1 + 0.015 x 30 = 1.45 gives
        // 29.26 (CIE 116-1995, hand arithmetic)
        assertEquals(12.5, deltaE94(new double[]{62.5, 0, 0}, new double[]{50, 0, 0}), 1e-12);
        assertEquals(29.26, deltaE94(new double[]{50, 30, 0}, new double[]{50, 0, 30}), 0.01);
        // equal hue, chroma 40 against 30: Delta C / S_C = 10 / (1 + 0.045 x 40) = 3.571
        assertEquals(3.571, deltaE94(new double[]{50, 40, 0}, new double[]{50, 30, 0}), 0.001);
    }

    @Test
    void equalStepsLookEquallyLarge() {
        for (ColourMaps map : ColourMaps.values()) {
            double lo = Double.POSITIVE_INFINITY, hi = 0;
            for (int k = 1; k <= STEPS; k++) {
                double e = deltaE94(lab(map.rgb((k - 1) / (double) STEPS)), lab(map.rgb(k / (double) STEPS)));
                lo = Math.min(lo, e);
                hi = Math.max(hi, e);
            }
            System.out.printf(Locale.ROOT, "%s CIE94 steps min %.2f max %.2f%n", map.word(), lo, hi);
            // a map spaced by lightness alone varies ~1.45x here (measured); ours must stay within 1.3x
            assertTrue(hi / lo < 1.3, map + " CIE94 step ratio " + hi / lo);
            // and every 1/16 step is clearly visible: several CIE94 units (1 unit ~ one JND, common practice)
            assertTrue(lo > 3, map + " smallest step " + lo);
        }
    }

    @Test
    void lightnessNeverFallsAcrossTheWholeTable() {
        for (ColourMaps map : ColourMaps.values()) {
            int[] table = map.table();
            assertEquals(ColourMaps.SIZE, table.length);
            double prev = -1;
            for (int rgb : table) {
                double l = lightness(linearRgb(rgb));
                // 256 entries over ~85 L*: 0.33 L* each, so rounding may tie two neighbours but not reverse them
                // by more than a rounding error (half an sRGB code step, < 0.3 L* here)
                assertTrue(l > prev - 0.3, map + " L* falls from " + prev + " to " + l);
                prev = Math.max(prev, l);
            }
            double first = lightness(linearRgb(table[0])), last = lightness(linearRgb(table[ColourMaps.SIZE - 1]));
            // a sequential map should span most of the lightness range (common practice: > 70 L* units)
            assertTrue(last - first > 70, map + " spans " + (last - first) + " L*");
        }
    }

    @Test
    void orderStaysReadableUnderRedGreenAndBlueYellowDeficiency() {
        for (ColourMaps map : ColourMaps.values()) {
            for (double[][] cvd : new double[][][]{PROTANOPIA, DEUTERANOPIA, TRITANOPIA}) {
                double[] steps = lightnessSteps(map, cvd);
                System.out.printf(Locale.ROOT, "%s simulated L* steps min %.3f max %.3f%n", map.word(), min(steps), max(steps));
                // every step stays a visible lightness step: > 1 L*, about one just-noticeable difference
                // (CIE 1976 delta E of 1 ~ one JND, common practice)
                assertTrue(min(steps) > 1.0, map + " simulated deficiency flattens a step to " + min(steps));
            }
        }
    }

    @Test
    void greyscalePrintKeepsTheOrder() {
        for (ColourMaps map : ColourMaps.values()) {
            double prev = -1;
            for (int k = 0; k <= STEPS; k++) {
                int rgb = map.rgb(k / (double) STEPS);
                // ITU-R BT.601 luma on the encoded values, the usual desaturation of printers and viewers
                double luma = 0.299 * (rgb >> 16 & 0xff) + 0.587 * (rgb >> 8 & 0xff) + 0.114 * (rgb & 0xff);
                assertTrue(luma > prev + 2, map + " grey level " + luma + " after " + prev);
                prev = luma;
            }
        }
    }

    @Test
    void namesAreOurOwn() {
        // map names used by common general-purpose plotting libraries (from memory)
        Set<String> taken = Set.of("viridis", "magma", "inferno", "plasma", "cividis", "turbo", "jet", "hot", "cool",
                "rainbow", "grey", "gray", "bone", "copper", "spring", "summer",
                "autumn", "winter", "parula", "thermal", "heat", "fire", "ocean", "ice", "deep", "haline", "rocket",
                "mako", "flare", "crest", "batlow", "hawaii", "oslo");
        for (ColourMaps map : ColourMaps.values()) {
            assertFalse(taken.contains(map.word()), map.word());
            assertEquals(map.name().toLowerCase(Locale.ROOT), map.word());
        }
    }

    @Test
    void endsAndClampingFollowThePosition() {
        for (ColourMaps map : ColourMaps.values()) {
            assertEquals(map.rgb(0), map.rgb(-3));
            assertEquals(map.rgb(1), map.rgb(7));
            assertEquals(map.rgb(0), map.rgb(Double.NaN));
            assertEquals(String.format(Locale.ROOT, "#%06x", map.rgb(0.5)), map.css(0.5));
            assertTrue(lightness(linearRgb(map.rgb(1))) > lightness(linearRgb(map.rgb(0))) + 70);
        }
    }
}
