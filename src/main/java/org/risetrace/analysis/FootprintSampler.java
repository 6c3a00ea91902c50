package org.risetrace.analysis;

import org.risetrace.board.Part;
import org.risetrace.numeric.OrderStatistics;
import org.risetrace.registration.BoardRaster;

import java.util.Arrays;
import java.util.List;

/**
 * Samples every marked part's footprint in a board-space raster: maximum, mean, 95th percentile and the fraction of
 * footprint pixels that fell inside the frame. The pixel index list of each part is computed once per raster
 * geometry; sampling a frame is then a loop over those indices with one reused buffer.
 *
 * <p>The ranking statistic is the 95th percentile: a small hot die under a larger package shows as a few hot
 * pixels, which the mean dilutes, while the maximum follows single noisy pixels (common practice in thermography:
 * a robust high percentile).
 */
public final class FootprintSampler {
    /** Statistic index in {@link #sample} output. */
    public static final int MAX = 0, MEAN = 1, P95 = 2, VALID = 3, STATS = 4;

    private final int width, height;
    private final double pxPerMm;
    private final int[][] indices;
    private final float[] buffer;

    public FootprintSampler(List<Part> parts, int width, int height, double pxPerMm) {
        this.width = width;
        this.height = height;
        this.pxPerMm = pxPerMm;
        indices = new int[parts.size()][];
        int longest = 1;
        for (int p = 0; p < parts.size(); p++) {
            indices[p] = footprint(parts.get(p), width, height, pxPerMm);
            longest = Math.max(longest, indices[p].length);
        }
        buffer = new float[longest];
    }

    /**
     * Row-major board pixel indices whose centres lie inside the part shrunk by one board pixel on every side (so
     * that the optics' blur does not spill a hot neighbour into the footprint); the unshrunk part when that leaves
     * no pixel, and the nearest pixel when even that holds none.
     */
    static int[] footprint(Part part, int width, int height, double pxPerMm) {
        double m = 1.0 / pxPerMm;
        if (part.wMm() - 2 * m > m && part.hMm() - 2 * m > m) {
            Part inner = new Part(part.ref(), part.kind(), part.material(), part.xMm(), part.yMm(),
                    part.wMm() - 2 * m, part.hMm() - 2 * m, part.rotationDeg());
            int[] in = rectangle(inner, width, height, pxPerMm);
            if (in.length > 0) return in;
        }
        return rectangle(part, width, height, pxPerMm);
    }

    private static int[] rectangle(Part part, int width, int height, double pxPerMm) {
        double r = 0.5 * Math.hypot(part.wMm(), part.hMm());
        int i0 = Math.max(0, (int) Math.floor((part.xMm() - r) * pxPerMm));
        int i1 = Math.min(width - 1, (int) Math.ceil((part.xMm() + r) * pxPerMm));
        int j0 = Math.max(0, (int) Math.floor((part.yMm() - r) * pxPerMm));
        int j1 = Math.min(height - 1, (int) Math.ceil((part.yMm() + r) * pxPerMm));
        int[] out = new int[Math.max(0, (i1 - i0 + 1) * (j1 - j0 + 1))];
        int n = 0;
        for (int j = j0; j <= j1; j++)
            for (int i = i0; i <= i1; i++)
                if (part.contains((i + 0.5) / pxPerMm, (j + 0.5) / pxPerMm)) out[n++] = j * width + i;
        if (n == 0) {
            int i = (int) Math.floor(part.xMm() * pxPerMm), j = (int) Math.floor(part.yMm() * pxPerMm);
            if (i < 0 || j < 0 || i >= width || j >= height) return new int[0];
            return new int[]{j * width + i};
        }
        return Arrays.copyOf(out, n);
    }

    public int parts() { return indices.length; }

    /** The footprint pixel indices of part p (do not modify). */
    public int[] indices(int p) { return indices[p]; }

    public boolean fits(BoardRaster raster) {
        return raster.width() == width && raster.height() == height && raster.pxPerMm() == pxPerMm;
    }

    /**
     * Writes, for every part p, {@code out[p * STATS + MAX|MEAN|P95|VALID]}; NaN statistics where no footprint
     * pixel is valid. Not thread-safe (one reused buffer): one sampler per thread.
     */
    public void sample(float[] celsius, boolean[] valid, double[] out) {
        for (int p = 0; p < indices.length; p++) {
            int[] idx = indices[p];
            int n = 0;
            double sum = 0;
            float max = Float.NEGATIVE_INFINITY;
            for (int k : idx) {
                float v = celsius[k];
                if ((valid != null && !valid[k]) || Float.isNaN(v)) continue;
                buffer[n++] = v;
                sum += v;
                if (v > max) max = v;
            }
            int o = p * STATS;
            out[o + VALID] = idx.length == 0 ? 0 : (double) n / idx.length;
            if (n == 0) {
                out[o + MAX] = out[o + MEAN] = out[o + P95] = Double.NaN;
                continue;
            }
            out[o + MAX] = max;
            out[o + MEAN] = sum / n;
            out[o + P95] = OrderStatistics.percentile(buffer, n, 0.95);
        }
    }

    /**
     * How far part p's 95th percentile moves when the sampling grid moves by half a board pixel, in K: the largest
     * |S(half shift) - S| over half-pixel shifts left, right, up and down of the given raster (the baseline mean),
     * a half-pixel shift by bilinear interpolation being the mean of a pixel and its neighbour. Bilinear resampling
     * of a sharp detail (a reflective termination, a small bright package) loses more or less of its peak with the
     * sub-pixel phase of the grid, so camera drift alone can move a small part's reading by this much.
     */
    public double halfPixelSensitivity(float[] celsius, int p) {
        double s0 = shifted(celsius, p, 0, 0), worst = 0;
        if (!Double.isFinite(s0)) return 0;
        int[][] d = {{1, 0}, {-1, 0}, {0, 1}, {0, -1}};
        for (int[] dd : d) {
            double v = shifted(celsius, p, dd[0], dd[1]);
            if (Double.isFinite(v)) worst = Math.max(worst, Math.abs(v - s0));
        }
        return worst;
    }

    /** p95 over the footprint of the raster shifted by half a pixel towards (dx, dy) (bilinear: neighbour mean). */
    private double shifted(float[] celsius, int p, int dx, int dy) {
        int n = 0;
        for (int k : indices[p]) {
            int x = k % width + dx, y = k / width + dy;
            if (x < 0 || y < 0 || x >= width || y >= height) continue;
            float v = 0.5f * (celsius[k] + celsius[y * width + x]);
            if (!Float.isNaN(v)) buffer[n++] = v;
        }
        return n == 0 ? Double.NaN : OrderStatistics.percentile(buffer, n, 0.95);
    }
}
