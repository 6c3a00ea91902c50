package org.risetrace.analysis;

/**
 * A part's rise above ambient over time, and its first-order fit where one was made.
 *
 * @param ref    designator
 * @param tS     frame times (used frames only)
 * @param riseK  rise above ambient at each time
 * @param fitT0S fit start time t0 (null when not fitted)
 * @param fitTauS fit time constant (null when not fitted)
 * @param fitDtInfK fit final rise (null when not fitted)
 */
public record RiseCurve(String ref, double[] tS, double[] riseK, Double fitT0S, Double fitTauS, Double fitDtInfK) {

    /** Value of the first-order fit at t (0 before t0); NaN without a fit. */
    public double fitAt(double t) {
        if (fitT0S == null || fitTauS == null || fitDtInfK == null) return Double.NaN;
        return t <= fitT0S ? 0.0 : fitDtInfK * (1 - Math.exp(-(t - fitT0S) / fitTauS));
    }
}
