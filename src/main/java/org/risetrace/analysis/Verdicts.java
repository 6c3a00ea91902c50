package org.risetrace.analysis;

import org.risetrace.board.Part;

import java.util.List;
import java.util.Locale;

/**
 * The decision rules, from measured noise only (no fixed temperature threshold anywhere):
 * <ol>
 * <li>{@code inconclusive}, "the data cannot decide": too few usable frames, none after the injection start, or no
 *     marked part visible at all ({@link #insufficientEvidence}).</li>
 * <li>{@code no-heating}: no part's rise crossed k sigma (no onset), no part's rate is k standard errors above zero,
 *     and the rise map has no hot spot.</li>
 * <li>{@code inconclusive}, "on no marked part": the strongest hot spot lies on no marked part, farther than two
 *     optical blur sigmas from every footprint (nearer, it is a marked part's heat spread by the optics), and is clearly hotter
 *     than the leading part's own peak on the same smoothed map (by more than k sigma_map sqrt(2)).</li>
 * <li>{@code inconclusive}, "too little heating": the leader's rate is under k of its standard errors.</li>
 * <li>{@code inconclusive}, "level": leader minus runner-up is under {@code separationSigma} combined standard errors
 *     sqrt(se1^2 + se2^2), the leader's rate taken at its least favourable emissivity (e + u) and the runner-up's at
 *     its most favourable (e - u), each standard error at that emissivity. The emissivity uncertainty is a scale
 *     error: it cannot make a zero rise non-zero, so it does not enter the "too little heating" test.</li>
 * <li>otherwise {@code identified}; when more than {@code weakFractionLimit} of the used frames registered weakly,
 *     the reason says so. Weak frames do not make a verdict inconclusive by their number: each frame's estimated
 *     mapping error already enters every rate's standard error (the position term, {@link SeriesAnalysis}), so a
 *     lead that survives it stands. (An earlier rule made a verdict inconclusive above a quarter of weak frames; with
 *     weak meaning "few textured check patches" it turned plain hand-held and long captures inconclusive.)</li>
 * </ol>
 */
public final class Verdicts {
    private Verdicts() {
    }

    /**
     * What the rules look at for one part.
     *
     * @param rateKPerS   the rate (or rise) at the part's nominal emissivity
     * @param rateSe      its standard error from the measured noise and the position error only
     * @param lowScale    factor taking the nominal rate to the rate at the highest plausible emissivity (e + u: the
     *                    lowest corrected rise); 1 without emissivity uncertainty
     * @param highScale   factor taking it to the rate at the lowest plausible emissivity (e - u: the highest rise)
     */
    public record Candidate(String ref, Double rateKPerS, Double rateSe, boolean onset, double mapPeakK,
                            double lowScale, double highScale) {
        public Candidate(String ref, Double rateKPerS, Double rateSe, boolean onset, double mapPeakK) {
            this(ref, rateKPerS, rateSe, onset, mapPeakK, 1.0, 1.0);
        }

        /** The rate and its standard error at the least favourable emissivity for a leader: the smaller rate. */
        double[] worst() {
            return pick(Math.min(rateKPerS * lowScale, rateKPerS * highScale));
        }

        /** The rate and its standard error at the most favourable emissivity for a runner-up: the larger rate. */
        double[] best() {
            return pick(Math.max(rateKPerS * lowScale, rateKPerS * highScale));
        }

        private double[] pick(double r) {
            // the noise standard error scales with the correction as the rate does
            double scale = r == rateKPerS * lowScale ? lowScale : highScale;
            return new double[]{r, rateSe * scale};
        }
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
        return decide(ranked, hotspots, mapSigma, weakFrames, usedFrames, o, unit, List.of(), 0);
    }

    /**
     * @param parts      the marked parts, for the margin of the "on no marked part" rule
     * @param marginMm   a spot whose centroid lies within this distance of a part's footprint counts as that part's
     *                   for the "on no marked part" rule (the optics spread a part's heat that far onto the board)
     */
    public static Verdict decide(List<Candidate> ranked, List<Hotspot> hotspots, double mapSigma, int weakFrames,
                                 int usedFrames, AnalysisOptions o, String unit, List<Part> parts, double marginMm) {
        return decide(ranked, hotspots, mapSigma, weakFrames, usedFrames, o, unit, parts, marginMm, null);
    }

    /**
     * The leader's lead measured on whole rise curves over the lead window (the rate window before it is shortened to
     * the half-rise time): against every other part, the slope of the difference of the two rise curves (leader at
     * its least favourable emissivity minus the other at its most favourable, frame by frame) in units of that
     * difference's own standard error; the smallest of these is the separation and {@code againstRef} the part that
     * gives it. Noise common to both parts (a camera's global offset flicker, a change of resolution with the camera's
     * distance) cancels in the difference, and the longer window uses every frame of the early rise, so this tests
     * the very quantity the rule is about with its measured noise. {@code leaderZ} is the leader's own rise slope
     * over that window in standard errors (the heating test).
     */
    public record PairedLead(String againstRef, double separation, double leaderZ, double windowS) {
    }

    /**
     * @param paired the lead measured on whole rise curves ({@link PairedLead}); null to combine the leader's and the
     *               runner-up's rate errors as if independent
     */
    public static Verdict decide(List<Candidate> ranked, List<Hotspot> hotspots, double mapSigma, int weakFrames,
                                 int usedFrames, AnalysisOptions o, String unit, List<Part> parts, double marginMm,
                                 PairedLead paired) {
        double k = o.kSigma();
        Candidate lead = ranked.isEmpty() ? null : ranked.get(0);
        Candidate second = ranked.size() > 1 ? ranked.get(1) : null;
        if (paired != null && Double.isFinite(paired.separation()))
            for (Candidate c : ranked) if (c.ref().equals(paired.againstRef())) second = c;
        Double sep = null;
        if (paired != null && Double.isFinite(paired.separation())) sep = paired.separation();
        else if (lead != null && second != null && lead.rateKPerS() != null && second.rateKPerS() != null
                && lead.rateSe() != null && second.rateSe() != null) {
            // worst case of the emissivity uncertainty: the leader at its least favourable emissivity against the
            // runner-up at its most favourable, with the noise standard errors at those emissivities
            double[] a = lead.worst(), b = second.best();
            double se = Math.hypot(a[1], b[1]);
            sep = se > 0 ? (a[0] - b[0]) / se : null;
        }
        String leadRef = lead == null ? null : lead.ref();
        String secondRef = second == null ? null : second.ref();
        Double leadRate = lead == null ? null : lead.rateKPerS();

        if (ranked.isEmpty()) {
            // nothing to rank: said first, whatever the map shows (every other rule speaks of marked parts)
            Hotspot hottest = hotspots.isEmpty() ? null : hotspots.get(0);
            return new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null, "the board file marks no parts"
                    + (hottest == null ? "" : String.format(Locale.ROOT,
                    "; the hottest spot is at %.1f, %.1f mm (rise %.2f K): mark the part there", hottest.xMm(),
                    hottest.yMm(), hottest.riseK())));
        }
        boolean anyRise = !hotspots.isEmpty();
        for (Candidate c : ranked)
            if (c.onset() || significant(c, k)) anyRise = true;
        boolean noiseMeasured = Double.isFinite(mapSigma);
        for (Candidate c : ranked) if (c.rateSe() != null && Double.isFinite(c.rateSe())) noiseMeasured = true;
        if (!anyRise)
            return new Verdict(VerdictStatus.NO_HEATING, null, leadRate, secondRef, sep, noiseMeasured
                    ? "nothing rose above " + num(k) + " times the measured noise"
                    : "no rise could be shown: no part's noise could be measured (too few usable frames)");

        Hotspot top = hotspots.isEmpty() ? null : hotspots.get(0);
        if (top != null && top.ref() == null && !nearAnyPart(parts, top.xMm(), top.yMm(), marginMm)
                && (lead == null || top.riseK() - lead.mapPeakK() > k * mapSigma * Math.sqrt(2) || !Double.isFinite(lead.mapPeakK())))
            // no marked part is named: the source is the unmarked spot, not the fastest of the marked parts
            return new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null,
                    String.format(Locale.ROOT, "the hottest spot, at %.1f, %.1f mm (rise %.2f K), is on no marked part:"
                            + " mark the part there and analyse again", top.xMm(), top.yMm(), top.riseK()));
        if (lead == null)
            return new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null, "the board file marks no parts");
        boolean heats = significant(lead, k) || (paired != null && paired.leaderZ() > k);
        if (!heats)
            return new Verdict(VerdictStatus.INCONCLUSIVE, leadRef, leadRate, secondRef, sep,
                    "too little heating: the fastest part, " + leadRef + (unit.equals("K") ? ", rose by " : ", rises at ") + rate(lead, unit)
                            + ", under " + num(k) + " standard errors from zero");
        if (sep != null && sep < o.separationSigma())
            return new Verdict(VerdictStatus.INCONCLUSIVE, leadRef, leadRate, secondRef, sep,
                    "two parts level: " + leadRef + " (" + rate(lead, unit) + ") and " + secondRef + " (" + rate(second, unit)
                            + ") differ by " + num(sep) + " combined standard errors"
                            + (paired != null ? " (rise curves over " + seconds(paired.windowS()) + " s)" : "")
                            + ", under " + num(o.separationSigma()));
        String weakNote = usedFrames > 0 && weakFrames > o.weakFractionLimit() * usedFrames
                ? " (registration weak in " + weakFrames + " of " + usedFrames
                + " frames; their mapping error is part of every rate's error)" : "";
        return new Verdict(VerdictStatus.IDENTIFIED, leadRef, leadRate, secondRef, sep,
                leadRef + (unit.equals("K") ? " warmed most: " : " heats fastest: ") + rate(lead, unit)
                        + (sep == null ? "" : ", " + num(sep) + " combined standard errors ahead of " + secondRef
                        + (paired != null ? " (rise curves over " + seconds(paired.windowS()) + " s)" : ""))
                        + weakNote);
    }

    /** Fewest usable frames a series verdict rests on: a baseline, and at least two frames to see a rise in. */
    public static final int MIN_USABLE_FRAMES = 3;

    /**
     * The evidence rule, before all others: when the data cannot decide, the status is {@code inconclusive} with the
     * reason, never {@code no-heating} (which would tell the user, wrongly, that the board was seen not to heat).
     * A usable frame is a mapped frame in which some marked part's footprint was visible (finite temperatures).
     *
     * @param usableTimesS times of the usable frames
     * @param mappedFrames frames mapped onto the board
     * @param tStartS      the injection start (baseline frames lie at or before it)
     * @param parts        marked parts (with none, every mapped frame counts as usable)
     * @return the inconclusive verdict, or null when the evidence suffices
     */
    public static Verdict insufficientEvidence(double[] usableTimesS, int mappedFrames, double tStartS, int parts,
                                               int minFrames) {
        int n = usableTimesS.length;
        if (parts > 0 && n == 0)
            return undecided("no marked part was visible in any of the " + mappedFrames + " mapped frames: check "
                    + "the board outline (corners) and the board resolution (--px-per-mm)");
        if (n < minFrames)
            return undecided("only " + n + " usable frame" + (n == 1 ? "" : "s") + " (of " + mappedFrames
                    + " mapped): at least " + minFrames + " are needed to measure a rise against the noise");
        int after = 0, before = 0;
        double last = Double.NEGATIVE_INFINITY;
        for (double t : usableTimesS) {
            if (t > tStartS) after++;
            else before++;
            last = Math.max(last, t);
        }
        if (after == 0)
            return undecided(String.format(Locale.ROOT, "no usable frame after the injection start (%.3f s; the last"
                    + " usable frame is at %.3f s): check injection.start_s in series.json", tStartS, last));
        if (before == 0)
            return undecided(String.format(Locale.ROOT, "no usable frame at or before the injection start (%.3f s)"
                    + " for the baseline", tStartS));
        return null;
    }

    /**
     * An undecided verdict with the frames that could not be aligned named, when they are what left too little:
     * the count, the first one's reason, and what to do about it.
     */
    static Verdict withAlignmentHint(Verdict undecided, List<FrameRecord> frames, boolean stillCamera) {
        int failed = 0;
        FrameRecord first = null;
        for (FrameRecord f : frames) {
            if (f.registration() == null || !"failed".equals(f.registration().status())) continue;
            if (failed++ == 0) first = f;
        }
        if (failed == 0 || 2 * failed < frames.size()) return undecided;
        String hint = stillCamera ? "" : "; if the camera stood still (on a stand), --still-camera takes the outline "
                + "as marked for frames that cannot be aligned; a hand-held capture of a board that shows no texture "
                + "cannot be aligned at all (README, \"Plain boards\")";
        return new Verdict(undecided.status(), undecided.ref(), undecided.rateKPerS(), undecided.runnerUpRef(),
                undecided.separationSigma(), undecided.reason() + String.format(Locale.ROOT,
                "; %d of %d frames could not be aligned (first: %s: %s)%s", failed, frames.size(), first.file(),
                first.registration().reason(), hint));
    }

    private static Verdict undecided(String reason) {
        return new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null, "the data cannot decide: " + reason);
    }

    /** True when the point lies within marginMm of some part's (rotated) footprint rectangle. */
    static boolean nearAnyPart(List<Part> parts, double xMm, double yMm, double marginMm) {
        if (!(marginMm > 0)) return false;
        for (Part p : parts) {
            double a = Math.toRadians(p.rotationOrZero());
            double dx = xMm - p.xMm(), dy = yMm - p.yMm();
            double u = Math.abs(dx * Math.cos(a) - dy * Math.sin(a)) - p.wMm() / 2;
            double v = Math.abs(dx * Math.sin(a) + dy * Math.cos(a)) - p.hMm() / 2;
            if (Math.hypot(Math.max(u, 0), Math.max(v, 0)) <= marginMm) return true;
        }
        return false;
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

    /** A window length in words: whole seconds from 10 s, two significant figures below (0.10, 2.5). */
    static String seconds(double s) {
        return s >= 10 ? String.format(Locale.ROOT, "%.0f", s) : String.format(Locale.ROOT, "%.2g", s);
    }
}
