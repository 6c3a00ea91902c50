package org.risetrace.analysis;

import org.risetrace.board.Area;
import org.risetrace.board.Board;
import org.risetrace.frame.Frame;
import org.risetrace.numeric.OrderStatistics;
import org.risetrace.registration.Homography;

import java.util.Arrays;
import java.util.List;

/**
 * Ambient temperature of one frame: the median of the frame sampled at fixed board points, mapped into the frame
 * with the frame's board-to-frame homography and interpolated bilinearly. The points are those of the board file's
 * ambient areas when it has any; otherwise a band of background just outside the outline, from {@code gapMm} to
 * {@code gapMm + bandMm} beyond the board edge. The band lies outside the board, so it is not in the rectified
 * board raster: it is sampled in frame space instead. The median keeps a warm cable or a hand at the edge of the
 * band from moving the value.
 */
public final class AmbientSampler {
    /** Points closer than this are not needed: one sample per half millimetre is plenty for a median. */
    static final double SPACING_MM = 0.5;
    /** Fewer valid points than this in a frame and its ambient is unknown. */
    static final int MIN_POINTS = 16;

    private final double[] xMm, yMm;
    private final float[] buffer;
    private final String source;

    private AmbientSampler(double[] xMm, double[] yMm, String source) {
        this.xMm = xMm;
        this.yMm = yMm;
        this.buffer = new float[xMm.length];
        this.source = source;
    }

    /** Areas from the board file when present, else the background band. */
    public static AmbientSampler forBoard(Board board, double gapMm, double bandMm) {
        List<Area> areas = board.ambientOrEmpty();
        return areas.isEmpty() ? band(board.widthMm(), board.heightMm(), gapMm, bandMm) : areas(areas);
    }

    static AmbientSampler areas(List<Area> areas) {
        int n = 0;
        double[] xs = new double[64], ys = new double[64];
        for (Area a : areas) {
            int nx = Math.max(1, (int) Math.round(a.wMm() / SPACING_MM)), ny = Math.max(1, (int) Math.round(a.hMm() / SPACING_MM));
            for (int j = 0; j < ny; j++)
                for (int i = 0; i < nx; i++) {
                    if (n == xs.length) {
                        xs = Arrays.copyOf(xs, n * 2);
                        ys = Arrays.copyOf(ys, n * 2);
                    }
                    xs[n] = a.xMm() - a.wMm() / 2 + (i + 0.5) * a.wMm() / nx;
                    ys[n] = a.yMm() - a.hMm() / 2 + (j + 0.5) * a.hMm() / ny;
                    n++;
                }
        }
        return new AmbientSampler(Arrays.copyOf(xs, n), Arrays.copyOf(ys, n), "ambient areas of the board file");
    }

    static AmbientSampler band(double widthMm, double heightMm, double gapMm, double bandMm) {
        double x0 = -gapMm - bandMm, x1 = widthMm + gapMm + bandMm;
        double y0 = -gapMm - bandMm, y1 = heightMm + gapMm + bandMm;
        int nx = (int) Math.ceil((x1 - x0) / SPACING_MM), ny = (int) Math.ceil((y1 - y0) / SPACING_MM);
        double[] xs = new double[nx * ny], ys = new double[nx * ny];
        int n = 0;
        for (int j = 0; j < ny; j++)
            for (int i = 0; i < nx; i++) {
                double x = x0 + (i + 0.5) * SPACING_MM, y = y0 + (j + 0.5) * SPACING_MM;
                boolean nearBoard = x > -gapMm && x < widthMm + gapMm && y > -gapMm && y < heightMm + gapMm;
                if (nearBoard) continue;
                xs[n] = x;
                ys[n] = y;
                n++;
            }
        return new AmbientSampler(Arrays.copyOf(xs, n), Arrays.copyOf(ys, n),
                "background band " + gapMm + " to " + (gapMm + bandMm) + " mm outside the outline");
    }

    /** Where the ambient comes from, in words for the report. */
    public String source() { return source; }

    public int points() { return xMm.length; }

    /** Median over the valid points, NaN when fewer than {@link #MIN_POINTS} fall inside the frame. Not thread-safe. */
    public double sample(Frame frame, Homography boardToFrame) {
        double[] h = boardToFrame.values();
        int w = frame.width(), ht = frame.height(), n = 0;
        float[] c = frame.celsius();
        for (int k = 0; k < xMm.length; k++) {
            double x = xMm[k], y = yMm[k];
            double s = h[6] * x + h[7] * y + h[8];
            // frame pixel centres at integer coordinates (the registration stage's convention)
            double u = (h[0] * x + h[1] * y + h[2]) / s, v = (h[3] * x + h[4] * y + h[5]) / s;
            if (!(u >= 0 && v >= 0 && u < w - 1 && v < ht - 1)) continue;
            int iu = (int) u, iv = (int) v;
            double fu = u - iu, fv = v - iv;
            int o = iv * w + iu;
            double val = (1 - fv) * ((1 - fu) * c[o] + fu * c[o + 1]) + fv * ((1 - fu) * c[o + w] + fu * c[o + w + 1]);
            if (Double.isNaN(val)) continue;
            buffer[n++] = (float) val;
        }
        if (n < MIN_POINTS) return Double.NaN;
        return OrderStatistics.median(buffer, n);
    }
}
