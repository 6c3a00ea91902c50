package org.risetrace.registration;

/**
 * Coarse-to-fine pyramid of band-passed images. Level 0 is the frame smoothed by a Gaussian of sigma 1 px and
 * high-passed; level l+1 is the 2 x 2 block average of level l's smoothed image (level 1 made straight from the
 * frame by the two filters combined, {@link Filters#gaussianHalve}), high-passed again at its own scale, so every
 * level keeps structures up to a few of its own pixels (fine texture at level 0, the board outline at the top). Level-l pixel (u, v) has its centre at full-resolution (s u + (s - 1) / 2, s v + (s - 1) / 2),
 * s = 2^l. Buffers are reused when the next image has the same size (one pyramid per thread).
 *
 * <p>Level 0's band-pass and local mean, the largest part of the work, are made only where a mapping needs them
 * ({@link #ensureLevel0}): the board's part of the frame and a margin. Everywhere else level 0's band-pass is NaN,
 * which every sampler treats as outside the frame, so a sample beyond the region can cost an estimate but never
 * read another frame's values. The values inside equal those of the whole frame's filter (clamped at the frame's
 * borders, not the region's).
 */
final class Pyramid {
    static final int HIGH_PASS_RADIUS = 4;
    /**
     * Frame pixels around a mapped board's box that must be made before level 0 is sampled through the mapping: the
     * alignment on level 0 moves a mapping by a few pixels at most (its reach is the band-pass's), the patch check
     * by at most 3. When they are not, level 0 is made with {@link #LEVEL0_MARGIN} around the box, so the next
     * mappings of the same frame, a few pixels apart, find it made.
     */
    static final int LEVEL0_NEED = 6;
    static final int LEVEL0_MARGIN = 16;

    int levels;
    int[] widths = new int[0], heights = new int[0];
    float[][] bandPass = new float[0][];
    /** The local mean that the band-pass removed (smoothed minus band-passed): where heat shows, not texture. */
    float[][] lowPass = new float[0][];
    private float[][] smooth = new float[0][];
    private float[] filled = new float[0], t1 = new float[0];
    /** The frame (NaN filled) level 0 is made from, until the next build. */
    private float[] level0Input;
    /** Level 0's band-pass is made in [x0, x1) x [y0, y1) (empty: x1 <= x0); NaN elsewhere. */
    private int x0, y0, x1, y1;

    /** Number of levels for a frame of this size: the top level keeps at least 24 px on its short side. */
    static int autoLevels(int w, int h) {
        int n = 1;
        while (n < 6 && Math.min(w, h) >> n >= 24) n++;
        return n;
    }

    /**
     * Builds the pyramid; returns false when the frame holds no finite pixel (nothing to build from: every level is
     * then flat, zero, and made).
     */
    boolean build(float[] celsius, int w, int h, int nLevels) {
        if (levels != nLevels || widths.length == 0 || widths[0] != w || heights[0] != h) allocate(w, h, nLevels);
        // v - v is 0 for a finite v and NaN for NaN and the infinities: a third of the time of a running mean
        boolean allFinite = true;
        for (float v : celsius) if (v - v != 0) { allFinite = false; break; }
        float[] input = celsius;
        if (!allFinite) { // pixels without a reading take the mean of the others (a copy only then)
            if (Double.isNaN(Filters.fillInvalid(celsius, filled))) { // flat: zeros on every level, all of them made
                for (int l = 0; l < levels; l++) {
                    java.util.Arrays.fill(bandPass[l], 0f);
                    java.util.Arrays.fill(lowPass[l], 0f);
                }
                x0 = 0; y0 = 0; x1 = w; y1 = h;
                level0Input = null;
                return false;
            }
            input = filled;
        }
        level0Input = input;
        for (int l = 1; l < levels; l++) {
            if (l == 1) Filters.gaussianHalve(input, w, h, smooth[1], widths[1], heights[1], t1);
            else Filters.halve(smooth[l - 1], widths[l - 1], heights[l - 1], smooth[l], widths[l], heights[l]);
            Filters.highPass(smooth[l], bandPass[l], lowPass[l], t1, widths[l], heights[l], HIGH_PASS_RADIUS);
        }
        // level 0 waits for a mapping; the last frame's values go
        for (int y = y0; y < y1; y++) java.util.Arrays.fill(bandPass[0], y * w + x0, y * w + x1, Float.NaN);
        x0 = y0 = x1 = y1 = 0;
        if (levels == 1) ensureLevel0All(); // the top level is level 0: the coarse search needs all of it
        return true;
    }

    /** Makes level 0 over the whole frame (feature matching, the reference). */
    void ensureLevel0All() {
        ensureLevel0(0, 0, widths[0], heights[0]);
    }

    /**
     * Makes level 0 where the reference's board lands through refToFrame (its box of level-0 pixels, {@link
     * ReferenceModel#level0Box}, mapped, plus {@link #LEVEL0_MARGIN}).
     */
    void ensureLevel0(ReferenceModel ref, double[] refToFrame) {
        double[] box = ref.level0Box;
        double minX = Double.POSITIVE_INFINITY, minY = Double.POSITIVE_INFINITY;
        double maxX = Double.NEGATIVE_INFINITY, maxY = Double.NEGATIVE_INFINITY;
        double[] m = refToFrame;
        for (int k = 0; k < 4; k++) {
            double x = box[k == 0 || k == 3 ? 0 : 2], y = box[k < 2 ? 1 : 3];
            double z = m[6] * x + m[7] * y + m[8];
            double u = (m[0] * x + m[1] * y + m[2]) / z, v = (m[3] * x + m[4] * y + m[5]) / z;
            if (!(Double.isFinite(u) && Double.isFinite(v) && z > 0)) { ensureLevel0All(); return; }
            minX = Math.min(minX, u); maxX = Math.max(maxX, u);
            minY = Math.min(minY, v); maxY = Math.max(maxY, v);
        }
        // a projective map of a rectangle is a convex quadrilateral (z > 0 at every corner): inside its corners' box
        double lo = -1e6, hi = 1e6; // far outside the frame either way; clamped below
        int ax = (int) Math.floor(Math.max(lo, minX)), ay = (int) Math.floor(Math.max(lo, minY));
        int bx = (int) Math.ceil(Math.min(hi, maxX)) + 1, by = (int) Math.ceil(Math.min(hi, maxY)) + 1;
        if (made(ax - LEVEL0_NEED, ay - LEVEL0_NEED, bx + LEVEL0_NEED, by + LEVEL0_NEED)) return;
        ensureLevel0(ax - LEVEL0_MARGIN, ay - LEVEL0_MARGIN, bx + LEVEL0_MARGIN, by + LEVEL0_MARGIN);
    }

    /** True when level 0 is made over [ax, bx) x [ay, by) clamped to the frame. */
    private boolean made(int ax, int ay, int bx, int by) {
        ax = Math.max(0, ax); ay = Math.max(0, ay); bx = Math.min(widths[0], bx); by = Math.min(heights[0], by);
        return bx <= ax || by <= ay || (x1 > x0 && ax >= x0 && ay >= y0 && bx <= x1 && by <= y1);
    }

    /** Makes level 0 over at least [ax, bx) x [ay, by) (clamped to the frame). */
    void ensureLevel0(int ax, int ay, int bx, int by) {
        int w = widths[0], h = heights[0];
        ax = Math.max(0, ax); ay = Math.max(0, ay); bx = Math.min(w, bx); by = Math.min(h, by);
        if (made(ax, ay, bx, by)) return;
        // grown to the box holding both, made again whole (rare: 1 extension in 150 hand-held frames)
        if (x1 > x0) { ax = Math.min(ax, x0); ay = Math.min(ay, y0); bx = Math.max(bx, x1); by = Math.max(by, y1); }
        // the band-pass reads the blurred frame up to twice its radius beyond the rectangle
        int reach = 2 * HIGH_PASS_RADIUS;
        Filters.gaussian1(level0Input, smooth[0], t1, w, h, Math.max(0, ax - reach), Math.max(0, ay - reach),
                Math.min(w, bx + reach), Math.min(h, by + reach));
        Filters.highPass(smooth[0], bandPass[0], lowPass[0], t1, w, h, HIGH_PASS_RADIUS, ax, ay, bx, by);
        x0 = ax; y0 = ay; x1 = bx; y1 = by;
    }

    /** Level 0's region made so far: {x0, y0, x1, y1} (tests). */
    int[] level0Region() {
        return new int[]{x0, y0, x1, y1};
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
        java.util.Arrays.fill(bandPass[0], Float.NaN);
        x0 = y0 = x1 = y1 = 0;
        filled = new float[w * h];
        t1 = new float[w * h];
    }

    /** Standard deviation over every 3rd value, NaN left out (enough to tell a textured frame from a uniform one). */
    static double spread(float[] v) {
        double s = 0, s2 = 0;
        int n = 0;
        for (int i = 0; i < v.length; i += 3) {
            float f = v[i];
            if (f != f) continue;
            s += f; s2 += f * f; n++;
        }
        if (n == 0) return 0;
        double m = s / n;
        return Math.sqrt(Math.max(0, s2 / n - m * m));
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
