package org.risetrace.analysis;

import java.util.List;
import java.util.Locale;

/**
 * The decision rules, from measured noise only (no fixed temperature threshold anywhere):
 * <ol>
 * <li>{@code no-heating}: no part's rise crossed k sigma (no onset), no part's rate is k standard errors above zero,
 *     and the rise map has no hot spot.</li>
 * <li>{@code inconclusive}, "on no marked part": the strongest hot spot lies on no marked part and is clearly hotter
 *     than the leading part's own peak on the same smoothed map (by more than k sigma_map sqrt(2)).</li>
 * <li>{@code inconclusive}, "too little heating": the leader's rate is under k of its standard errors.</li>
 * <li>{@code inconclusive}, "level": leader minus runner-up is under {@code separationSigma} combined standard errors
 *     sqrt(se1^2 + se2^2).</li>
 * <li>{@code inconclusive}, "registration weak": more than {@code weakFractionLimit} of the used frames registered
 *     weakly and the lead is under twice {@code separationSigma} (the weak frames' residuals already widen every
 *     part's error through its position error, so a lead of twice the required separation survives them).</li>
 * <li>otherwise {@code identified}.</li>
 * </ol>
 */
public final class Verdicts {
    private Verdicts() {
    }

    /** What the rules look at for one part. */
    public record Candidate(String ref, Double rateKPerS, Double rateSe, boolean onset, double mapPeakK) {
    }

    /**
     * @param ranked       parts by rate, fastest first (parts without a rate last)
     * @param hotspots     hottest first
     * @param mapSigma     the smoothed rise map's sigma
     * @param weakFrames   used frames that registered weakly
     * @param usedFrames   used frames
     */
    public static Verdict decide(List<Candidate> ranked, List<Hotspot> hotspots, double mapSigma, int weakFrames,
                                 int usedFrames, AnalysisOptions o) {
        return decide(ranked, hotspots, mapSigma, weakFrames, usedFrames, o, "K/s");
    }

    /**
     * The same rules on another measure: {@code unit} "K/s" for initial rates, "K" when the candidates carry rises
     * (two-frame comparison) in place of rates.
     */
    public static Verdict decide(List<Candidate> ranked, List<Hotspot> hotspots, double mapSigma, int weakFrames,
                                 int usedFrames, AnalysisOptions o, String unit) {
        double k = o.kSigma();
        Candidate lead = ranked.isEmpty() ? null : ranked.get(0);
        Candidate second = ranked.size() > 1 ? ranked.get(1) : null;
        Double sep = null;
        if (lead != null && second != null && lead.rateKPerS() != null && second.rateKPerS() != null) {
            double se = Math.hypot(lead.rateSe(), second.rateSe());
            sep = se > 0 ? (lead.rateKPerS() - second.rateKPerS()) / se : null;
        }
        String leadRef = lead == null ? null : lead.ref();
        String secondRef = second == null ? null : second.ref();
        Double leadRate = lead == null ? null : lead.rateKPerS();

        boolean anyRise = !hotspots.isEmpty();
        for (Candidate c : ranked)
            if (c.onset() || significant(c, k)) anyRise = true;
        if (!anyRise)
            return new Verdict(VerdictStatus.NO_HEATING, null, leadRate, secondRef, sep,
                    "nothing rose above " + num(k) + " times the measured noise");

        Hotspot top = hotspots.isEmpty() ? null : hotspots.get(0);
        if (top != null && top.ref() == null
                && (lead == null || top.riseK() - lead.mapPeakK() > k * mapSigma * Math.sqrt(2) || !Double.isFinite(lead.mapPeakK())))
            return new Verdict(VerdictStatus.INCONCLUSIVE, leadRef, leadRate, secondRef, sep,
                    String.format(Locale.ROOT, "the hottest spot, at %.1f, %.1f mm (rise %.2f K), is on no marked part:"
                            + " mark the part there and analyse again", top.xMm(), top.yMm(), top.riseK()));
        if (lead == null)
            return new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null, "the board file marks no parts");
        if (!significant(lead, k))
            return new Verdict(VerdictStatus.INCONCLUSIVE, leadRef, leadRate, secondRef, sep,
                    "too little heating: the fastest part, " + leadRef + (unit.equals("K") ? ", rose by " : ", rises at ") + rate(lead, unit)
                            + ", under " + num(k) + " standard errors from zero");
        if (sep != null && sep < o.separationSigma())
            return new Verdict(VerdictStatus.INCONCLUSIVE, leadRef, leadRate, secondRef, sep,
                    "two parts level: " + leadRef + " (" + rate(lead, unit) + ") and " + secondRef + " (" + rate(second, unit)
                            + ") differ by " + num(sep) + " combined standard errors, under " + num(o.separationSigma()));
        boolean clearLead = sep == null || sep >= 2 * o.separationSigma();
        if (usedFrames > 0 && weakFrames > o.weakFractionLimit() * usedFrames && !clearLead)
            return new Verdict(VerdictStatus.INCONCLUSIVE, leadRef, leadRate, secondRef, sep,
                    "registration weak in " + weakFrames + " of " + usedFrames + " frames: " + leadRef
                            + " leads, but check the alignment and capture again with the camera held still");
        return new Verdict(VerdictStatus.IDENTIFIED, leadRef, leadRate, secondRef, sep,
                leadRef + (unit.equals("K") ? " warmed most: " : " heats fastest: ") + rate(lead, unit)
                        + (sep == null ? "" : ", " + num(sep) + " combined standard errors ahead of " + secondRef));
    }

    static boolean significant(Candidate c, double k) {
        return c.rateKPerS() != null && c.rateSe() != null && c.rateKPerS() > k * c.rateSe();
    }

    private static String rate(Candidate c, String unit) {
        return String.format(Locale.ROOT, "%.4f ± %.4f %s", c.rateKPerS(), c.rateSe(), unit);
    }

    private static String num(double v) {
        return String.format(Locale.ROOT, "%.1f", v);
    }
}
