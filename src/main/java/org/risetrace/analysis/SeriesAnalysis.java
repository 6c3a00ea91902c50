package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.RegistrationStatus;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;

/**
 * The in-order half of the analysis: takes one {@link FrameSample} after another in time order, keeps only small
 * per-frame numbers (each part's footprint statistics, the ambient) and the per-pixel accumulators of
 * {@link RiseMaps}, and at the end measures every part's curve, finds hot spots and decides the verdict. Never holds
 * the series' rasters (only the last one, for the report).
 */
public final class SeriesAnalysis {

    /** Where the inputs came from, for analysis.json. */
    public record Context(String series, String boardFile, String profile, Sidecar.Injection injection,
                          Double reflectedC, String version, String ambientSource) {
    }

    /** Lower bound of an emissivity range (e - u can reach zero in the table, where the correction diverges). */
    static final double MIN_EMISSIVITY = 0.01;

    private final Board board;
    private final List<Part> parts;
    private final AnalysisOptions options;
    private final BaselinePlan plan;
    private final Context context;
    private final EmissivityModel emissivity;
    private final List<FrameRecord> records = new ArrayList<>();
    private final List<double[]> stats = new ArrayList<>();
    private final List<Double> times = new ArrayList<>(), ambient = new ArrayList<>();
    private final List<Boolean> weak = new ArrayList<>();
    private final List<Double> weakRmsPx = new ArrayList<>();
    private final List<org.risetrace.registration.Homography> mappings = new ArrayList<>();
    /** Estimated corner error of each used frame's mapping, frame px (0 for marked or unknown). */
    private final List<Double> cornerSigmaPx = new ArrayList<>();
    private int baselineUsed;
    private RiseMaps maps;
    private FootprintSampler footprints;
    private BoardRaster lastRaster;
    private double framePxPerMm = Double.NaN;
    private double lastT = Double.NEGATIVE_INFINITY;
    private double windowUsedS = Double.NaN;
    private double positionSigmaBoardPx = 0;


    public SeriesAnalysis(Board board, AnalysisOptions options, BaselinePlan plan, EmissivityModel emissivity,
                          Context context) {
        this.board = board;
        this.parts = board.partsOrEmpty();
        this.options = options;
        this.plan = plan;
        this.emissivity = emissivity;
        this.context = context;
    }

    public BaselinePlan plan() { return plan; }

    /** Adds the next frame; frames must come in increasing index (time) order. */
    public void add(FrameSample s) {
        FrameRegistration r = s.registration();
        records.add(new FrameRecord(s.file(), s.tS(), s.sha256(), s.used(), r == null ? null
                : new FrameRecord.Registration(r.status().word(), Double.isFinite(r.rmsPx()) ? r.rmsPx() : null,
                r.reason(), r.boardCornersPx(), Double.isFinite(r.cornerSigmaPx()) ? r.cornerSigmaPx() : null)));
        if (!s.used()) return;
        if (s.tS() <= lastT) throw new IllegalStateException("frames out of order at " + s.file());
        lastT = s.tS();
        BoardRaster raster = s.raster();
        if (maps == null) {
            maps = new RiseMaps(raster.width(), raster.height(), raster.pxPerMm(), options.kSigma(),
                    options.onsetFrames(), plan.tStartS(), options.lastFrames());
            footprints = new FootprintSampler(parts, raster.width(), raster.height(), raster.pxPerMm());
            if (r.boardToFrame() != null) framePxPerMm = framePxPerMm(r, board);
        }
        // the first used frame is the baseline when every planned baseline frame failed
        boolean base = plan.baseline()[s.index()] || (baselineUsed == 0 && times.isEmpty());
        if (base && baselineUsed < times.size())
            base = false; // a baseline frame after a non-baseline one cannot happen with a time-ordered plan
        if (base) baselineUsed++;
        maps.add(raster.celsius(), raster.valid(), s.tS(), s.ambientC(), base, plan.last()[s.index()]);
        times.add(s.tS());
        stats.add(s.stats());
        ambient.add(s.ambientC());
        weak.add(r.status() == RegistrationStatus.WEAK);
        if (r.status() == RegistrationStatus.WEAK && Double.isFinite(r.rmsPx())) weakRmsPx.add(r.rmsPx());
        mappings.add(r.boardToFrame());
        cornerSigmaPx.add(Double.isFinite(r.cornerSigmaPx()) ? r.cornerSigmaPx() : 0.0);
        lastRaster = raster;
    }

    /** Frame pixels per board millimetre at the board centre (square root of the homography's Jacobian determinant). */
    static double framePxPerMm(FrameRegistration r, Board board) {
        double cx = board.widthMm() / 2, cy = board.heightMm() / 2, d = 0.5;
        double[] a = r.boardToFrame().apply(cx - d, cy), b = r.boardToFrame().apply(cx + d, cy);
        double[] c = r.boardToFrame().apply(cx, cy - d), e = r.boardToFrame().apply(cx, cy + d);
        double jxx = (b[0] - a[0]) / (2 * d), jyx = (b[1] - a[1]) / (2 * d);
        double jxy = (e[0] - c[0]) / (2 * d), jyy = (e[1] - c[1]) / (2 * d);
        return Math.sqrt(Math.abs(jxx * jyy - jxy * jyx));
    }

    /** Half-rise time of the most-risen part with an onset, as a window length; rateWindowS when none. */
    static double rateWindow(double[] t, PartCurve[] curves, AnalysisOptions o, double tStartS) {
        PartCurve best = null;
        for (PartCurve c : curves)
            if (c.onsetS() != null && Double.isFinite(c.endRiseK()) && (best == null || c.endRiseK() > best.endRiseK())) best = c;
        if (best == null || !(best.endRiseK() > 0)) return o.rateWindowS();
        double tHalf = Double.NaN;
        for (int i = 0; i < t.length; i++)
            if (t[i] >= best.onsetS() && best.riseK()[i] >= 0.5 * best.endRiseK()) {
                tHalf = t[i];
                break;
            }
        return Double.isFinite(tHalf) ? Math.min(o.rateWindowS(), Math.max(tHalf - tStartS, 0)) : o.rateWindowS();
    }

    /**
     * How far the mapping can have wandered between the start and the end of the rate window, in board px: the
     * root sum of squares of the mean squared corner error estimate over the first and over the last third of the
     * window's frames (the same frame selection as {@link PartCurve#measure}). Errors of the two ends are taken as
     * independent; a wander that is systematic over the window is what the per-frame estimates measure, so no
     * division by the number of frames.
     */
    static double windowEndsSigma(double[] t, double[] sigmaBoardPx, double tStartS, double windowS, int minFrames) {
        int[] span = PartCurve.rateSpan(t, tStartS, windowS, minFrames);
        int from = span[0], to = span[1], m = to - from;
        if (m < 2) return 0;
        int third = Math.max(1, m / 3);
        double early = 0, late = 0;
        for (int i = 0; i < third; i++) {
            early += sigmaBoardPx[from + i] * sigmaBoardPx[from + i] / third;
            late += sigmaBoardPx[to - 1 - i] * sigmaBoardPx[to - 1 - i] / third;
        }
        return Math.sqrt(early + late);
    }

    /**
     * The leader's lead on whole rise curves ({@link Verdicts.PairedLead}) over the lead window: the full rate
     * window ({@code rateWindowS} after the injection, within the series), not the half-rise window of the rates.
     * The paired difference against each other part is fitted as one curve ({@link PartCurve#measure}: its own
     * noise from the baseline or second differences, AR(1) widening of the slope's error, the two position errors in
     * quadrature); null when the leader has no rate or no comparison is possible.
     */
    Verdicts.PairedLead pairedLead(double[] t, PartCurve[] curves, List<Verdicts.Candidate> cands, double[][] ws,
                                   double[] positionErrorK, double[] mappingSigmaBoardPx, int leader) {
        Verdicts.Candidate cl = cands.get(leader);
        if (cl.rateKPerS() == null) return null;
        double windowS = options.rateWindowS();
        int n = t.length;
        double sigma = windowEndsSigma(t, mappingSigmaBoardPx, plan.tStartS(), windowS, options.minRateFrames());
        PartCurve own = PartCurve.measure(t, curves[leader].riseK(), null, ws[leader], Math.max(1, baselineUsed),
                plan.tStartS(), windowS, positionErrorK[leader] * sigma, options, false);
        if (own.rate() == null || !(own.rate().slopeSe() > 0)) return null;
        double leaderZ = own.rate().slope() / own.rate().slopeSe();
        double sl = cl.rateKPerS() >= 0 ? Math.min(cl.lowScale(), cl.highScale()) : Math.max(cl.lowScale(), cl.highScale());
        String against = null;
        double worst = Double.POSITIVE_INFINITY;
        for (int q = 0; q < curves.length; q++) {
            Verdicts.Candidate cq = cands.get(q);
            if (q == leader || cq.rateKPerS() == null) continue;
            double sq = cq.rateKPerS() >= 0 ? Math.max(cq.lowScale(), cq.highScale()) : Math.min(cq.lowScale(), cq.highScale());
            double[] d = new double[n], w = new double[n];
            for (int i = 0; i < n; i++) {
                d[i] = sl * curves[leader].riseK()[i] - sq * curves[q].riseK()[i];
                w[i] = Math.min(ws[leader][i], ws[q][i]);
            }
            double posErrK = Math.hypot(sl * positionErrorK[leader], sq * positionErrorK[q]) * sigma;
            PartCurve diff = PartCurve.measure(t, d, null, w, Math.max(1, baselineUsed), plan.tStartS(), windowS,
                    posErrK, options, false);
            LineFit r = diff.rate();
            if (r == null || !(r.slopeSe() > 0)) continue;
            double se = NOISE_ONLY_SE ? modelResidualSlopeSe(t, d, w, windowS, diff.noiseK(), posErrK) : r.slopeSe();
            if (!(se > 0)) se = r.slopeSe();
            double z = r.slope() / se;
            if (z < worst) { worst = z; against = cq.ref(); }
        }
        if (against == null) return null;
        double used = Math.min(windowS, t[n - 1] - plan.tStartS());
        return new Verdicts.PairedLead(against, worst, leaderZ, used);
    }

    static boolean NOISE_ONLY_SE = Boolean.parseBoolean(System.getProperty("risetrace.modelResidualSe", "true"));

    /**
     * Standard error of the window's least-squares slope of a difference curve, with the noise taken from the
     * residuals of a rise model fitted to that curve ({@link RiseModelFit}: one or two time constants) rather than
     * from the residuals of the straight line. The slope over the window is a fixed functional of the curve; a curve
     * that bends inside the window leaves smooth line residuals that are not noise, and counting them as noise (and
     * widening again for their serial correlation) made a 44 K lead of a shorted capacitor "level" at 2.4 standard
     * errors. The model's residuals keep what is noise, serial correlation included (their lag-1 correlation widens
     * the error as in {@link LineFit#widenedForSerialCorrelation}); the measured noise of the curve is the floor.
     * NaN when no model fits (the caller then keeps the straight line's error).
     */
    double modelResidualSlopeSe(double[] t, double[] d, double[] w, double windowS, double noiseK, double positionErrK) {
        int[] span = PartCurve.rateSpan(t, plan.tStartS(), windowS, options.minRateFrames());
        int from = span[0], to = span[1];
        if (to - from < 6) return Double.NaN;
        double[] tw = java.util.Arrays.copyOfRange(t, 0, to), dw = java.util.Arrays.copyOfRange(d, 0, to);
        RiseModelFit model = RiseModelFit.fit(tw, dw, plan.tStartS());
        if (model == null) return Double.NaN;
        double sw = 0, swt = 0, ss = 0, prev = Double.NaN, num = 0, den = 0;
        int m = 0;
        for (int i = from; i < to; i++) {
            if (!(w[i] > 0) || !Double.isFinite(d[i])) continue;
            double e = d[i] - model.at(t[i]);
            sw += w[i];
            swt += w[i] * t[i];
            ss += w[i] * e * e;
            den += e * e;
            if (Double.isFinite(prev)) num += e * prev;
            prev = e;
            m++;
        }
        int params = model.isDouble() ? 4 : 2;
        if (m <= params + 2) return Double.NaN;
        double scale = m / sw;
        double residual2 = ss * scale / (m - params);
        double sigma2 = Math.max(residual2, Double.isFinite(noiseK) ? noiseK * noiseK : 0);
        double tm = swt / sw, stt = 0;
        for (int i = from; i < to; i++) if (w[i] > 0 && Double.isFinite(d[i])) stt += w[i] * (t[i] - tm) * (t[i] - tm);
        double lag1 = m >= 4 && den > 0 ? Math.max(0, Math.min(0.8, num / den)) : 0;
        double se = Math.sqrt(sigma2 / (stt * scale)) * Math.sqrt((1 + lag1) / (1 - lag1));
        double floor = to - 1 > from ? positionErrK / (t[to - 1] - t[from]) : 0;
        return Math.hypot(se, floor);
    }

    /** Measures, ranks and decides. */
    public Analysis finish() {
        records.sort(Comparator.comparingDouble(FrameRecord::tS));
        int n = times.size(), np = parts.size();
        if (n == 0) {
            Verdict v = new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null,
                    "no frame could be mapped onto the board: check the board outline and the frames");
            return new Analysis(result(v, List.of(), List.of()), board, List.of(), null, null, null);
        }
        double[] t = new double[n], amb = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = times.get(i);
            amb[i] = ambient.get(i);
        }
        int weakCount = 0;
        for (boolean w : weak) if (w) weakCount++;
        double ambBase = PartCurve.meanFinite(amb, 0, Math.max(1, baselineUsed));

        // per part: object temperatures, weights, how far registration and resampling alone can move each reading
        float[] baseMean = maps.baselineMean();
        // how far the sampling can wander through the mapping alone: the mapping uncertainty of the frames at the two
        // ends of the rate window (frame px, converted to board px), never the camera's own motion, which
        // registration removed; relative to half a board pixel it scales each footprint's half-pixel sensitivity
        double boardPxPerFramePx = Double.isFinite(framePxPerMm) && framePxPerMm > 0 ? maps.pxPerMm() / framePxPerMm : 1;
        double[] mappingSigmaBoardPx = new double[n];
        for (int i = 0; i < n; i++) mappingSigmaBoardPx[i] = cornerSigmaPx.get(i) * boardPxPerFramePx;
        double positionSigma = windowEndsSigma(t, mappingSigmaBoardPx, plan.tStartS(), options.rateWindowS(), options.minRateFrames());
        EmissivityModel.Emissivity[] eps = new EmissivityModel.Emissivity[np];
        double[] gain = new double[np], lowScale = new double[np], highScale = new double[np];
        Arrays.fill(lowScale, 1.0);
        Arrays.fill(highScale, 1.0);
        double[][] ys = new double[np][], ws = new double[np][];
        double[] meanValid = new double[np], positionErrorK = new double[np];
        for (int p = 0; p < np; p++) {
            Part part = parts.get(p);
            eps[p] = emissivity.forMaterial(part.material());
            double[] y = new double[n], w = new double[n];
            double validSum = 0;
            double reflected = context.reflectedC() != null ? context.reflectedC() : ambBase;
            double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < n; i++) {
                double app = stats.get(i)[p * FootprintSampler.STATS + FootprintSampler.P95];
                if (Double.isFinite(app)) { lo = Math.min(lo, app); hi = Math.max(hi, app); }
            }
            double refl = Double.isFinite(reflected) ? reflected : lo;
            CorrectionTable table = Double.isFinite(lo) ? new CorrectionTable(emissivity, eps[p].value(), refl, lo, hi) : null;
            gain[p] = table == null ? 1.0 : table.gain();
            if (table != null && eps[p].uncertainty() > 0) {
                // the same correction at the ends of the plausible emissivity range: a rise scales with the
                // correction's gain, so the rate at e +/- u is the nominal rate times the ratio of gains
                double eHigh = Math.min(1.0, eps[p].value() + eps[p].uncertainty());
                double eLow = Math.max(MIN_EMISSIVITY, eps[p].value() - eps[p].uncertainty());
                lowScale[p] = new CorrectionTable(emissivity, eHigh, refl, lo, hi).gain() / gain[p];
                highScale[p] = new CorrectionTable(emissivity, eLow, refl, lo, hi).gain() / gain[p];
            }
            for (int i = 0; i < n; i++) {
                double[] s = stats.get(i);
                double app = s[p * FootprintSampler.STATS + FootprintSampler.P95];
                double valid = s[p * FootprintSampler.STATS + FootprintSampler.VALID];
                validSum += valid;
                y[i] = Double.isFinite(app) && table != null ? table.objectCelsius(app) : Double.NaN;
                // weakly registered frames and partly visible footprints count less in the rate fit
                w[i] = valid * (weak.get(i) ? 0.5 : 1.0);
            }
            ys[p] = y;
            ws[p] = w;
            meanValid[p] = validSum / n;
            positionErrorK[p] = footprints.halfPixelSensitivity(baseMean, p) / 0.5 / eps[p].value();
        }
        // the rate window: up to the time the most-risen part reached half its end rise (a first-order curve is
        // still nearly straight there, at 0.69 tau), at most rateWindowS
        PartCurve[] curves = new PartCurve[np];
        for (int p = 0; p < np; p++)
            curves[p] = PartCurve.measure(t, ys[p], amb, ws[p], baselineUsed, plan.tStartS(), options.rateWindowS(),
                    positionErrorK[p] * positionSigma, options);
        double windowS = rateWindow(t, curves, options, plan.tStartS());
        if (windowS < options.rateWindowS()) {
            positionSigma = windowEndsSigma(t, mappingSigmaBoardPx, plan.tStartS(), windowS, options.minRateFrames());
            for (int p = 0; p < np; p++)  // the rise model does not depend on the window: fitted once
                curves[p] = PartCurve.measure(t, ys[p], amb, ws[p], baselineUsed, plan.tStartS(), windowS,
                        positionErrorK[p] * positionSigma, options, false).withFit(curves[p].fit());
        }
        // the window the rates were fitted over, as widened to minRateFrames: a 3.5 s window on a series of two
        // frames a second spans 12 frames, 5.5-6 s, and the report must say so (the rate is the mean over it)
        this.windowUsedS = PartCurve.rateSpanS(t, plan.tStartS(), windowS, options.minRateFrames());
        this.positionSigmaBoardPx = positionSigma;

        // rise map and hot spots, on object temperatures: each part's footprint scaled by its correction's gain,
        // the rest of the board by the gain at the default emissivity
        float[] riseMap = correctedRiseMap(maps.riseMap(), baseMean, gain, ambBase);
        double sigmaBoardPx = Double.isFinite(framePxPerMm) && framePxPerMm > 0
                ? options.blurPx() * maps.pxPerMm() / framePxPerMm : options.blurPx();
        Hotspots.Smoothed sm = Hotspots.smoothed(riseMap, maps.width(), maps.height(), maps.pxPerMm(),
                sigmaBoardPx, "K");
        double minSepPx = Math.max(2.0, 1.0 * maps.pxPerMm());
        List<Hotspot> hotspots = Hotspots.find(sm, options.hotspotKSigma(), minSepPx, options.maxHotspots(), parts);
        // a spot within two blur sigmas of a footprint is that part's heat spread by the optics, not an unmarked part
        double blurMarginMm = 2 * sigmaBoardPx / maps.pxPerMm();

        List<Verdicts.Candidate> candidates = new ArrayList<>();
        double[] rateSe = new double[np];
        for (int p = 0; p < np; p++) {
            Part part = parts.get(p);
            LineFit rate = curves[p].rate();
            // noise and position error only: the emissivity uncertainty is a scale error, carried separately as
            // the rates at e + u and e - u (lowScale, highScale) and applied in the separation test (Verdicts)
            rateSe[p] = rate == null ? Double.NaN : rate.slopeSe();
            float peak = Float.NaN;
            for (int k : footprints.indices(p)) {
                float v = sm.map().values()[k];
                if (!Float.isNaN(v) && (Float.isNaN(peak) || v > peak)) peak = v;
            }
            candidates.add(new Verdicts.Candidate(part.ref(), rate == null ? null : rate.slope(),
                    rate == null ? null : rateSe[p], curves[p].onsetS() != null, peak, lowScale[p], highScale[p]));
        }
        Integer[] order = new Integer[np];
        for (int p = 0; p < np; p++) order[p] = p;
        // by rate; parts without one (too few frames after the start) after those with one, by their end rise
        // (before, in the board file's order: a part risen 0.06 K ranked above one risen 4.4 K)
        Arrays.sort(order, Comparator.comparingDouble((Integer p) -> {
            Double r = candidates.get(p).rateKPerS();
            return r == null || r.isNaN() ? Double.POSITIVE_INFINITY : -r;
        }).thenComparingDouble(p -> Double.isFinite(curves[p].endRiseK()) ? -curves[p].endRiseK()
                : Double.POSITIVE_INFINITY));
        List<Verdicts.Candidate> ranked = new ArrayList<>();
        for (Integer p : order) ranked.add(candidates.get(p));
        Verdicts.PairedLead paired = np >= 2 ? pairedLead(t, curves, candidates, ws, positionErrorK, mappingSigmaBoardPx,
                order[0]) : null;
        Verdict verdict = Verdicts.insufficientEvidence(usableTimes(t, np), n, plan.tStartS(), np,
                Verdicts.MIN_USABLE_FRAMES);
        if (verdict != null) verdict = Verdicts.withAlignmentHint(verdict, records, options.stillCamera());
        if (verdict == null)
            verdict = Verdicts.decide(ranked, hotspots, sm.sigma(), weakCount, n, options, "K/s", parts, blurMarginMm,
                    paired);

        List<PartResult> results = new ArrayList<>();
        List<RiseCurve> riseCurves = new ArrayList<>();
        for (int rank = 0; rank < np; rank++) {
            int p = order[rank];
            Part part = parts.get(p);
            PartCurve c = curves[p];
            LineFit rate = c.rate();
            RiseModelFit fit = c.fit();
            List<String> warnings = new ArrayList<>();
            if (eps[p].value() < 0.5)
                warnings.add("emissivity " + eps[p].value() + " (" + part.material()
                        + "): reading unreliable: cover with high-emissivity tape and capture again"
                        + (rate == null || eps[p].uncertainty() <= 0 ? "" : String.format(java.util.Locale.ROOT,
                        " (over emissivity %.2f ± %.2f the rate lies between %.4f and %.4f K/s)",
                        eps[p].value(), eps[p].uncertainty(), rate.slope() * Math.min(lowScale[p], highScale[p]),
                        rate.slope() * Math.max(lowScale[p], highScale[p]))));
            if (meanValid[p] < 0.9)
                warnings.add(String.format(java.util.Locale.ROOT,
                        "partly outside the frame: on average %.0f %% of the footprint was visible", 100 * meanValid[p]));
            if (!(c.noiseK() > 0)) warnings.add("noise could not be measured (too few frames)");
            results.add(new PartResult(part.ref(), rank + 1, rate == null ? null : rate.slope(),
                    rate == null ? null : rateSe[p], finite(c.endRiseK()), c.onsetS(),
                    fit == null ? null : fit.slow().tauS(), fit == null ? null : fit.slow().tauSe(),
                    fit == null ? null : fit.dtInfK(), fit == null ? null : fit.dtInfSe(),
                    fit == null ? null : fit.rmsK(), finite(c.noiseK()), meanValid[p], eps[p].value(), warnings, fit));
            riseCurves.add(new RiseCurve(part.ref(), t.clone(), c.riseK(), c.onsetS(), fit));
        }
        return new Analysis(result(verdict, results, hotspots), board, riseCurves, sm.map(), maps.onsetMap(), lastRaster);
    }

    /** Times of the frames in which some part's footprint was visible with a finite temperature. */
    private double[] usableTimes(double[] t, int np) {
        double[] out = new double[t.length];
        int m = 0;
        for (int i = 0; i < t.length; i++) {
            boolean usable = np == 0;
            for (int p = 0; p < np && !usable; p++)
                usable = stats.get(i)[p * FootprintSampler.STATS + FootprintSampler.VALID] > 0
                        && Double.isFinite(stats.get(i)[p * FootprintSampler.STATS + FootprintSampler.P95]);
            if (usable) out[m++] = t[i];
        }
        return Arrays.copyOf(out, m);
    }

    /**
     * The apparent rise map turned into object-temperature rises: a rise scales with the emissivity correction's gain
     * (object kelvin per apparent kelvin), so each pixel of a part's footprint is multiplied by that part's gain
     * (the smallest part wins where footprints overlap), every other pixel by the gain at the default emissivity.
     */
    private float[] correctedRiseMap(float[] rise, float[] baseMean, double[] gain, double ambBase) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (int k = 0; k < baseMean.length; k++)
            if (!Float.isNaN(baseMean[k]) && !Float.isNaN(rise[k])) {
                lo = Math.min(lo, baseMean[k]);
                hi = Math.max(hi, baseMean[k] + Math.max(0, rise[k]));
            }
        if (!Double.isFinite(lo)) return rise;
        double reflected = context.reflectedC() != null ? context.reflectedC() : Double.isFinite(ambBase) ? ambBase : lo;
        EmissivityModel.Emissivity e0 = emissivity.forMaterial(null);
        double g0 = new CorrectionTable(emissivity, e0.value(), reflected, lo, hi).gain();
        float[] g = new float[rise.length];
        Arrays.fill(g, (float) g0);
        Integer[] bySize = new Integer[parts.size()];
        for (int p = 0; p < bySize.length; p++) bySize[p] = p;
        Arrays.sort(bySize, Comparator.comparingDouble((Integer p) -> -parts.get(p).wMm() * parts.get(p).hMm()));
        int w = maps.width(), h = maps.height();
        double px = maps.pxPerMm();
        for (int p : bySize) {
            Part part = parts.get(p);
            if (!(gain[p] > 0)) continue;
            double r = 0.5 * Math.hypot(part.wMm(), part.hMm());
            int i0 = Math.max(0, (int) Math.floor((part.xMm() - r) * px)), i1 = Math.min(w - 1, (int) Math.ceil((part.xMm() + r) * px));
            int j0 = Math.max(0, (int) Math.floor((part.yMm() - r) * px)), j1 = Math.min(h - 1, (int) Math.ceil((part.yMm() + r) * px));
            for (int j = j0; j <= j1; j++)
                for (int i = i0; i <= i1; i++)
                    if (part.contains((i + 0.5) / px, (j + 0.5) / px)) g[j * w + i] = (float) gain[p];
        }
        float[] out = new float[rise.length];
        for (int k = 0; k < out.length; k++) out[k] = rise[k] * g[k];
        return out;
    }

    private AnalysisResult result(Verdict v, List<PartResult> parts, List<Hotspot> hotspots) {
        java.util.Map<String, Object> params = options.asMap();
        params.put("baseline_rule", plan.rule());
        params.put("t_start_s", plan.tStartS());
        params.put("baseline_frames_used", baselineUsed);
        params.put("ambient_source", context.ambientSource());
        if (maps != null) params.put("board_px_per_mm", maps.pxPerMm());
        params.put("rate_window_used_s", finite(windowUsedS));
        params.put("position_error", "each footprint's sensitivity to a board-pixel shift on the baseline, times the"
                + " mapping uncertainty (corner_sigma_px) at the two ends of the rate window");
        params.put("position_sigma_board_px", positionSigmaBoardPx);
        if (maps != null) params.put("pixel_noise_k", finite(maps.pixelSigma()));
        params.put("fit_model_rule", RiseModelFit.RULE);
        return new AnalysisResult(AnalysisResult.SCHEMA, "risetrace", context.version(), Instant.now().toString(),
                context.series(), context.boardFile(), context.profile(), params, context.injection(), v, parts,
                hotspots, List.copyOf(records));
    }

    private static Double finite(double v) {
        return Double.isFinite(v) ? v : null;
    }

    /**
     * The emissivity correction of one part tabulated at 65 apparent temperatures over the part's range and
     * interpolated linearly: the band-radiance correction is smooth and monotonic, so over a range of tens of kelvin
     * the interpolation error stays far below the camera's noise, and the band integrals run 65 times per part
     * instead of once per frame.
     */
    static final class CorrectionTable {
        private static final int NODES = 65;
        private final double lo, step;
        private final double[] object = new double[NODES];

        CorrectionTable(EmissivityModel model, double e, double reflectedC, double loC, double hiC) {
            lo = loC - 0.5;
            step = (hiC + 0.5 - lo) / (NODES - 1);
            try {
                for (int k = 0; k < NODES; k++) object[k] = model.objectCelsius(lo + k * step, e, reflectedC);
            } catch (IllegalArgumentException impossible) {
                // the readings and the reflected temperature contradict each other (e.g. reflected_c far above them)
                throw new org.risetrace.frame.InputRejected(null, "the emissivity correction is impossible: "
                        + impossible.getMessage(), "check reflected_c in series.json and the parts' materials");
            }
        }

        /** Object kelvin per apparent kelvin over the table's range (the rise scale of the correction). */
        double gain() {
            return (object[NODES - 1] - object[0]) / (step * (NODES - 1));
        }

        double objectCelsius(double apparentC) {
            double u = (apparentC - lo) / step;
            int k = Math.max(0, Math.min(NODES - 2, (int) Math.floor(u)));
            double f = u - k;
            return object[k] + f * (object[k + 1] - object[k]);
        }
    }
}
