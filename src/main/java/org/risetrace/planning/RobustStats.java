package org.risetrace.planning;

import java.util.Arrays;

/**
 * Median, median absolute deviation and the modified z-score of Iglewicz and Hoaglin (How to Detect and Handle
 * Outliers, ASQC 1993): M = 0.6745 (x - median) / MAD, a reading being an outlier when |M| > 3.5. The factor 0.6745
 * is the normal distribution's 75th percentile, so MAD / 0.6745 estimates the standard deviation of normal data.
 */
public final class RobustStats {
    /** The normal distribution's 0.75 quantile (Iglewicz and Hoaglin 1993). */
    public static final double Z_75 = 0.6745;
    /** |M| above this is an outlier (Iglewicz and Hoaglin 1993). */
    public static final double OUTLIER_LIMIT = 3.5;

    private RobustStats() {
    }

    public static double median(double[] values) {
        if (values.length == 0) throw new IllegalArgumentException("no values");
        double[] s = values.clone();
        Arrays.sort(s);
        int n = s.length;
        return n % 2 == 1 ? s[n / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
    }

    /** Median of |x - median|. */
    public static double mad(double[] values) {
        double m = median(values);
        double[] d = new double[values.length];
        for (int i = 0; i < d.length; i++) d[i] = Math.abs(values[i] - m);
        return median(d);
    }

    /** The modified z-score of x against a median and MAD (infinite when MAD is 0 and x differs). */
    public static double modifiedZ(double x, double median, double mad) {
        double d = x - median;
        if (d == 0) return 0;
        return Z_75 * d / mad;
    }
}
