package org.risetrace.registration;

/**
 * Coarse-to-fine pyramid of band-passed images. Level 0 is the frame smoothed by a Gaussian of sigma 1 px and
 * high-passed; level l+1 is the 2 x 2 block average of level l's smoothed image, high-passed again at its own
 * scale, so every level keeps structures up to a few of its own pixels (fine texture at level 0, the board outline
 * at the top). Level-l pixel (u, v) has its centre at full-resolution (s u + (s - 1) / 2, s v + (s - 1) / 2),
 * s = 2^l. Buffers are reused when the next image has the same size (one pyramid per thread).
 */
final class Pyramid {
    static final int HIGH_PASS_RADIUS = 4;

    int levels;
    int[] widths = new int[0], heights = new int[0];
    float[][] bandPass = new float[0][];
    /** The local mean that the band-pass removed (smoothed minus band-passed): where heat shows, not texture. */
    float[][] lowPass = new float[0][];
    private float[][] smooth = new float[0][];
    private float[] filled = new float[0], t1 = new float[0];

    /** Number of levels for a frame of this size: the top level keeps at least 24 px on its short side. */
    static int autoLevels(int w, int h) {
        int n = 1;
        while (n < 6 && Math.min(w, h) >> n >= 24) n++;
        return n;
    }

    /** Builds the pyramid; returns false when the frame holds no finite pixel (nothing to build from). */
    boolean build(float[] celsius, int w, int h, int nLevels) {
        if (levels != nLevels || widths.length == 0 || widths[0] != w || heights[0] != h) allocate(w, h, nLevels);
        // v - v is 0 for a finite v and NaN for NaN and the infinities: a third of the time of a running mean
        boolean allFinite = true;
        for (float v : celsius) if (v - v != 0) { allFinite = false; break; }
        float[] input = celsius;
        if (!allFinite) { // pixels without a reading take the mean of the others (a copy only then)
            if (Double.isNaN(Filters.fillInvalid(celsius, filled))) return false;
            input = filled;
        }
        Filters.gaussian1(input, smooth[0], t1, w, h);
        for (int l = 0; l < levels; l++) {
            if (l > 0) Filters.halve(smooth[l - 1], widths[l - 1], heights[l - 1], smooth[l], widths[l], heights[l]);
            Filters.highPass(smooth[l], bandPass[l], lowPass[l], t1, widths[l], heights[l], HIGH_PASS_RADIUS);
        }
        return true;
    }

    private void allocate(int w, int h, int n) {
        levels = n;
        widths = new int[n];
        heights = new int[n];
        bandPass = new float[n][];
        lowPass = new float[n][];
        smooth = new float[n][];
        for (int l = 0; l < n; l++) {
            widths[l] = l == 0 ? w : Math.max(1, widths[l - 1] / 2);
            heights[l] = l == 0 ? h : Math.max(1, heights[l - 1] / 2);
            bandPass[l] = new float[widths[l] * heights[l]];
            lowPass[l] = new float[widths[l] * heights[l]];
            smooth[l] = new float[widths[l] * heights[l]];
        }
        filled = new float[w * h];
        t1 = new float[w * h];
    }

    /** Scale factor s = 2^level. */
    static double scale(int level) { return 1 << level; }

    /** A full-resolution homography expressed in level coordinates: A^-1 H A with A = level-to-full. */
    static double[] toLevel(Homography full, int level) {
        double s = scale(level), o = (s - 1) / 2;
        Homography a = new Homography(new double[]{s, 0, o, 0, s, o, 0, 0, 1});
        Homography aInv = new Homography(new double[]{1 / s, 0, -o / s, 0, 1 / s, -o / s, 0, 0, 1});
        return aInv.compose(full).compose(a).values();
    }

    /** A level-coordinate homography back at full resolution. */
    static Homography toFull(double[] levelH, int level) {
        double s = scale(level), o = (s - 1) / 2;
        Homography a = new Homography(new double[]{s, 0, o, 0, s, o, 0, 0, 1});
        Homography aInv = new Homography(new double[]{1 / s, 0, -o / s, 0, 1 / s, -o / s, 0, 0, 1});
        return a.compose(new Homography(levelH)).compose(aInv);
    }
}
