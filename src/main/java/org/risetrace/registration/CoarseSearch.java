package org.risetrace.registration;

import org.risetrace.numeric.OrderStatistics;

import java.util.ArrayList;
import java.util.List;

/**
 * Exhaustive search on the top pyramid level over rotation (-5, 0, +5 degrees), zoom (0.9, 1, 1.1) about the
 * board centre and whole-pixel translation up to a fifth of the frame either way, scored by normalised
 * cross-correlation. It covers the hand-held motion range with steps the alignment's capture range bridges
 * (half a step of 5 degrees or 10 % moves the board edge by under a top-level pixel). The frame's level is
 * resampled once per rotation and zoom, so the shifts are plain lookups (a sixth of the cost of sampling every
 * shift bilinearly).
 */
final class CoarseSearch {
    static final double[] ROTATIONS_DEG = {-5, 0, 5};
    static final double[] SCALES = {0.9, 1.0, 1.1};

    record Candidate(Homography refToFrame, double score) {
    }

    static List<Candidate> search(ReferenceModel ref, Pyramid frame, int keep) {
        int l = ref.levels - 1;
        ReferenceModel.Level lv = ref.level[l];
        int w = frame.widths[l], h = frame.heights[l], n = lv.n;
        float[] img = frame.bandPass[l];
        List<Candidate> best = new ArrayList<>();
        if (n < 16) return best;
        double[][] c = ref.cornersAtLevel(l);
        double cx = 0, cy = 0;
        for (double[] p : c) { cx += p[0] / 4; cy += p[1] / 4; }
        int range = (int) Math.ceil(0.2 * Math.max(w, h));
        // the template's bounding box (template pixels sit on whole level pixels)
        int x0 = Integer.MAX_VALUE, y0 = Integer.MAX_VALUE, x1 = Integer.MIN_VALUE, y1 = Integer.MIN_VALUE;
        for (int i = 0; i < n; i++) {
            x0 = Math.min(x0, (int) lv.x[i]); x1 = Math.max(x1, (int) lv.x[i]);
            y0 = Math.min(y0, (int) lv.y[i]); y1 = Math.max(y1, (int) lv.y[i]);
        }
        int ww = x1 - x0 + 1 + 2 * range, wh = y1 - y0 + 1 + 2 * range;
        int[] at = new int[n];
        for (int i = 0; i < n; i++) at[i] = ((int) lv.y[i] - y0) * ww + ((int) lv.x[i] - x0);
        float[] warped = new float[ww * wh];
        double allT = 0, allT2 = 0;
        for (int i = 0; i < n; i++) { allT += lv.t[i]; allT2 += lv.t[i] * lv.t[i]; }
        double[] top = new double[keep * 4];
        double[] local = new double[LOCAL_KEEP * 4];
        java.util.Arrays.fill(top, Double.NEGATIVE_INFINITY);
        for (double rot : ROTATIONS_DEG)
            for (double s : SCALES) {
                double ca = s * Math.cos(Math.toRadians(rot)), sa = s * Math.sin(Math.toRadians(rot));
                // the frame resampled once per rotation and zoom: warped(q) = frame(c + R (q - c)), q over the
                // template's box grown by the search range, so every whole-pixel shift t of the template in q
                // is a plain lookup; t maps to the frame shift R t
                for (int r = 0; r < wh; r++) {
                    double qy = y0 - range + r - cy;
                    for (int k = 0; k < ww; k++) {
                        double qx = x0 - range + k - cx;
                        warped[r * ww + k] = Filters.bilinear(img, w, h, cx + ca * qx - sa * qy, cy + sa * qx + ca * qy);
                    }
                }
                // shifts on a 2-pixel grid first (the top level's band-passed picture is smooth, so its
                // correlation peak is wider than 2 pixels), then every shift next to this rotation and zoom's
                // best few: about a quarter of the exhaustive search's work
                java.util.Arrays.fill(local, Double.NEGATIVE_INFINITY);
                for (int ty = -range; ty <= range; ty += 2)
                    for (int tx = -range; tx <= range; tx += 2) {
                        double score = shiftScore(warped, at, lv.t, n, ww, range, tx, ty, allT, allT2);
                        if (score > Double.NEGATIVE_INFINITY) insert(local, LOCAL_KEEP, score, rot, s, tx, ty);
                    }
                for (int k = 0; k < LOCAL_KEEP; k++) {
                    if (local[4 * k] == Double.NEGATIVE_INFINITY) break;
                    int packed = (int) local[4 * k + 3];
                    int cxs = (packed >> 16) - 0x4000, cys = (packed & 0xFFFF) - 0x4000;
                    for (int ty = Math.max(-range, cys - 1); ty <= Math.min(range, cys + 1); ty++)
                        for (int tx = Math.max(-range, cxs - 1); tx <= Math.min(range, cxs + 1); tx++) {
                            double score = shiftScore(warped, at, lv.t, n, ww, range, tx, ty, allT, allT2);
                            if (score > Double.NEGATIVE_INFINITY) insert(top, keep, score, rot, s, tx, ty);
                        }
                }
            }
        for (int k = 0; k < keep; k++) {
            if (top[4 * k] == Double.NEGATIVE_INFINITY) break;
            double rot = top[4 * k + 1], s = top[4 * k + 2];
            int packed = (int) top[4 * k + 3];
            int tx = (packed >> 16) - 0x4000, ty = (packed & 0xFFFF) - 0x4000;
            double ca = s * Math.cos(Math.toRadians(rot)), sa = s * Math.sin(Math.toRadians(rot));
            double fx = ca * tx - sa * ty, fy = sa * tx + ca * ty;
            double[] hl = {ca, -sa, cx + fx - ca * cx + sa * cy, sa, ca, cy + fy - sa * cx - ca * cy, 0, 0, 1};
            best.add(new Candidate(Pyramid.toFull(hl, l), top[4 * k]));
        }
        return best;
    }

    /** Normalised cross-correlation of the frame's top level with the template through one mapping (reference to frame). */
    static double score(ReferenceModel ref, Pyramid frame, Homography refToFrame) {
        int l = ref.levels - 1;
        ReferenceModel.Level lv = ref.level[l];
        if (lv.n < 16) return Double.NaN;
        double[] m = Pyramid.toLevel(refToFrame, l);
        float[] img = frame.bandPass[l];
        int w = frame.widths[l], h = frame.heights[l], valid = 0;
        double sf = 0, sf2 = 0, sft = 0, st = 0, st2 = 0;
        for (int i = 0; i < lv.n; i++) {
            double x = lv.x[i], y = lv.y[i], z = m[6] * x + m[7] * y + m[8];
            float f = Filters.bilinear(img, w, h, (m[0] * x + m[1] * y + m[2]) / z, (m[3] * x + m[4] * y + m[5]) / z);
            if (f != f) continue;
            float t = lv.t[i];
            valid++;
            sf += f; sf2 += f * f; sft += f * t; st += t; st2 += t * t;
        }
        if (valid < lv.n / 2) return 0;
        return ncc(sf, sf2, sft, st, st2, valid);
    }

    /** Normalised cross-correlation from the sums over n pairs (f, t); 0 when either side has no spread. */
    static double ncc(double sf, double sf2, double sft, double st, double st2, int n) {
        double vf = sf2 - sf * sf / n, vt = st2 - st * st / n;
        return vf > 0 && vt > 0 ? (sft - sf * st / n) / Math.sqrt(vf * vt) : 0;
    }
    /** Whole-pixel shifts searched around the last estimate, in pixels of level LOCAL_LEVEL, either way. */
    static final int LOCAL_RANGE = 3;
    static final int LOCAL_LEVEL = 2;

    /**
     * The whole-pixel shift of level min(LOCAL_LEVEL, top) (up to LOCAL_RANGE either way) that best correlates the
     * frame with the template through the estimate, in full-resolution pixels; null when the best is no shift.
     */
    static double[] localShift(ReferenceModel ref, Pyramid frame, Homography estimate) {
        int l = Math.min(LOCAL_LEVEL, ref.levels - 1);
        if (l == 0) return null;
        ReferenceModel.Level lv = ref.level[l];
        int n = lv.n, step = Math.max(1, n / 1000), m = (n + step - 1) / step;
        if (n < 16) return null;
        double[] h = Pyramid.toLevel(estimate, l);
        float[] img = frame.bandPass[l];
        int w = frame.widths[l], hh = frame.heights[l];
        float[] px = new float[m], py = new float[m], t = new float[m], ax = new float[m], ay = new float[m];
        int[] ix = new int[m], iy = new int[m];
        for (int i = 0, k = 0; i < n; i += step, k++) {
            double x = lv.x[i], y = lv.y[i], z = h[6] * x + h[7] * y + h[8];
            px[k] = (float) ((h[0] * x + h[1] * y + h[2]) / z);
            py[k] = (float) ((h[3] * x + h[4] * y + h[5]) / z);
            t[k] = lv.t[i];
            // whole-pixel shifts keep the interpolation weights: the cell and weights once per sample
            // (-2^20 for a position out of int range: every shift of it falls outside and takes the slow path)
            ix[k] = Float.isFinite(px[k]) && Math.abs(px[k]) < 1e6f ? (int) Math.floor(px[k]) : -(1 << 20);
            iy[k] = Float.isFinite(py[k]) && Math.abs(py[k]) < 1e6f ? (int) Math.floor(py[k]) : -(1 << 20);
            ax[k] = px[k] - ix[k];
            ay[k] = py[k] - iy[k];
        }
        double bestScore = Double.NEGATIVE_INFINITY;
        int bx = 0, by = 0;
        for (int dy = -LOCAL_RANGE; dy <= LOCAL_RANGE; dy++)
            for (int dx = -LOCAL_RANGE; dx <= LOCAL_RANGE; dx++) {
                double sf = 0, sf2 = 0, sft = 0, st = 0, st2 = 0;
                int valid = 0;
                for (int k = 0; k < m; k++) {
                    int x0 = ix[k] + dx, y0 = iy[k] + dy;
                    float f;
                    if (x0 >= 0 && y0 >= 0 && x0 < w - 1 && y0 < hh - 1) { // Filters.bilinear written out
                        int q = y0 * w + x0;
                        float a = ax[k], p00 = img[q], p10 = img[q + 1], p01 = img[q + w], p11 = img[q + w + 1];
                        float top = p00 + a * (p10 - p00), bot = p01 + a * (p11 - p01);
                        f = top + ay[k] * (bot - top);
                    } else { // the frame's last row or column, or outside
                        f = Filters.bilinear(img, w, hh, px[k] + dx, py[k] + dy);
                    }
                    if (f != f) continue;
                    valid++;
                    sf += f; sf2 += f * f; sft += f * t[k]; st += t[k]; st2 += t[k] * t[k];
                }
                if (valid < m / 2) continue;
                double score = ncc(sf, sf2, sft, st, st2, valid);
                if (score > bestScore) { bestScore = score; bx = dx; by = dy; }
            }
        if (bx == 0 && by == 0) return null;
        double sc = Pyramid.scale(l);
        return new double[]{bx * sc, by * sc};
    }


    /** Clip limit in robust standard deviations of the reference's template values (1.5, 2 and 2.5 tried on simulated series: 1.5 failed fewest frames). */
    static final double CLIP_SIGMAS = 1.5;

    /**
     * The frame's level clipped to the reference's range of band-passed values (median +- CLIP_SIGMAS robust
     * standard deviations): a part that heated by tens of kelvin leaves a broad blob whose band-passed values
     * dwarf the board's texture, and unclipped it decided the correlation on heated simulated frames (the best
     * candidates were 15-60 px off). Clipping keeps its edge but no more weight than any other edge. Applied to the
     * frame's top level (the search's) only: clipping the lower levels as well gave no gain.
     */
    static void clipInPlace(float[] f, int n, float[] template) {
        float[] t = java.util.Arrays.copyOf(template, template.length);
        float med = OrderStatistics.select(t, t.length, t.length / 2);
        for (int i = 0; i < t.length; i++) t[i] = Math.abs(template[i] - med);
        double sigma = 1.4826 * OrderStatistics.select(t, t.length, t.length / 2);
        float[] tmp = new float[n];
        int m = 0;
        for (int i = 0; i < n; i++) if (f[i] == f[i]) tmp[m++] = f[i];
        float fmed = OrderStatistics.select(tmp, m, m / 2);
        float lo = (float) (fmed - CLIP_SIGMAS * sigma), hi = (float) (fmed + CLIP_SIGMAS * sigma);
        for (int i = 0; i < n; i++) {
            float v = f[i];
            if (v != v) continue;
            f[i] = v < lo ? lo : Math.min(v, hi);
        }
    }

    /** Keeps the best `keep` scores, skipping near-duplicates (same rotation and zoom, within 2 px). */
    /** Candidates kept per rotation and zoom from the 2-pixel grid, each refined over its 3 x 3 neighbourhood. */
    static final int LOCAL_KEEP = 4;

    /** NCC of the template shifted by (tx, ty) in the warped frame; -infinity when too little of it is inside. */
    private static double shiftScore(float[] warped, int[] at, float[] t, int n, int ww, int range, int tx, int ty,
                                     double allT, double allT2) {
        int off = (ty + range) * ww + tx + range;
        double sf = 0, sf2 = 0, sft = 0, st = allT, st2 = allT2;
        int valid = 0;
        for (int i = 0; i < n; i++) {
            float f = warped[at[i] + off];
            if (f != f) continue;
            valid++;
            sf += f; sf2 += f * f; sft += f * t[i];
        }
        if (valid < n / 2) return Double.NEGATIVE_INFINITY;
        if (valid < n) { // part of the template fell outside the frame: its own sums over the rest
            st = 0; st2 = 0;
            for (int i = 0; i < n; i++) {
                if (warped[at[i] + off] != warped[at[i] + off]) continue;
                float v = t[i];
                st += v; st2 += v * v;
            }
        }
        double vf = sf2 - sf * sf / valid, vt = st2 - st * st / valid;
        if (vf <= 0 || vt <= 0) return Double.NEGATIVE_INFINITY;
        return ncc(sf, sf2, sft, st, st2, valid);
    }

    private static void insert(double[] top, int keep, double score, double rot, double s, int tx, int ty) {
        for (int k = 0; k < keep; k++) {
            if (top[4 * k] == Double.NEGATIVE_INFINITY) break;
            if (top[4 * k + 1] == rot && top[4 * k + 2] == s) {
                int packed = (int) top[4 * k + 3];
                int ox = (packed >> 16) - 0x4000, oy = (packed & 0xFFFF) - 0x4000;
                if (Math.abs(ox - tx) <= 2 && Math.abs(oy - ty) <= 2) {
                    if (score > top[4 * k]) { remove(top, keep, k); break; }
                    return;
                }
            }
        }
        int pos = keep;
        for (int k = 0; k < keep; k++) if (score > top[4 * k]) { pos = k; break; }
        if (pos == keep) return;
        System.arraycopy(top, 4 * pos, top, 4 * pos + 4, 4 * (keep - pos - 1));
        top[4 * pos] = score;
        top[4 * pos + 1] = rot;
        top[4 * pos + 2] = s;
        top[4 * pos + 3] = ((tx + 0x4000) << 16) | (ty + 0x4000);
    }

    private static void remove(double[] top, int keep, int k) {
        System.arraycopy(top, 4 * k + 4, top, 4 * k, 4 * (keep - k - 1));
        java.util.Arrays.fill(top, 4 * (keep - 1), 4 * keep, Double.NEGATIVE_INFINITY);
    }
}
