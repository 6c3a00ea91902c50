package org.risetrace.registration;

import java.util.ArrayList;
import java.util.List;

/**
 * Exhaustive search on the top pyramid level over rotation (-5, 0, +5 degrees), zoom (0.9, 1, 1.1) about the
 * board centre and whole-pixel translation up to a fifth of the frame either way, scored by normalised
 * cross-correlation. It covers the hand-held motion range with steps the alignment's capture range bridges
 * (half a step of 5 degrees or 10 % moves the board edge by under a top-level pixel).
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
        double mt = 0, mt2 = 0;
        for (int i = 0; i < n; i++) { mt += lv.t[i]; mt2 += lv.t[i] * lv.t[i]; }
        int range = (int) Math.ceil(0.2 * Math.max(w, h));
        float[] px = new float[n], py = new float[n];
        double[] top = new double[keep * 4];
        java.util.Arrays.fill(top, Double.NEGATIVE_INFINITY);
        for (double rot : ROTATIONS_DEG)
            for (double s : SCALES) {
                double ca = s * Math.cos(Math.toRadians(rot)), sa = s * Math.sin(Math.toRadians(rot));
                for (int i = 0; i < n; i++) {
                    double dx = lv.x[i] - cx, dy = lv.y[i] - cy;
                    px[i] = (float) (cx + ca * dx - sa * dy);
                    py[i] = (float) (cy + sa * dx + ca * dy);
                }
                for (int ty = -range; ty <= range; ty++)
                    for (int tx = -range; tx <= range; tx++) {
                        double sf = 0, sf2 = 0, sft = 0, st = 0, st2 = 0;
                        int valid = 0;
                        for (int i = 0; i < n; i++) {
                            float f = Filters.bilinear(img, w, h, px[i] + tx, py[i] + ty);
                            if (f != f) continue;
                            float t = lv.t[i];
                            valid++;
                            sf += f; sf2 += f * f; sft += f * t; st += t; st2 += t * t;
                        }
                        if (valid < n / 2) continue;
                        double cov = sft - sf * st / valid;
                        double vf = sf2 - sf * sf / valid, vt = st2 - st * st / valid;
                        if (vf <= 0 || vt <= 0) continue;
                        double ncc = cov / Math.sqrt(vf * vt);
                        insert(top, keep, ncc, rot, s, tx, ty);
                    }
            }
        for (int k = 0; k < keep; k++) {
            if (top[4 * k] == Double.NEGATIVE_INFINITY) break;
            double rot = top[4 * k + 1], s = top[4 * k + 2];
            int packed = (int) top[4 * k + 3];
            int tx = (packed >> 16) - 0x4000, ty = (packed & 0xFFFF) - 0x4000;
            double ca = s * Math.cos(Math.toRadians(rot)), sa = s * Math.sin(Math.toRadians(rot));
            double[] hl = {ca, -sa, cx + tx - ca * cx + sa * cy, sa, ca, cy + ty - sa * cx - ca * cy, 0, 0, 1};
            best.add(new Candidate(Pyramid.toFull(hl, l), top[4 * k]));
        }
        return best;
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
        float med = DirectAligner.select(t, t.length, t.length / 2);
        for (int i = 0; i < t.length; i++) t[i] = Math.abs(template[i] - med);
        double sigma = 1.4826 * DirectAligner.select(t, t.length, t.length / 2);
        float[] tmp = new float[n];
        int m = 0;
        for (int i = 0; i < n; i++) if (f[i] == f[i]) tmp[m++] = f[i];
        float fmed = DirectAligner.select(tmp, m, m / 2);
        float lo = (float) (fmed - CLIP_SIGMAS * sigma), hi = (float) (fmed + CLIP_SIGMAS * sigma);
        for (int i = 0; i < n; i++) {
            float v = f[i];
            if (v != v) continue;
            f[i] = v < lo ? lo : Math.min(v, hi);
        }
    }

    /** Keeps the best `keep` scores, skipping near-duplicates (same rotation and zoom, within 2 px). */
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
