package org.risetrace.analysis;

import java.util.Arrays;

/**
 * Per board pixel accumulators, updated frame by frame in time order so the series never has to be held in memory:
 * running sums for the baseline mean and the mean of the last frames (the rise map), and the onset time of each
 * pixel (the first of {@code onsetFrames} consecutive frames whose rise exceeds k times the pixel noise).
 *
 * <p>Pixel noise is one number for the board: 1.4826 MAD(T1 - T0) / sqrt(2) over the valid pixels of the first two
 * frames (the difference of two frames of white noise has twice the variance; the median absolute deviation,
 * scaled by 1.4826, ignores the few pixels that moved or warmed).
 */
public final class RiseMaps {
    private final int width, height;
    private final double pxPerMm;
    private final double[] baseSum, lastSum;
    private final int[] baseCount, lastCount;
    private final short[] run;
    private final float[] onsetS, runStartS;
    private float[] first;
    private double pixelSigma = Double.NaN;
    private double ambBaseSum, ambLastSum;
    private int ambBaseCount, ambLastCount;
    private int framesSeen;
    private final double kSigma;
    private final int onsetFrames;
    private final double tStartS;
    private final int lastFrames;
    private final java.util.ArrayDeque<Object[]> recent = new java.util.ArrayDeque<>();

    public RiseMaps(int width, int height, double pxPerMm, double kSigma, int onsetFrames, double tStartS, int lastFrames) {
        this.lastFrames = lastFrames;
        this.width = width;
        this.height = height;
        this.pxPerMm = pxPerMm;
        int n = width * height;
        baseSum = new double[n];
        lastSum = new double[n];
        baseCount = new int[n];
        lastCount = new int[n];
        run = new short[n];
        onsetS = new float[n];
        runStartS = new float[n];
        Arrays.fill(onsetS, Float.NaN);
        this.kSigma = kSigma;
        this.onsetFrames = onsetFrames;
        this.tStartS = tStartS;
    }

    /**
     * Adds one rectified frame. Frames must come in time order, baseline frames first.
     *
     * @param celsius   board raster (NaN where invalid)
     * @param valid     validity mask (may be null)
     * @param ambientC  the frame's ambient (NaN: unknown, treated as no change)
     * @param baseline  true for a baseline frame
     * @param last      ignored: the last frames are the last {@code lastFrames} used non-baseline frames
     */
    public void add(float[] celsius, boolean[] valid, double tS, double ambientC, boolean baseline, boolean last) {
        int n = baseSum.length;
        if (framesSeen == 0) first = celsius.clone();
        else if (framesSeen == 1) pixelSigma = differenceSigma(first, celsius);
        if (framesSeen >= 1) first = null;
        framesSeen++;
        if (baseline) {
            for (int k = 0; k < n; k++)
                if ((valid == null || valid[k]) && !Float.isNaN(celsius[k])) {
                    baseSum[k] += celsius[k];
                    baseCount[k]++;
                }
            if (Double.isFinite(ambientC)) {
                ambBaseSum += ambientC;
                ambBaseCount++;
            }
            return;
        }
        double ambDelta = ambBaseCount > 0 && Double.isFinite(ambientC) ? ambientC - ambBaseSum / ambBaseCount : 0;
        // the last frames are the last lastFrames used frames: kept (a few rasters) until the series ends, since
        // frames near the end may still fail registration
        recent.addLast(new Object[]{celsius, valid, ambientC});
        if (recent.size() > lastFrames) recent.removeFirst();
        if (tS <= tStartS || !(pixelSigma > 0)) return;
        float threshold = (float) (kSigma * pixelSigma);
        float since = (float) (tS - tStartS);
        for (int k = 0; k < n; k++) {
            if (!Float.isNaN(onsetS[k]) || baseCount[k] == 0) continue;
            float v = celsius[k];
            if ((valid != null && !valid[k]) || Float.isNaN(v)) {
                run[k] = 0;
                continue;
            }
            double rise = v - baseSum[k] / baseCount[k] - ambDelta;
            if (rise > threshold) {
                if (run[k] == 0) runStartS[k] = since;
                if (run[k] < Short.MAX_VALUE) run[k]++;
                if (run[k] >= onsetFrames) onsetS[k] = runStartS[k];
            } else {
                run[k] = 0;
            }
        }
    }

    static double differenceSigma(float[] a, float[] b) {
        double[] d = new double[a.length];
        int k = 0;
        for (int i = 0; i < a.length; i++) {
            float v = b[i] - a[i];
            if (!Float.isNaN(v)) d[k++] = v;
        }
        if (k < 8) return Double.NaN;
        return 1.4826 * PartCurve.mad(d, k) / Math.sqrt(2);
    }

    public double pixelSigma() { return pixelSigma; }

    /** Mean of the last frames minus the baseline mean, ambient change removed; NaN where either is missing. */
    public float[] riseMap() {
        int n = baseSum.length;
        java.util.Arrays.fill(lastSum, 0);
        java.util.Arrays.fill(lastCount, 0);
        ambLastSum = 0;
        ambLastCount = 0;
        for (Object[] r : recent) {
            float[] celsius = (float[]) r[0];
            boolean[] valid = (boolean[]) r[1];
            double ambientC = (Double) r[2];
            for (int k = 0; k < n; k++)
                if ((valid == null || valid[k]) && !Float.isNaN(celsius[k])) {
                    lastSum[k] += celsius[k];
                    lastCount[k]++;
                }
            if (Double.isFinite(ambientC)) {
                ambLastSum += ambientC;
                ambLastCount++;
            }
        }
        float[] out = new float[n];
        double ambDelta = ambBaseCount > 0 && ambLastCount > 0 ? ambLastSum / ambLastCount - ambBaseSum / ambBaseCount : 0;
        for (int k = 0; k < n; k++)
            out[k] = baseCount[k] == 0 || lastCount[k] == 0 ? Float.NaN
                    : (float) (lastSum[k] / lastCount[k] - baseSum[k] / baseCount[k] - ambDelta);
        return out;
    }

    /** The baseline mean per pixel (NaN where no baseline frame covered it). */
    public float[] baselineMean() {
        float[] out = new float[baseSum.length];
        for (int k = 0; k < out.length; k++) out[k] = baseCount[k] == 0 ? Float.NaN : (float) (baseSum[k] / baseCount[k]);
        return out;
    }

    /** Seconds from the injection start at which each pixel's rise began; NaN where it never did. */
    public BoardMap onsetMap() {
        return new BoardMap(width, height, pxPerMm, onsetS.clone(), "s");
    }

    public int width() { return width; }
    public int height() { return height; }
    public double pxPerMm() { return pxPerMm; }
}
