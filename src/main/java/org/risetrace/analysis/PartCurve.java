package org.risetrace.analysis;

import java.util.Arrays;

/**
 * One part's rise over the series and the numbers measured on it, computed from the sampled footprint statistic
 * and the ambient of every used frame.
 *
 * <p>Rise: dT(t) = T_part(t) - T_part(base) - (T_amb(t) - T_amb(base)), base = mean over the baseline frames, so an
 * ambient drift common to part and background cancels. Noise sigma: the standard deviation of the rise over the
 * baseline frames when there are at least {@link #MIN_BASELINE_FOR_NOISE}; otherwise the frame-to-frame residual,
 * sigma = 1.4826 MAD(d2) / sqrt(6) over second differences d2 = dT(i+1) - 2 dT(i) + dT(i-1) (white noise of
 * variance sigma^2 gives var(d2) = 6 sigma^2; second differences cancel a steady rise, and the median absolute
 * deviation, scaled by 1.4826 for a normal distribution, ignores the few frames where the curve bends).
 *
 * @param riseK      rise per used frame (NaN where the footprint was outside the frame)
 * @param baselineC  the part's baseline temperature (mean of the baseline frames)
 * @param noiseK     measured noise sigma of the rise
 * @param onsetS     series time of the first of {@code onsetFrames} consecutive frames above k sigma; null if none
 *                   or when the end rise is not above k sigma (the part did not stay heated)
 * @param rate       initial rate fit over the early window (null when too few frames)
 * @param fit        the rise model with one or two time constants (null when the part shows no onset or no model
 *                   is determined; {@link RiseModelFit} states the choice)
 * @param endRiseK   mean rise over the last frames
 */
public record PartCurve(double[] riseK, double baselineC, double noiseK, Double onsetS, LineFit rate,
                        RiseModelFit fit, double endRiseK) {

    public static final int MIN_BASELINE_FOR_NOISE = 5;

    /**
     * @param tS         times of the used frames, ascending
     * @param partC      the part's footprint statistic per frame (NaN allowed)
     * @param ambientC   ambient per frame (NaN where unknown; all NaN or null: no ambient correction)
     * @param weight     relative weight of each frame in the rate fit (null: equal)
     * @param baseline   the first {@code baseline} frames are the baseline (at least 1)
     * @param tStartS    injection start: rates and fits use frames after it
     */
    public static PartCurve measure(double[] tS, double[] partC, double[] ambientC, double[] weight, int baseline,
                                    double tStartS, AnalysisOptions o) {
        return measure(tS, partC, ambientC, weight, baseline, tStartS, o.rateWindowS(), 0, o);
    }

    /**
     * @param windowS          rate window length (at least {@code minRateFrames} frames are used)
     * @param positionErrorK   how far the part's reading can move through registration and resampling alone; the
     *                         rate's error gets a floor of positionErrorK / (window duration), added in quadrature
     */
    public static PartCurve measure(double[] tS, double[] partC, double[] ambientC, double[] weight, int baseline,
                                    double tStartS, double windowS, double positionErrorK, AnalysisOptions o) {
        return measure(tS, partC, ambientC, weight, baseline, tStartS, windowS, positionErrorK, o, true);
    }

    /** As above; without the rise model when {@code fitRise} is false (a caller that has it from another window). */
    static PartCurve measure(double[] tS, double[] partC, double[] ambientC, double[] weight, int baseline,
                             double tStartS, double windowS, double positionErrorK, AnalysisOptions o, boolean fitRise) {
        int n = tS.length;
        baseline = Math.max(1, Math.min(baseline, n));
        double[] amb = fillAmbient(ambientC, n, baseline);
        double base = meanFinite(partC, 0, baseline), ambBase = meanFinite(amb, 0, baseline);
        double[] rise = new double[n];
        for (int i = 0; i < n; i++) rise[i] = partC[i] - base - (amb[i] - ambBase);
        double noise = noise(rise, baseline);

        Double onset = null;
        int run = 0;
        for (int i = baseline; i < n; i++) {
            if (tS[i] <= tStartS) continue;
            run = rise[i] > o.kSigma() * noise ? run + 1 : 0;
            if (run >= o.onsetFrames()) {
                onset = tS[i - o.onsetFrames() + 1];
                break;
            }
        }

        int[] span = rateSpan(tS, tStartS, windowS, o.minRateFrames());
        int from = span[0], to = span[1];
        LineFit rate = LineFit.fit(tS, rise, weight, from, to, noise);
        if (rate != null) rate = rate.widenedForSerialCorrelation(rate.residualLag1(tS, rise, weight, from, to));
        if (rate != null && positionErrorK > 0 && to - 1 > from) {
            double floor = positionErrorK / (tS[to - 1] - tS[from]);
            rate = new LineFit(rate.intercept(), rate.slope(), Math.hypot(rate.slopeSe(), floor), rate.residualSigma(), rate.n());
        }

        int last = Math.max(baseline, n - o.lastFrames());
        double end = meanFinite(rise, Math.min(last, n - 1), n);
        // a part heated only if it is still risen at the end: a few noisy frames above threshold on a part whose
        // end rise is under k sigma (or negative) are no onset
        if (onset != null && !(end > o.kSigma() * noise)) onset = null;

        // only a part that heated is fitted; RiseModelFit drops a model the series does not determine (a curve
        // still straight at its end, a second constant not told apart from the first)
        RiseModelFit fit = onset == null || !fitRise ? null : RiseModelFit.fit(tS, rise, tStartS);

        return new PartCurve(rise, base, noise, onset, rate, fit, end);
    }

    /**
     * The frames a rate is fitted over: {from, to} (to exclusive), the frames after the injection start up to
     * tStartS + windowS, widened to at least minFrames of them where the series holds them. A window of a few
     * seconds on a series of one frame a second is widened past its nominal length; {@link #rateSpanS} says how far.
     */
    static int[] rateSpan(double[] tS, double tStartS, double windowS, int minFrames) {
        int n = tS.length, from = 0;
        while (from < n && tS[from] <= tStartS) from++;
        int to = from;
        while (to < n && (tS[to] <= tStartS + windowS || to - from < minFrames)) to++;
        return new int[]{from, to};
    }

    /**
     * The window a rate was actually fitted over, in seconds after the injection start: to the last frame of {@link
     * #rateSpan} (NaN when it holds no frame).
     */
    static double rateSpanS(double[] tS, double tStartS, double windowS, int minFrames) {
        int[] span = rateSpan(tS, tStartS, windowS, minFrames);
        return span[1] > span[0] ? tS[span[1] - 1] - tStartS : Double.NaN;
    }

    /** The same curve with another rise model (the rise and the onset do not depend on the rate window). */
    PartCurve withFit(RiseModelFit other) {
        return new PartCurve(riseK, baselineC, noiseK, onsetS, rate, other, endRiseK);
    }

    /** Ambient with gaps filled by the last known value; zeros (no correction) when it is unknown in the baseline. */
    static double[] fillAmbient(double[] ambientC, int n, int baseline) {
        double[] amb = new double[n];
        if (ambientC == null || !Double.isFinite(meanFinite(ambientC, 0, baseline))) return amb;
        double last = meanFinite(ambientC, 0, baseline);
        for (int i = 0; i < n; i++) {
            if (Double.isFinite(ambientC[i])) last = ambientC[i];
            amb[i] = last;
        }
        return amb;
    }

    static double noise(double[] rise, int baseline) {
        if (baseline >= MIN_BASELINE_FOR_NOISE) {
            double m = meanFinite(rise, 0, baseline), ss = 0;
            int k = 0;
            for (int i = 0; i < baseline; i++)
                if (Double.isFinite(rise[i])) {
                    ss += (rise[i] - m) * (rise[i] - m);
                    k++;
                }
            if (k >= MIN_BASELINE_FOR_NOISE) return Math.sqrt(ss / (k - 1));
        }
        return secondDifferenceSigma(rise);
    }

    /** 1.4826 MAD(d2) / sqrt(6); NaN with fewer than 3 finite consecutive values. */
    static double secondDifferenceSigma(double[] y) {
        double[] d2 = new double[Math.max(0, y.length - 2)];
        int k = 0;
        for (int i = 1; i + 1 < y.length; i++) {
            double d = y[i + 1] - 2 * y[i] + y[i - 1];
            if (Double.isFinite(d)) d2[k++] = d;
        }
        if (k == 0) return Double.NaN;
        return 1.4826 * mad(d2, k) / Math.sqrt(6);
    }

    static double mad(double[] v, int n) {
        double[] a = Arrays.copyOf(v, n);
        double med = median(a, n);
        for (int i = 0; i < n; i++) a[i] = Math.abs(a[i] - med);
        return median(a, n);
    }

    static double median(double[] a, int n) {
        Arrays.sort(a, 0, n);
        return (n & 1) == 1 ? a[n / 2] : 0.5 * (a[n / 2 - 1] + a[n / 2]);
    }

    static double meanFinite(double[] v, int from, int to) {
        double s = 0;
        int k = 0;
        for (int i = from; i < to; i++)
            if (Double.isFinite(v[i])) {
                s += v[i];
                k++;
            }
        return k == 0 ? Double.NaN : s / k;
    }
}
