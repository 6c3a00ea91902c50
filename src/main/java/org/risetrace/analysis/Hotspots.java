package org.risetrace.analysis;

import org.risetrace.board.Part;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;

/**
 * Hot spots of a board-space rise map: the map is smoothed with a Gaussian at the optics' blur scale (normalised
 * convolution, so invalid pixels neither count nor darken their neighbours: Knutsson and Westin 1993), local maxima
 * above median + k sigma are kept, with sigma = 1.4826 MAD of the smoothed map (robust: the heated region is a
 * minority of the board), and each is located to sub-pixel precision by fitting a parabola through the maximum and
 * its two neighbours along x and along y (vertex offset (l - r) / (2 (l - 2c + r))).
 */
public final class Hotspots {
    private Hotspots() {
    }

    /** A smoothed map and its robust level and spread. */
    public record Smoothed(BoardMap map, double median, double sigma) {
    }

    /**
     * Separable Gaussian smoothing with NaN-aware normalised convolution; sigma in board pixels (no smoothing when
     * sigma &lt; 0.3 px, where the kernel is a single tap).
     */
    public static float[] smooth(float[] values, int width, int height, double sigmaPx) {
        if (!(sigmaPx >= 0.3)) return values.clone();
        int r = Math.max(1, (int) Math.ceil(3 * sigmaPx));
        double[] g = new double[2 * r + 1];
        for (int k = -r; k <= r; k++) g[k + r] = Math.exp(-0.5 * k * k / (sigmaPx * sigmaPx));
        int n = width * height;
        double[] v = new double[n], w = new double[n], tv = new double[n], tw = new double[n];
        for (int i = 0; i < n; i++) {
            boolean ok = !Float.isNaN(values[i]);
            v[i] = ok ? values[i] : 0;
            w[i] = ok ? 1 : 0;
        }
        for (int y = 0; y < height; y++) {
            int row = y * width;
            for (int x = 0; x < width; x++) {
                double sv = 0, sw = 0;
                int k0 = Math.max(-r, -x), k1 = Math.min(r, width - 1 - x);
                for (int k = k0; k <= k1; k++) {
                    sv += g[k + r] * v[row + x + k];
                    sw += g[k + r] * w[row + x + k];
                }
                tv[row + x] = sv;
                tw[row + x] = sw;
            }
        }
        float[] out = new float[n];
        for (int y = 0; y < height; y++) {
            int k0 = Math.max(-r, -y), k1 = Math.min(r, height - 1 - y);
            for (int x = 0; x < width; x++) {
                double sv = 0, sw = 0;
                for (int k = k0; k <= k1; k++) {
                    int o = (y + k) * width + x;
                    sv += g[k + r] * tv[o];
                    sw += g[k + r] * tw[o];
                }
                int o = y * width + x;
                out[o] = Float.isNaN(values[o]) || sw <= 1e-9 ? Float.NaN : (float) (sv / sw);
            }
        }
        return out;
    }

    public static Smoothed smoothed(float[] rise, int width, int height, double pxPerMm, double sigmaPx, String unit) {
        float[] s = smooth(rise, width, height, sigmaPx);
        double[] vals = new double[s.length];
        int k = 0;
        for (float f : s) if (!Float.isNaN(f)) vals[k++] = f;
        double med = k == 0 ? Double.NaN : PartCurve.median(Arrays.copyOf(vals, k), k);
        double sigma = k == 0 ? Double.NaN : 1.4826 * PartCurve.mad(vals, k);
        return new Smoothed(new BoardMap(width, height, pxPerMm, s, unit), med, sigma);
    }

    /**
     * Local maxima (strictly greater than the 8 neighbours) above {@code median + k sigma} and above zero, hottest
     * first, each at least {@code minSeparationPx} from every hotter one, at most {@code max} of them. A maximum must
     * also stand out from every hotter one by a valley at least {@code k sigma} deep on the straight path between
     * them (its topographic prominence); otherwise it is a ripple on the same hill (noise on a heated package's
     * plateau) and not a spot of its own.
     */
    public static List<Hotspot> find(Smoothed sm, double k, double minSeparationPx, int max, List<Part> parts) {
        BoardMap m = sm.map();
        int w = m.width(), h = m.height();
        float[] v = m.values();
        double floor = Math.max(0, sm.median() + k * sm.sigma());
        if (!Double.isFinite(floor)) return List.of();
        List<int[]> peaks = new ArrayList<>();
        for (int y = 1; y < h - 1; y++)
            for (int x = 1; x < w - 1; x++) {
                float c = v[y * w + x];
                if (!(c > floor)) continue;
                boolean isMax = true;
                for (int dy = -1; dy <= 1 && isMax; dy++)
                    for (int dx = -1; dx <= 1; dx++) {
                        if (dx == 0 && dy == 0) continue;
                        float nb = v[(y + dy) * w + x + dx];
                        if (!(c > nb) && !Float.isNaN(nb)) {
                            // ties are resolved towards the first pixel in raster order
                            if (c == nb && (dy > 0 || (dy == 0 && dx > 0))) continue;
                            isMax = false;
                            break;
                        }
                    }
                if (isMax) peaks.add(new int[]{x, y});
            }
        peaks.sort(Comparator.comparingDouble((int[] p) -> -v[p[1] * w + p[0]]));
        List<Hotspot> out = new ArrayList<>();
        List<int[]> kept = new ArrayList<>();
        double sep2 = minSeparationPx * minSeparationPx;
        for (int[] p : peaks) {
            if (out.size() >= max) break;
            boolean near = false;
            for (int[] q : kept)
                if ((double) (p[0] - q[0]) * (p[0] - q[0]) + (double) (p[1] - q[1]) * (p[1] - q[1]) < sep2) {
                    near = true;
                    break;
                }
            if (near) continue;
            double prominence = k * sm.sigma();
            for (int[] q : kept)
                if (valleyDepth(v, w, p, q) < prominence) {
                    near = true;
                    break;
                }
            if (near) continue;
            kept.add(p);
            int x = p[0], y = p[1];
            float c = v[y * w + x];
            double dx = vertex(v[y * w + x - 1], c, v[y * w + x + 1]);
            double dy = vertex(v[(y - 1) * w + x], c, v[(y + 1) * w + x]);
            double xMm = (x + 0.5 + dx) / m.pxPerMm(), yMm = (y + 0.5 + dy) / m.pxPerMm();
            out.add(new Hotspot(xMm, yMm, c, partAt(parts, xMm, yMm)));
        }
        return out;
    }

    /**
     * How far the map dips below peak {@code p} along the straight path to the hotter peak {@code q}
     * (NaN pixels on the path count as a full separation).
     */
    static double valleyDepth(float[] v, int w, int[] p, int[] q) {
        float top = v[p[1] * w + p[0]];
        int steps = Math.max(Math.abs(q[0] - p[0]), Math.abs(q[1] - p[1]));
        double lowest = top;
        for (int i = 1; i < steps; i++) {
            int x = (int) Math.round(p[0] + (q[0] - p[0]) * (double) i / steps);
            int y = (int) Math.round(p[1] + (q[1] - p[1]) * (double) i / steps);
            float c = v[y * w + x];
            if (Float.isNaN(c)) return Double.POSITIVE_INFINITY;
            lowest = Math.min(lowest, c);
        }
        return top - lowest;
    }

    /** Parabola vertex offset in (-0.5, 0.5) through (-1, l), (0, c), (1, r); 0 when a neighbour is missing. */
    static double vertex(float l, float c, float r) {
        if (Float.isNaN(l) || Float.isNaN(r)) return 0;
        double den = l - 2.0 * c + r;
        if (!(den < 0)) return 0;
        double d = 0.5 * (l - r) / den;
        return Math.max(-0.5, Math.min(0.5, d));
    }

    /** The smallest marked part whose footprint holds the point; null when none does. */
    public static String partAt(List<Part> parts, double xMm, double yMm) {
        Part best = null;
        for (Part p : parts)
            if (p.contains(xMm, yMm) && (best == null || p.wMm() * p.hMm() < best.wMm() * best.hMm())) best = p;
        return best == null ? null : best.ref();
    }
}
