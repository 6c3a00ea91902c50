package org.risetrace.analysis;

/**
 * Straight line y = a + b t by weighted least squares, with the standard error of the slope.
 *
 * <p>The slope's variance is s^2 / S_tt with S_tt = sum w (t - t_w)^2 and s^2 = sum w r^2 / (n - 2), the ordinary
 * least-squares result (Draper and Smith, Applied Regression Analysis, ch. 1 and 9) with weights; with all weights
 * equal it reduces to the textbook OLS formula. {@code noiseFloor} lets the caller refuse a residual variance
 * smaller than the noise it measured independently (few points can scatter less than the noise by chance).
 *
 * @param intercept a
 * @param slope     b
 * @param slopeSe   standard error of b
 * @param residualSigma s, the weighted residual standard deviation
 * @param n         points used
 */
public record LineFit(double intercept, double slope, double slopeSe, double residualSigma, int n) {

    /** Fits points i in [from, to) where weight &gt; 0 and y is finite; needs at least 3 points, else null. */
    public static LineFit fit(double[] t, double[] y, double[] weight, int from, int to, double noiseFloor) {
        double sw = 0, swt = 0, swy = 0;
        int n = 0;
        for (int i = from; i < to; i++) {
            double w = weight == null ? 1 : weight[i];
            if (!(w > 0) || !Double.isFinite(y[i])) continue;
            sw += w;
            swt += w * t[i];
            swy += w * y[i];
            n++;
        }
        if (n < 3) return null;
        double tm = swt / sw, ym = swy / sw;
        double stt = 0, sty = 0;
        for (int i = from; i < to; i++) {
            double w = weight == null ? 1 : weight[i];
            if (!(w > 0) || !Double.isFinite(y[i])) continue;
            double dt = t[i] - tm;
            stt += w * dt * dt;
            sty += w * dt * (y[i] - ym);
        }
        if (!(stt > 0)) return null;
        double b = sty / stt, a = ym - b * tm;
        double ssr = 0;
        for (int i = from; i < to; i++) {
            double w = weight == null ? 1 : weight[i];
            if (!(w > 0) || !Double.isFinite(y[i])) continue;
            double r = y[i] - a - b * t[i];
            ssr += w * r * r;
        }
        // weights are relative: with them scaled to a mean of 1, s keeps the unit of y and the floor compares
        double scale = n / sw;
        double s2 = ssr * scale / (n - 2);
        double floor2 = noiseFloor > 0 ? noiseFloor * noiseFloor : 0;
        double se = Math.sqrt(Math.max(s2, floor2) / (stt * scale));
        double sigma = Math.sqrt(s2);
        return new LineFit(a, b, se, sigma, n);
    }

    /**
     * Lag-1 autocorrelation of this fit's residuals over the same points (0 when fewer than 4). Used to widen the
     * slope's error for serially correlated noise: with AR(1) residuals of correlation r the effective number of
     * independent points is n (1 - r) / (1 + r) (Bence 1995, Can. J. Fish. Aquat. Sci. 52; Santer et al. 2000,
     * J. Geophys. Res. 105), so the standard error grows by sqrt((1 + r) / (1 - r)).
     */
    public double residualLag1(double[] t, double[] y, double[] weight, int from, int to) {
        double prev = Double.NaN, num = 0, den = 0;
        int m = 0;
        for (int i = from; i < to; i++) {
            double w = weight == null ? 1 : weight[i];
            if (!(w > 0) || !Double.isFinite(y[i])) continue;
            double r = y[i] - intercept - slope * t[i];
            den += r * r;
            if (Double.isFinite(prev)) num += r * prev;
            prev = r;
            m++;
        }
        return m < 4 || den <= 0 ? 0 : num / den;
    }

    /** The same fit with its slope error widened for AR(1) residuals (r clipped to [0, 0.8]). */
    public LineFit widenedForSerialCorrelation(double lag1) {
        double r = Math.max(0, Math.min(0.8, lag1));
        return new LineFit(intercept, slope, slopeSe * Math.sqrt((1 + r) / (1 - r)), residualSigma, n);
    }
}
