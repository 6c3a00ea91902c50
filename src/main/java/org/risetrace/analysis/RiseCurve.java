package org.risetrace.analysis;

import java.util.List;

/**
 * A part's rise above ambient over time, and the rise model fitted to it where one was made.
 *
 * @param ref    designator
 * @param tS     frame times (used frames only)
 * @param riseK  rise above ambient at each time
 * @param onsetS series time of the part's onset (null: it never rose above its noise)
 * @param fit    the chosen rise model (null when not fitted; never without an onset)
 */
public record RiseCurve(String ref, double[] tS, double[] riseK, Double onsetS, RiseModelFit fit) {

    public RiseCurve {
        // only a part that heated has a curve to fit: a fit without an onset is dropped here, whoever made it
        if (onsetS == null) fit = null;
    }

    /**
     * A curve with a one-time-constant fit dT_inf (1 - exp(-(t - t0)/tau)), or with none when any of the three is
     * null (the form of earlier versions; the onset is then taken as t0).
     */
    public RiseCurve(String ref, double[] tS, double[] riseK, Double fitT0S, Double fitTauS, Double fitDtInfK) {
        this(ref, tS, riseK, fitT0S == null || fitTauS == null || fitDtInfK == null ? null : fitT0S,
                fitT0S == null || fitTauS == null || fitDtInfK == null ? null
                        : new RiseModelFit(RiseModelFit.SINGLE, fitT0S,
                        List.of(new RiseModelFit.Term(fitDtInfK, Double.NaN, fitTauS, Double.NaN)), fitDtInfK,
                        Double.NaN, Double.NaN, 0, null, null, "one time constant"));
    }

    /** Value of the fitted model at t (0 before t0); NaN without a fit. */
    public double fitAt(double t) {
        return fit == null ? Double.NaN : fit.at(t);
    }
}
