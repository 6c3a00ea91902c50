package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;
import org.risetrace.registration.BoardRaster;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.function.Consumer;

/**
 * The in-order lock-in accumulator beside {@link SeriesAnalysis}: takes each {@link FrameSample} in time order,
 * adds its board raster to the per-pixel sums of {@link LockInMaps} and keeps each part's footprint mean (one number
 * per part and frame, as the steady analysis does), then fits, ranks and decides (lock-in verdict, below).
 *
 * <p>Verdict: parts are ranked by amplitude (object temperature). The leader is identified when its amplitude is at
 * least k standard errors above zero and {@code separation} combined standard errors above the runner-up's, judged at
 * the worst case of the emissivity uncertainty as in the steady analysis, and the runner-up does not lead it in phase
 * by more than {@code separation} combined phase errors (the source is the part with the highest amplitude and the
 * least lag; a part that heats through the board lags). When the amplitudes are level, the part with the least lag is
 * identified if it leads every level part by more than {@code separation} combined phase errors; else the verdict is
 * inconclusive. The strongest spot of the amplitude map on no marked part, clearly stronger than the leader, makes it
 * inconclusive too ("mark the part there").
 */
public final class LockInAnalysis implements Consumer<FrameSample> {
    /** Degree of the trend polynomial removed with the fit (documented in the README). */
    public static final int DETREND_DEGREE = 2;

    private final Board board;
    private final List<Part> parts;
    private final AnalysisOptions options;
    private final EmissivityModel emissivity;
    private final Double reflectedC;
    private final LockInFit fit;
    private LockInMaps maps;
    private FootprintSampler footprints;
    private double framePxPerMm = Double.NaN;
    private final List<Double> times = new ArrayList<>(), ambient = new ArrayList<>();
    private final List<double[]> means = new ArrayList<>();

    public LockInAnalysis(Board board, Excitation excitation, Excitation.Window window, AnalysisOptions options,
                          EmissivityModel emissivity, Double reflectedC) {
        this.board = board;
        this.parts = board.partsOrEmpty();
        this.options = options;
        this.emissivity = emissivity;
        this.reflectedC = reflectedC;
        this.fit = new LockInFit(excitation, window, DETREND_DEGREE);
    }

    /**
     * The excitation a periodic injection record describes: first switch-on at its start (0 when absent), on for
     * {@code on_s} (half the period when absent).
     */
    public static Excitation excitation(Sidecar.Injection injection) {
        if (injection.switchS() != null) return fromSwitching(injection.switchS());
        double period = injection.periodS();
        double on = injection.onS() != null ? injection.onS() : period / 2;
        double start = injection.startS() != null ? injection.startS() : 0.0;
        return new Excitation(period, on, start, "series.json (injection.period_s"
                + (injection.onS() != null ? ", on_s" : "; on for half the period, assumed") + ")");
    }

    /** Largest departure of a recorded switching time from the fixed period, as a fraction of the period. */
    static final double SWITCH_TOLERANCE = 0.02;

    /**
     * The excitation recorded as switching times (on, off, on, off, ...): period = (last on - first on) / (ons - 1),
     * on time = the mean of the on intervals. Lock-in correlates with one frequency, so every switching time must lie
     * within 2 % of the period of where that fixed period puts it (7 degrees of phase); else
     * IllegalArgumentException with the reason.
     */
    static Excitation fromSwitching(double[] sw) {
        int ons = (sw.length + 1) / 2, offs = sw.length / 2;
        double period = (sw[2 * (ons - 1)] - sw[0]) / (ons - 1);
        double on = 0;
        for (int i = 0; i < offs; i++) on += (sw[2 * i + 1] - sw[2 * i]) / offs;
        for (int i = 0; i < sw.length; i++) {
            double expected = sw[0] + (i / 2) * period + (i % 2 == 1 ? on : 0);
            if (Math.abs(sw[i] - expected) > SWITCH_TOLERANCE * period)
                throw new IllegalArgumentException(String.format(Locale.ROOT, "injection.switch_s: switching time %d "
                                + "(%.3f s) is %.3f s off a fixed period of %.4g s; lock-in needs a steady period "
                                + "(within %.0f %%)", i + 1, sw[i], sw[i] - expected, period, 100 * SWITCH_TOLERANCE));
        }
        if (!(on > 0 && on < period))
            throw new IllegalArgumentException("injection.switch_s: the on intervals do not fit inside the period");
        return new Excitation(period, on, sw[0], String.format(Locale.ROOT, "series.json (injection.switch_s: %d "
                + "switching times, period %.4g s, on %.4g s)", sw.length, period, on));
    }

    @Override
    public void accept(FrameSample s) {
        if (!s.used() || !fit.window().contains(s.tS())) return;
        BoardRaster r = s.raster();
        if (maps == null) {
            maps = new LockInMaps(r.width(), r.height(), r.pxPerMm(), fit);
            footprints = new FootprintSampler(parts, r.width(), r.height(), r.pxPerMm());
            if (s.registration().boardToFrame() != null) framePxPerMm = SeriesAnalysis.framePxPerMm(s.registration(), board);
        }
        maps.add(r.celsius(), r.valid(), s.tS());
        double[] m = new double[parts.size()];
        for (int p = 0; p < m.length; p++) m[p] = s.stats()[p * FootprintSampler.STATS + FootprintSampler.MEAN];
        means.add(m);
        times.add(s.tS());
        ambient.add(s.ambientC());
    }

    /** Bytes of per-pixel state (flat in the number of periods). */
    public long pixelStateBytes() {
        return maps == null ? 0 : maps.bytes();
    }

    public LockIn finish(Analysis steady) {
        Verdict steadyVerdict = steady.result().verdict();
        Excitation.Window w = fit.window();
        int n = times.size();
        String detrend = "polynomial of degree " + DETREND_DEGREE + " in time over the window, fitted jointly with "
                + "the cosine and sine at the fundamental (least squares on the frames' own times)";
        String noise = "per pixel: residual of the fit (all other frequencies); per part: the larger of the residual's "
                + "and the spread of the per-period correlations (4 or more periods)";
        if (maps == null || maps.frames() <= fit.size()) {
            Verdict v = new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null,
                    "too few frames mapped onto the board inside whole periods of the excitation");
            return new LockIn(steady, new LockInResult(fit.excitation(), w.startS(), w.endS(), w.periods(), n,
                    detrend, noise, null, null, 4 * w.periods(), v, steadyVerdict, List.of(), List.of()), null, null);
        }
        LockInMaps.Maps px = maps.finish();
        double[] t = new double[n];
        for (int i = 0; i < n; i++) t[i] = times.get(i);
        double ambMedian = median(ambient);
        int np = parts.size();
        double k = options.kSigma();

        // per part: footprint mean fitted, scaled to object temperature by the emissivity correction's gain
        List<LockInPart> raw = new ArrayList<>();
        double[] lowScale = new double[np], highScale = new double[np];
        LockInFit.SeriesFit[] fits = new LockInFit.SeriesFit[np];
        double[] gains = new double[np];
        for (int p = 0; p < np; p++) {
            double[] y = new double[n];
            double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < n; i++) {
                y[i] = means.get(i)[p];
                if (Double.isFinite(y[i])) {
                    lo = Math.min(lo, y[i]);
                    hi = Math.max(hi, y[i]);
                }
            }
            EmissivityModel.Emissivity e = emissivity.forMaterial(parts.get(p).material());
            double refl = reflectedC != null ? reflectedC : Double.isFinite(ambMedian) ? ambMedian : lo;
            double gain = 1, lowS = 1, highS = 1;
            if (Double.isFinite(lo)) {
                gain = new SeriesAnalysis.CorrectionTable(emissivity, e.value(), refl, lo, hi).gain();
                if (e.uncertainty() > 0) {
                    double eHigh = Math.min(1.0, e.value() + e.uncertainty());
                    double eLow = Math.max(SeriesAnalysis.MIN_EMISSIVITY, e.value() - e.uncertainty());
                    lowS = new SeriesAnalysis.CorrectionTable(emissivity, eHigh, refl, lo, hi).gain() / gain;
                    highS = new SeriesAnalysis.CorrectionTable(emissivity, eLow, refl, lo, hi).gain() / gain;
                }
            }
            gains[p] = gain;
            lowScale[p] = lowS;
            highScale[p] = highS;
            LockInFit.SeriesFit f = fit.fit(t, y);
            fits[p] = f;
            if (f == null) {
                raw.add(new LockInPart(parts.get(p).ref(), 0, Double.NaN, Double.NaN, Double.NaN, null, null,
                        Double.NaN, Double.NaN, e.value(), Double.NaN));
                continue;
            }
            double amp = f.amplitude() * gain, se = f.se() * gain;
            boolean phaseMeaningful = amp >= k * se;
            raw.add(new LockInPart(parts.get(p).ref(), 0, amp, se, se > 0 ? amp / se : Double.NaN,
                    phaseMeaningful ? f.lagDeg() : null, phaseMeaningful ? f.lagSeDeg() : null,
                    f.inPhase() * gain, f.quadrature() * gain, e.value(), f.residualSigma()));
        }
        Integer[] order = new Integer[np];
        for (int p = 0; p < np; p++) order[p] = p;
        Arrays.sort(order, Comparator.comparingDouble((Integer p) ->
                Double.isFinite(raw.get(p).amplitudeK()) ? -raw.get(p).amplitudeK() : Double.POSITIVE_INFINITY));
        List<LockInPart> ranked = new ArrayList<>();
        double[] rl = new double[np], rh = new double[np];
        for (int r = 0; r < np; r++) {
            LockInPart q = raw.get(order[r]);
            ranked.add(new LockInPart(q.ref(), r + 1, q.amplitudeK(), q.amplitudeSeK(), q.snr(), q.lagDeg(),
                    q.lagSeDeg(), q.inPhaseK(), q.quadratureK(), q.emissivity(), q.noiseK()));
            rl[r] = lowScale[order[r]];
            rh[r] = highScale[order[r]];
        }

        // maps: amplitude, and the lag where the pixel's amplitude is significant: at the hot spot threshold, not at
        // k, since noise alone exceeds 3 standard errors in about 1 % of pixels (Rayleigh tail exp(-k^2 / 2)), which
        // on a map of thousands of pixels scatters dozens of meaningless phases; at 5, 4e-6
        float[] lag = px.lagDeg().clone();
        float[] se = px.amplitudeSe();
        double kMap = Math.max(k, options.hotspotKSigma());
        for (int i = 0; i < lag.length; i++)
            if (!(px.amplitude()[i] >= kMap * se[i])) lag[i] = Float.NaN;
        BoardMap ampMap = new BoardMap(px.width(), px.height(), px.pxPerMm(), px.amplitude(), "K");
        BoardMap lagMap = new BoardMap(px.width(), px.height(), px.pxPerMm(), lag, "deg");
        double sigmaBoardPx = Double.isFinite(framePxPerMm) && framePxPerMm > 0
                ? options.blurPx() * px.pxPerMm() / framePxPerMm : options.blurPx();
        Hotspots.Smoothed sm = Hotspots.smoothed(px.amplitude(), px.width(), px.height(), px.pxPerMm(), sigmaBoardPx, "K");
        List<Hotspot> spots = Hotspots.find(sm, options.hotspotKSigma(), Math.max(2.0, px.pxPerMm()),
                options.maxHotspots(), parts);
        double marginMm = 2 * sigmaBoardPx / px.pxPerMm();

        double pixelSens = 3 * medianFinite(se);
        double[] partSe = new double[np];
        for (int p = 0; p < np; p++) partSe[p] = raw.get(p).amplitudeSeK();
        double partSens = 3 * medianFinite(partSe);
        Verdict v = decide(ranked, rl, rh, spots, sm, footprintPeaks(sm, order), parts, marginMm, options, w.periods());
        LockInResult result = new LockInResult(fit.excitation(), w.startS(), w.endS(), w.periods(), maps.frames(),
                detrend, noise, finite(pixelSens), finite(partSens), 4 * w.periods(), v, steadyVerdict, ranked, spots);
        return new LockIn(steady, result, ampMap, lagMap);
    }

    /** Peak of the smoothed amplitude map over each part's footprint, in rank order. */
    private double[] footprintPeaks(Hotspots.Smoothed sm, Integer[] order) {
        double[] out = new double[order.length];
        for (int r = 0; r < order.length; r++) {
            float peak = Float.NaN;
            for (int i : footprints.indices(order[r])) {
                float v = sm.map().values()[i];
                if (!Float.isNaN(v) && (Float.isNaN(peak) || v > peak)) peak = v;
            }
            out[r] = peak;
        }
        return out;
    }

    /** The lock-in verdict (rules in the class comment); parts ranked by amplitude. */
    static Verdict decide(List<LockInPart> ranked, double[] lowScale, double[] highScale, List<Hotspot> spots,
                          Hotspots.Smoothed sm, double[] mapPeaks, List<Part> parts, double marginMm,
                          AnalysisOptions o, int periods) {
        double k = o.kSigma(), sepMin = o.separationSigma();
        LockInPart lead = ranked.isEmpty() ? null : ranked.get(0);
        LockInPart second = ranked.size() > 1 ? ranked.get(1) : null;
        boolean leadSignificant = lead != null && lead.amplitudeK() >= k * lead.amplitudeSeK();
        Hotspot top = spots.isEmpty() ? null : spots.get(0);
        boolean topUnmarked = top != null && top.ref() == null && !Verdicts.nearAnyPart(parts, top.xMm(), top.yMm(), marginMm);
        if (!leadSignificant && !topUnmarked)
            return new Verdict(lead == null ? VerdictStatus.INCONCLUSIVE : VerdictStatus.NO_HEATING,
                    lead == null ? null : lead.ref(), null, second == null ? null : second.ref(), null,
                    lead == null ? "the board file marks no parts"
                            : "no part follows the excitation above " + num(k) + " standard errors (strongest: "
                            + lead.ref() + ", " + amp(lead) + ")");
        if (topUnmarked && (lead == null || !Double.isFinite(mapPeaks[0])
                || top.riseK() - mapPeaks[0] > k * sm.sigma() * Math.sqrt(2)))
            return new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null, String.format(Locale.ROOT,
                    "the strongest periodic spot, at %.1f, %.1f mm (amplitude %.4f K), is on no marked part: "
                            + "mark the part there and analyse again", top.xMm(), top.yMm(), top.riseK()));
        if (second == null || !Double.isFinite(second.amplitudeK()))
            return identified(lead, null, null, "the only part measured", periods);
        // worst case of the emissivity uncertainty: the leader at its lowest corrected amplitude, the runner-up at
        // its highest
        double aLead = lead.amplitudeK() * lowScale[0], seLead = lead.amplitudeSeK() * lowScale[0];
        double aSecond = second.amplitudeK() * highScale[1], seSecond = second.amplitudeSeK() * highScale[1];
        double sep = (aLead - aSecond) / Math.hypot(seLead, seSecond);
        if (sep >= sepMin) {
            Double dPhase = phaseLead(second, lead, k);
            if (dPhase != null && dPhase > sepMin)
                return new Verdict(VerdictStatus.INCONCLUSIVE, lead.ref(), null, second.ref(), sep,
                        lead.ref() + " has the highest amplitude (" + amp(lead) + ") but " + second.ref()
                                + " leads it in phase by " + num(dPhase) + " combined errors: the source may lie "
                                + "between them or on an unmarked part");
            return identified(lead, second, sep, num(sep) + " combined standard errors above " + second.ref()
                    + " (" + amp(second) + ")", periods);
        }
        // level amplitudes: the least lag among the level parts decides when it leads every one of them clearly
        List<LockInPart> level = new ArrayList<>();
        for (int r = 0; r < ranked.size(); r++) {
            LockInPart q = ranked.get(r);
            if (!Double.isFinite(q.amplitudeK()) || q.lagDeg() == null) continue;
            double s = (aLead - q.amplitudeK() * highScale[r]) / Math.hypot(seLead, q.amplitudeSeK() * highScale[r]);
            if (r == 0 || s < sepMin) level.add(q);
        }
        LockInPart earliest = null;
        for (LockInPart q : level)
            if (sourceLike(q, k) && (earliest == null || q.lagDeg() < earliest.lagDeg())) earliest = q;
        double minLead = Double.POSITIVE_INFINITY;
        LockInPart closest = null;
        for (LockInPart q : level) {
            if (q == earliest) continue;
            Double d = phaseLead(earliest, q, k);
            double dv = d == null ? Double.NEGATIVE_INFINITY : d;
            if (dv < minLead) {
                minLead = dv;
                closest = q;
            }
        }
        if (earliest != null && closest != null && minLead > sepMin)
            return new Verdict(VerdictStatus.IDENTIFIED, earliest.ref(), null, closest.ref(), minLead,
                    String.format(Locale.ROOT, "%s and %s are level in amplitude (%s, %s); %s leads in phase "
                                    + "(lag %.1f ± %.1f deg against %.1f ± %.1f deg), %s combined errors",
                            lead.ref(), second.ref(), amp(lead), amp(second), earliest.ref(), earliest.lagDeg(),
                            earliest.lagSeDeg(), closest.lagDeg(), closest.lagSeDeg(), num(minLead)));
        return new Verdict(VerdictStatus.INCONCLUSIVE, lead.ref(), null, second.ref(), sep,
                "two parts level: " + lead.ref() + " (" + amp(lead) + ") and " + second.ref() + " (" + amp(second)
                        + ") differ by " + num(sep) + " combined standard errors, and their phases do not separate "
                        + "them; capture more periods");
    }

    /**
     * True when a part's lag is one a heat source can have: a body heated directly lags its power's fundamental by 0
     * to 90 degrees (a first-order response; Breitenstein, Warta and Langenkamp, Lock-in Thermography, chapter 4),
     * here widened by {@code k} standard errors of the lag. Heat conducted from elsewhere lags more, and past 180
     * degrees the lag wraps round and would look like a lead.
     */
    static boolean sourceLike(LockInPart p, double k) {
        if (p.lagDeg() == null || p.lagSeDeg() == null) return false;
        return p.lagDeg() >= -k * p.lagSeDeg() && p.lagDeg() <= 90 + k * p.lagSeDeg();
    }

    /**
     * How far a leads b in phase (b's lag minus a's, wrapped), in combined phase errors; null without phases or when
     * a's lag is not one a source can have ({@link #sourceLike}).
     */
    static Double phaseLead(LockInPart a, LockInPart b, double k) {
        if (a.lagDeg() == null || b.lagDeg() == null || a.lagSeDeg() == null || b.lagSeDeg() == null) return null;
        if (!sourceLike(a, k)) return null;
        double d = b.lagDeg() - a.lagDeg();
        d -= 360 * Math.floor((d + 180) / 360);
        double se = Math.hypot(a.lagSeDeg(), b.lagSeDeg());
        return se > 0 ? d / se : null;
    }

    private static Verdict identified(LockInPart lead, LockInPart second, Double sep, String why, int periods) {
        return new Verdict(VerdictStatus.IDENTIFIED, lead.ref(), null, second == null ? null : second.ref(), sep,
                lead.ref() + " follows the excitation most strongly: " + amp(lead)
                        + (lead.lagDeg() == null ? "" : String.format(Locale.ROOT, " at a lag of %.1f ± %.1f deg",
                        lead.lagDeg(), lead.lagSeDeg())) + ", " + why + " over " + periods + " periods");
    }

    private static String amp(LockInPart p) {
        return String.format(Locale.ROOT, "%.4f ± %.4f K", p.amplitudeK(), p.amplitudeSeK());
    }

    private static String num(double v) {
        return String.format(Locale.ROOT, "%.1f", v);
    }

    private static double median(List<Double> v) {
        double[] a = new double[v.size()];
        int n = 0;
        for (Double d : v) if (d != null && Double.isFinite(d)) a[n++] = d;
        return n == 0 ? Double.NaN : PartCurve.median(Arrays.copyOf(a, n), n);
    }

    static double medianFinite(float[] v) {
        double[] a = new double[v.length];
        int n = 0;
        for (float f : v) if (Float.isFinite(f)) a[n++] = f;
        return n == 0 ? Double.NaN : PartCurve.median(Arrays.copyOf(a, n), n);
    }

    static double medianFinite(double[] v) {
        double[] a = new double[v.length];
        int n = 0;
        for (double f : v) if (Double.isFinite(f)) a[n++] = f;
        return n == 0 ? Double.NaN : PartCurve.median(Arrays.copyOf(a, n), n);
    }

    private static Double finite(double v) {
        return Double.isFinite(v) ? v : null;
    }
}
