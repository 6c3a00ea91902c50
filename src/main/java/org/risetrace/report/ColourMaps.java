package org.risetrace.report;

import java.awt.Color;
import java.util.Locale;

/**
 * The report's own sequential colour maps. Each is built from a few control points in CIELAB (CIE 15:2004,
 * D65 white) with lightness L* running linearly from dark to light, so the order of values survives colour-vision
 * deficiency and greyscale printing: the eye reads lightness first. Between the control points a* and b* follow a
 * Catmull-Rom spline (smooth hue path, no kinks that would show as false contour lines); colours outside the sRGB
 * gamut lose chroma at constant L* and hue until they fit.
 *
 * <ul>
 *   <li>{@link #EMBER}: deep violet through wine red and orange to pale straw, for temperature and rise.</li>
 *   <li>{@link #TIDE}: deep navy through sea blue and teal to pale foam, for onset times.</li>
 * </ul>
 */
public enum ColourMaps {
    EMBER("ember", new double[][]{
            {8, 20, -30}, {30, 52, 2}, {52, 56, 48}, {74, 22, 74}, {96, -7, 30}}),
    TIDE("tide", new double[][]{
            {12, 12, -42}, {33, -4, -42}, {54, -30, -20}, {74, -38, 8}, {95, -10, 14}});

    /** Entries of the lookup table. */
    public static final int SIZE = 256;

    private final String word;
    private final int[] lut = new int[SIZE];

    /** Dense samples of the path before it is spaced evenly. */
    private static final int DENSE = 4096;
    /**
     * Weight of the chroma and hue terms in the spacing metric. 0 spaces by L* alone (L* steps even, total colour
     * difference steps vary by ~1.45x for these paths), 1 by full CIE94 (the reverse, L* steps vary by ~1.5x); 0.5
     * keeps both within ~1.3x (measured by ColourMapsTest).
     */
    private static final double CHROMA_WEIGHT = 0.5;

    ColourMaps(String word, double[][] labKnots) {
        this.word = word;
        int n = labKnots.length;
        // 1. the path: L* linear in the parameter, a*, b* on the spline, pulled into the sRGB gamut
        double[][] path = new double[DENSE][];
        for (int k = 0; k < DENSE; k++) {
            double t = k / (double) (DENSE - 1);
            double l = labKnots[0][0] + t * (labKnots[n - 1][0] - labKnots[0][0]);
            double s = t * (n - 1);
            int seg = Math.min((int) Math.floor(s), n - 2);
            double u = s - seg;
            path[k] = Cielab.intoGamut(l, catmullRom(labKnots, seg, u, 1), catmullRom(labKnots, seg, u, 2));
        }
        // 2. even colour difference per table step: resample the path at equal CIE94 arc length, so a step
        // anywhere on the scale looks about as large as a step elsewhere (the meaning of perceptually uniform);
        // chroma and hue count half, so lightness, which carries the order, stays close to even steps too
        double[] arc = new double[DENSE];
        for (int k = 1; k < DENSE; k++) arc[k] = arc[k - 1] + Cielab.deltaE94(path[k - 1], path[k], CHROMA_WEIGHT);
        int j = 0;
        for (int k = 0; k < SIZE; k++) {
            double target = arc[DENSE - 1] * k / (SIZE - 1);
            while (j < DENSE - 2 && arc[j + 1] < target) j++;
            double span = arc[j + 1] - arc[j];
            double w = span > 0 ? Math.max(0, Math.min(1, (target - arc[j]) / span)) : 0;
            double[] lab = new double[3];
            for (int c = 0; c < 3; c++) lab[c] = path[j][c] + w * (path[j + 1][c] - path[j][c]);
            lut[k] = Cielab.toSrgb(lab);
        }
    }

    private static double catmullRom(double[][] p, int seg, double u, int c) {
        int n = p.length;
        double p0 = p[Math.max(seg - 1, 0)][c], p1 = p[seg][c], p2 = p[seg + 1][c], p3 = p[Math.min(seg + 2, n - 1)][c];
        double u2 = u * u, u3 = u2 * u;
        return 0.5 * (2 * p1 + (-p0 + p2) * u + (2 * p0 - 5 * p1 + 4 * p2 - p3) * u2 + (-p0 + 3 * p1 - 3 * p2 + p3) * u3);
    }

    /** The map's plain name, as the report's captions use it. */
    public String word() { return word; }

    /** 0xRRGGBB at position t in [0, 1] (clamped); NaN gives the lowest colour. */
    public int rgb(double t) {
        if (Double.isNaN(t)) t = 0;
        int k = (int) Math.round(Math.max(0, Math.min(1, t)) * (SIZE - 1));
        return lut[k];
    }

    public Color colour(double t) { return new Color(rgb(t)); }

    /** A copy of the 256-entry table, 0xRRGGBB, dark to light. */
    public int[] table() { return lut.clone(); }

    /** CSS hex colour at t, e.g. "#2a0f3c". */
    public String css(double t) { return String.format(Locale.ROOT, "#%06x", rgb(t)); }
}
