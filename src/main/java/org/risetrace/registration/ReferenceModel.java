package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;
import org.risetrace.numeric.OrderStatistics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The reference frame prepared once for registration, immutable afterwards and shared by all threads: its
 * pyramid, the board region, per level the selected template pixels with their steepest-descent images for the
 * inverse-compositional alignment, the pixels that score similarity, the check patches and the reference features.
 */
final class ReferenceModel {
    /** Template pixels per level at most (the strongest gradients win). */
    static final int MAX_TEMPLATE_PIXELS = 5000;
    /**
     * Template pixels on the coarser levels at most: they only bring the estimate into the basin of full
     * resolution, where the accuracy is decided (a cap of 2000 instead of 5000 cut hand-held alignment time by a
     * third with the same simulated accuracy; 1000 instead of 2000 cut the coarse levels' iterations from 3,900 to
     * 3,100 and their pixel visits by 60 % on a 150-frame hand-held 640 x 480 series, every frame still ok and the
     * corners within 0.025 px of before, registration and confidence tests unchanged).
     */
    static final int MAX_COARSE_TEMPLATE_PIXELS = 1000;
    /** Score pixels at full resolution at most (a regular subsample of the board). */
    static final int MAX_SCORE_PIXELS = 8000;
    /**
     * Check patches on a grid x grid lattice over the board: 5 x 5 on small frames, up to 8 x 8 on large ones (on
     * a 640 x 512 simulated board only 5 of 25 lattice patches were textured enough, one short of an ok grade).
     */
    static final int MAX_PATCHES = 25;

    static int grid(int width, int height) {
        return Math.max(5, Math.min(8, Math.min(width, height) / 64));
    }

    final String referenceName;
    final Board board;
    final int width, height, levels;
    /** The reference's pyramid while it is prepared; afterwards kept only for feature detection (else null). */
    private Pyramid pyramid;
    final Homography boardToReference;
    final double[][] referenceCornersPx;
    final Level[] level;
    final float[] scoreX, scoreY, scoreT;
    final List<Patch> patches;
    private final boolean withFeatures;
    private volatile FeatureSet features;
    /**
     * The box {x0, y0, x1, y1} (reference pixels) of every level-0 pixel a mapping is sampled at: template, score
     * pixels, check patches and their neighbours. A frame's level 0 is made only where this box lands.
     */
    final double[] level0Box;
    /** Spread of the reference's level-1 band-pass over the whole frame (the texture check's scale). */
    final double levelOneSpread;
    /** True for a chain link's reference: a frame taken during heating rather than the user's cold reference. */
    final boolean heatedReference;

    /** Template pixels of one level (level coordinates) and their steepest-descent images. */
    static final class Level {
        final int w, h, n;
        final float[] x, y, t, sd;
        /** The reference's low-pass (local mean) at each template pixel, to tell pixels where heat changed the frame. */
        final float[] low;
        /** The steepest-descent images reduced to a similarity (4 per pixel: sd0 + sd3, sd1 - sd2, sd4, sd5). */
        final float[] sd4;
        final double cx, cy, sc;

        Level(int w, int h, float[] x, float[] y, float[] t, float[] sd, float[] low, double cx, double cy, double sc) {
            this.w = w; this.h = h; this.n = x.length; this.x = x; this.y = y; this.t = t; this.sd = sd; this.low = low;
            this.cx = cx; this.cy = cy; this.sc = sc;
            this.sd4 = new float[4 * n];
            for (int i = 0; i < n; i++) {
                int o = 8 * i;
                sd4[4 * i] = sd[o] + sd[o + 3];
                sd4[4 * i + 1] = sd[o + 1] - sd[o + 2];
                sd4[4 * i + 2] = sd[o + 4];
                sd4[4 * i + 3] = sd[o + 5];
            }
        }
    }

    /** A small square of the board used to check the final mapping locally (translation-only alignment). */
    static final class Patch {
        final double cx, cy;
        final float[] dx, dy, t, gx, gy;
        final double i11, i12, i22; // inverse of the 2 x 2 Gauss-Newton matrix

        Patch(double cx, double cy, float[] dx, float[] dy, float[] t, float[] gx, float[] gy,
              double i11, double i12, double i22) {
            this.cx = cx; this.cy = cy; this.dx = dx; this.dy = dy; this.t = t; this.gx = gx; this.gy = gy;
            this.i11 = i11; this.i12 = i12; this.i22 = i22;
        }
    }

    private ReferenceModel(Frame ref, Board board, RegistrationConfig config, boolean heatedReference, Pyramid scratch) {
        this.heatedReference = heatedReference;
        this.referenceName = board.outline().frame();
        this.board = board;
        this.width = ref.width();
        this.height = ref.height();
        this.levels = config.pyramidLevels() > 0 ? config.pyramidLevels() : Pyramid.autoLevels(width, height);
        this.pyramid = scratch != null ? scratch : new Pyramid();
        pyramid.build(ref.celsius(), width, height, levels);
        pyramid.ensureLevel0All();
        this.boardToReference = Homographies.boardToFrame(board, board.outline().cornersPx());
        this.referenceCornersPx = Homographies.boardCorners(board, boardToReference);
        this.level = new Level[levels];
        for (int l = 0; l < levels; l++) level[l] = selectTemplate(l);
        // score pixels: regular subsample of the board itself (no margin)
        List<float[]> sp = new ArrayList<>();
        double area = Math.abs(polygonArea(referenceCornersPx));
        int stride = Math.max(1, (int) Math.ceil(Math.sqrt(area / MAX_SCORE_PIXELS)));
        float[] b0 = pyramid.bandPass[0];
        Quad outline = new Quad(referenceCornersPx, 0);
        for (int y = 1; y < height - 1; y += stride)
            for (int x = 1; x < width - 1; x += stride)
                if (outline.contains(x, y)) sp.add(new float[]{x, y, b0[y * width + x]});
        scoreX = new float[sp.size()];
        scoreY = new float[sp.size()];
        scoreT = new float[sp.size()];
        for (int i = 0; i < sp.size(); i++) { scoreX[i] = sp.get(i)[0]; scoreY[i] = sp.get(i)[1]; scoreT[i] = sp.get(i)[2]; }
        patches = selectPatches();
        level0Box = level0Box();
        levelOneSpread = Pyramid.spread(pyramid.bandPass[Math.min(1, levels - 1)]);
        withFeatures = !config.method().equals("search");
        if (!withFeatures) pyramid = null; // a chain link's: 5 frame-sized arrays and more, gone with the link
    }

    /**
     * The reference's features, detected on first use (most series never need them: the other starts grade ok,
     * and detection costs a fresh process a few hundred milliseconds of BoofCV loading and compiling); null for
     * the coarse-search-only method. Safe to call from several threads.
     */
    FeatureSet features() {
        if (!withFeatures) return null;
        FeatureSet f = features;
        if (f == null) {
            synchronized (this) {
                f = features;
                if (f == null) features = f = FeatureSet.detect(pyramid.bandPass[0], width, height, referenceCornersPx, 2.0);
            }
        }
        return f;
    }

    static ReferenceModel prepare(Frame ref, Board board, RegistrationConfig config) {
        return new ReferenceModel(ref, board, config, false, null);
    }

    /**
     * A frame graded ok during heating, prepared as the reference of a chain link; built in the caller's scratch
     * pyramid (the calling thread's, reused link after link) when the model will not keep it (no features: method
     * "search"), else in its own.
     */
    static ReferenceModel prepareHeated(Frame ref, Board board, RegistrationConfig config, Pyramid scratch) {
        return new ReferenceModel(ref, board, config, true, config.method().equals("search") ? scratch : null);
    }

    private double[] level0Box() {
        double[] box = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY,
                Double.NEGATIVE_INFINITY};
        for (int i = 0; i < level[0].n; i++) grow(box, level[0].x[i], level[0].y[i]);
        for (int i = 0; i < scoreX.length; i++) grow(box, scoreX[i], scoreY[i]);
        for (Patch p : patches)
            for (int k = 0; k < p.dx.length; k++) grow(box, p.cx + p.dx[k], p.cy + p.dy[k]);
        for (double[] c : referenceCornersPx) grow(box, c[0], c[1]);
        // and the bilinear samples' neighbours
        return new double[]{box[0] - 1, box[1] - 1, box[2] + 1, box[3] + 1};
    }

    private static void grow(double[] box, double x, double y) {
        box[0] = Math.min(box[0], x); box[1] = Math.min(box[1], y);
        box[2] = Math.max(box[2], x); box[3] = Math.max(box[3], y);
    }

    /** Board corners in level coordinates. */
    double[][] cornersAtLevel(int l) {
        double s = Pyramid.scale(l), o = (s - 1) / 2;
        double[][] c = new double[4][];
        for (int i = 0; i < 4; i++)
            c[i] = new double[]{(referenceCornersPx[i][0] - o) / s, (referenceCornersPx[i][1] - o) / s};
        return c;
    }

    private Level selectTemplate(int l) {
        int w = pyramid.widths[l], h = pyramid.heights[l];
        float[] img = pyramid.bandPass[l];
        double[][] c = cornersAtLevel(l);
        double margin = Math.max(1.0, 2.0 / Pyramid.scale(l));
        // only the outline's box (with the margin) can hold template pixels: the buffers and the scan stay there
        double qx0 = Double.POSITIVE_INFINITY, qy0 = Double.POSITIVE_INFINITY, qx1 = Double.NEGATIVE_INFINITY, qy1 = Double.NEGATIVE_INFINITY;
        for (double[] p : c) { qx0 = Math.min(qx0, p[0]); qy0 = Math.min(qy0, p[1]); qx1 = Math.max(qx1, p[0]); qy1 = Math.max(qy1, p[1]); }
        int bx0 = (int) Math.max(1, Math.floor(qx0 - margin - 1)), by0 = (int) Math.max(1, Math.floor(qy0 - margin - 1));
        int bx1 = (int) Math.min(w - 2, Math.ceil(qx1 + margin + 1)), by1 = (int) Math.min(h - 2, Math.ceil(qy1 + margin + 1));
        int cap = Math.max(0, bx1 - bx0 + 1) * Math.max(0, by1 - by0 + 1);
        float[] gm = new float[cap];
        int[] idx = new int[cap];
        int n = 0;
        Quad quad = new Quad(c, margin);
        for (int y = by0; y <= by1; y++)
            for (int x = bx0; x <= bx1; x++) {
                if (!quad.contains(x, y)) continue;
                int i = y * w + x;
                float gx = 0.5f * (img[i + 1] - img[i - 1]), gy = 0.5f * (img[i + w] - img[i - w]);
                float g = gx * gx + gy * gy;
                if (g <= 0) continue;
                gm[n] = g;
                idx[n++] = i;
            }
        // keep the stronger 60 % (flat pixels only add noise to the normal equations), at most MAX_TEMPLATE_PIXELS
        int keep = Math.min(l == 0 ? MAX_TEMPLATE_PIXELS : MAX_COARSE_TEMPLATE_PIXELS,
                Math.max(Math.min(n, 16), (int) (n * 0.6)));
        // the keep-th largest by selection, not a sort (a chain link prepares a reference during the series)
        float thr = n == 0 ? 0 : OrderStatistics.select(Arrays.copyOf(gm, n), n, Math.max(0, n - keep));
        int m = 0;
        for (int k = 0; k < n; k++) if (gm[k] >= thr && m < keep) m++;
        float[] xs = new float[m], ys = new float[m], ts = new float[m], sd = new float[8 * m], low = new float[m];
        float[] lp = pyramid.lowPass[l];
        double cx = (w - 1) / 2.0, cy = (h - 1) / 2.0, sc = Math.max(w, h) / 2.0;
        int j = 0;
        for (int k = 0; k < n && j < m; k++) {
            if (gm[k] < thr) continue;
            int i = idx[k];
            int x = i % w, y = i / w;
            float gx = 0.5f * (img[i + 1] - img[i - 1]), gy = 0.5f * (img[i + w] - img[i - w]);
            xs[j] = x; ys[j] = y; ts[j] = img[i]; low[j] = lp[i];
            double xn = (x - cx) / sc, yn = (y - cy) / sc;
            double gxs = gx * sc, gys = gy * sc, r = gxs * xn + gys * yn;
            int o = 8 * j;
            // steepest descent images of the 8-parameter homography at the identity (Baker and Matthews 2004)
            sd[o] = (float) (gxs * xn); sd[o + 1] = (float) (gys * xn);
            sd[o + 2] = (float) (gxs * yn); sd[o + 3] = (float) (gys * yn);
            sd[o + 4] = (float) gxs; sd[o + 5] = (float) gys;
            sd[o + 6] = (float) (-xn * r); sd[o + 7] = (float) (-yn * r);
            j++;
        }
        return new Level(w, h, xs, ys, ts, sd, low, cx, cy, sc);
    }

    private List<Patch> selectPatches() {
        int r = Math.max(4, Math.min(10, Math.min(width, height) / 20));
        float[] img = pyramid.bandPass[0];
        List<Patch> candidates = new ArrayList<>();
        List<Double> strength = new ArrayList<>();
        double[][] c = referenceCornersPx;
        int grid = grid(width, height);
        for (int gj = 0; gj < grid; gj++)
            for (int gi = 0; gi < grid; gi++) {
                double u = (gi + 0.5) / grid, v = (gj + 0.5) / grid;
                // bilinear interpolation of the outline quad (close enough to the projective centre for placement)
                double px = (1 - v) * ((1 - u) * c[0][0] + u * c[1][0]) + v * ((1 - u) * c[3][0] + u * c[2][0]);
                double py = (1 - v) * ((1 - u) * c[0][1] + u * c[1][1]) + v * ((1 - u) * c[3][1] + u * c[2][1]);
                int x0 = (int) Math.round(px), y0 = (int) Math.round(py);
                if (x0 - r < 1 || y0 - r < 1 || x0 + r >= width - 1 || y0 + r >= height - 1) continue;
                int size = (2 * r + 1) * (2 * r + 1);
                float[] dx = new float[size], dy = new float[size], t = new float[size], gx = new float[size],
                        gy = new float[size];
                double a11 = 0, a12 = 0, a22 = 0;
                int k = 0;
                for (int y = y0 - r; y <= y0 + r; y++)
                    for (int x = x0 - r; x <= x0 + r; x++) {
                        int i = y * width + x;
                        dx[k] = x - x0; dy[k] = y - y0; t[k] = img[i];
                        gx[k] = 0.5f * (img[i + 1] - img[i - 1]);
                        gy[k] = 0.5f * (img[i + width] - img[i - width]);
                        a11 += gx[k] * gx[k]; a12 += gx[k] * gy[k]; a22 += gy[k] * gy[k];
                        k++;
                    }
                double det = a11 * a22 - a12 * a12;
                double lmin = 0.5 * (a11 + a22 - Math.sqrt((a11 - a22) * (a11 - a22) + 4 * a12 * a12));
                if (det <= 0 || lmin <= 0) continue;
                candidates.add(new Patch(x0, y0, dx, dy, t, gx, gy, a22 / det, -a12 / det, a11 / det));
                strength.add(lmin);
            }
        // keep patches with a well-conditioned structure tensor (Shi and Tomasi 1994): smallest eigenvalue at least
        // a tenth of the best patch's
        // on a heated frame (a chain link's reference) one hot part's patch dwarfs the rest and left fewer than three
        // to check with, so there the bar is a tenth of the upper quartile; on the cold reference the best patch's
        // (the quartile there added weak patches that disagreed: bundled cap-short fell from 60 to 2 ok frames)
        double[] sorted = strength.stream().mapToDouble(Double::doubleValue).sorted().toArray();
        double best = sorted.length == 0 ? 0
                : sorted[heatedReference ? (int) Math.floor(0.75 * (sorted.length - 1)) : sorted.length - 1];
        List<Integer> order = new ArrayList<>();
        for (int i = 0; i < candidates.size(); i++) if (strength.get(i) >= 0.1 * best) order.add(i);
        // at most MAX_PATCHES, the best-conditioned (grading cost grows with them; 25 is what a 5 x 5 lattice gives)
        order.sort((a, b) -> Double.compare(strength.get(b), strength.get(a)));
        List<Patch> out = new ArrayList<>();
        for (int i = 0; i < Math.min(MAX_PATCHES, order.size()); i++) out.add(candidates.get(order.get(i)));
        return out;
    }

    /** True when (x, y) lies inside the convex quad (positive orientation, y down) or within margin of it. */
    static boolean insideBy(double[][] c, double x, double y, double margin) {
        return new Quad(c, margin).contains(x, y);
    }

    /** A convex quad with its edges' unit normals prepared once, for testing every pixel of a level. */
    static final class Quad {
        private final double[] ax = new double[4], ay = new double[4], nx = new double[4], ny = new double[4];
        private final double margin;

        Quad(double[][] c, double margin) {
            this.margin = margin;
            for (int i = 0; i < 4; i++) {
                double[] a = c[i], b = c[(i + 1) % 4];
                double ex = b[0] - a[0], ey = b[1] - a[1], len = Math.hypot(ex, ey);
                ax[i] = a[0]; ay[i] = a[1];
                nx[i] = len > 0 ? ex / len : 0; ny[i] = len > 0 ? ey / len : 0;
            }
        }

        boolean contains(double x, double y) {
            for (int i = 0; i < 4; i++)
                if (nx[i] * (y - ay[i]) - ny[i] * (x - ax[i]) < -margin) return false;
            return true;
        }
    }

    static double polygonArea(double[][] c) {
        double s = 0;
        for (int i = 0; i < c.length; i++) {
            double[] a = c[i], b = c[(i + 1) % c.length];
            s += a[0] * b[1] - b[0] * a[1];
        }
        return s / 2;
    }
}
