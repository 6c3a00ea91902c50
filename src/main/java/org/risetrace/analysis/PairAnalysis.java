package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.board.Part;
import org.risetrace.frame.Frame;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.RegistrationStatus;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Map;

/**
 * Two frames, before and after heating: each part's rise (95th percentile of the footprint after minus before,
 * ambient change removed), hot spots of the difference map, and a ranking by rise; no rates. The noise of one
 * part's rise is taken as sqrt(2) times the single-pixel noise, 1.4826 MAD(after - before) / sqrt(2) over the
 * board: a conservative bound, since a footprint statistic varies less than one pixel.
 *
 * <p>No onset map ({@link Analysis#onsetMap()} is null): with a single frame after heating, every pixel that rose
 * would carry the same onset, the after frame's time, so the map would only repeat the thresholded rise map.
 */
public final class PairAnalysis {
    private PairAnalysis() {
    }

    public static Analysis compare(Frame before, Frame after, Board board, BoardMapper mapper, AmbientSampler ambient,
                                   AnalysisOptions o, SeriesAnalysis.Context context) {
        return compare(before, after, board, mapper, ambient, o, context, EmissivityModel.none());
    }

    /**
     * As above, each part's rise turned into an object-temperature rise with its material's emissivity: a rise scales
     * with the emissivity correction's gain over the part's two apparent temperatures, as in the series analysis.
     */
    public static Analysis compare(Frame before, Frame after, Board board, BoardMapper mapper, AmbientSampler ambient,
                                   AnalysisOptions o, SeriesAnalysis.Context context, EmissivityModel emissivity) {
        List<Part> parts = board.partsOrEmpty();
        FrameRegistration rb = mapper.register(before), ra = mapper.register(after);
        List<FrameRecord> records = List.of(record(before, rb), record(after, ra));
        if (!usable(rb) || !usable(ra)) {
            FrameRegistration bad = usable(rb) ? ra : rb;
            Verdict v = new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null,
                    "frame " + bad.file() + " could not be mapped onto the board: " + bad.reason());
            return new Analysis(result(v, List.of(), List.of(), records, o, context, Double.NaN), board, List.of(),
                    null, null, null);
        }
        BoardRaster xb = mapper.rectify(before, rb.boardToFrame());
        BoardRaster xa = mapper.rectify(after, ra.boardToFrame());
        double ambB = ambient == null ? Double.NaN : ambient.sample(before, rb.boardToFrame());
        double ambA = ambient == null ? Double.NaN : ambient.sample(after, ra.boardToFrame());
        double ambDelta = Double.isFinite(ambA) && Double.isFinite(ambB) ? ambA - ambB : 0;

        int w = xa.width(), h = xa.height();
        float[] diff = new float[w * h];
        for (int k = 0; k < diff.length; k++) {
            boolean ok = (xa.valid() == null || xa.valid()[k]) && (xb.valid() == null || xb.valid()[k]);
            diff[k] = ok ? (float) (xa.celsius()[k] - xb.celsius()[k] - ambDelta) : Float.NaN;
        }
        double pixelSigma = RiseMaps.differenceSigma(xb.celsius(), xa.celsius());
        double framePxPerMm = SeriesAnalysis.framePxPerMm(ra, board);
        double sigmaPx = Double.isFinite(framePxPerMm) && framePxPerMm > 0 ? o.blurPx() * xa.pxPerMm() / framePxPerMm : o.blurPx();
        Hotspots.Smoothed sm = Hotspots.smoothed(diff, w, h, xa.pxPerMm(), sigmaPx, "K");
        List<Hotspot> hotspots = Hotspots.find(sm, o.hotspotKSigma(), Math.max(2.0, xa.pxPerMm()), o.maxHotspots(), parts);

        FootprintSampler fs = new FootprintSampler(parts, w, h, xa.pxPerMm());
        double[] sb = new double[parts.size() * FootprintSampler.STATS], sa = new double[sb.length];
        fs.sample(xb.celsius(), xb.valid(), sb);
        fs.sample(xa.celsius(), xa.valid(), sa);
        double partSigma = Math.sqrt(2) * pixelSigma;
        int np = parts.size();
        double[] rise = new double[np], valid = new double[np], peak = new double[np], gain = new double[np];
        Double[] eps = new Double[np];
        List<Verdicts.Candidate> cands = new ArrayList<>();
        for (int p = 0; p < np; p++) {
            int o95 = p * FootprintSampler.STATS + FootprintSampler.P95, ov = p * FootprintSampler.STATS + FootprintSampler.VALID;
            EmissivityModel.Emissivity e = emissivity.forMaterial(parts.get(p).material());
            double lo = Math.min(sa[o95], sb[o95]), hi = Math.max(sa[o95], sb[o95]);
            double refl = context.reflectedC() != null ? context.reflectedC() : Double.isFinite(ambB) ? ambB : lo;
            gain[p] = Double.isFinite(lo) && Double.isFinite(refl)
                    ? new SeriesAnalysis.CorrectionTable(emissivity, e.value(), refl, lo, hi).gain() : 1.0;
            eps[p] = Double.isFinite(lo) ? e.value() : null;
            rise[p] = gain[p] * (sa[o95] - sb[o95] - ambDelta);
            valid[p] = Math.min(sa[ov], sb[ov]);
            float pk = Float.NaN;
            for (int k : fs.indices(p)) {
                float v = sm.map().values()[k];
                if (!Float.isNaN(v) && (Float.isNaN(pk) || v > pk)) pk = v;
            }
            peak[p] = pk;
            Double r = Double.isFinite(rise[p]) ? rise[p] : null;
            double sigmaP = gain[p] * partSigma;
            cands.add(new Verdicts.Candidate(parts.get(p).ref(), r, r == null ? null : sigmaP,
                    r != null && r > o.kSigma() * sigmaP, pk));
        }
        Integer[] order = new Integer[np];
        for (int p = 0; p < np; p++) order[p] = p;
        Arrays.sort(order, Comparator.comparingDouble((Integer p) -> Double.isFinite(rise[p]) ? -rise[p] : Double.POSITIVE_INFINITY));
        List<Verdicts.Candidate> ranked = new ArrayList<>();
        for (Integer p : order) ranked.add(cands.get(p));
        int weak = (rb.status() == RegistrationStatus.WEAK ? 1 : 0) + (ra.status() == RegistrationStatus.WEAK ? 1 : 0);
        // both frames must show some part: a pair has one frame on each side of the injection
        boolean seen = np == 0;
        for (int p = 0; p < np; p++) seen |= valid[p] > 0 && Double.isFinite(rise[p]);
        Verdict v0 = Verdicts.insufficientEvidence(seen ? new double[]{0, 1} : new double[0], 2, 0.5, np, 2);
        if (v0 == null) v0 = Verdicts.decide(ranked, hotspots, sm.sigma(), weak, 2, o, "K");
        Verdict v = new Verdict(v0.status(), v0.ref(), null, v0.runnerUpRef(), v0.separationSigma(), v0.reason());

        List<PartResult> results = new ArrayList<>();
        List<RiseCurve> curves = new ArrayList<>();
        for (int rank = 0; rank < np; rank++) {
            int p = order[rank];
            List<String> warnings = new ArrayList<>();
            if (valid[p] < 0.9) warnings.add(String.format(java.util.Locale.ROOT,
                    "partly outside the frame: %.0f %% of the footprint was visible in both frames", 100 * valid[p]));
            results.add(new PartResult(parts.get(p).ref(), rank + 1, null, null, Double.isFinite(rise[p]) ? rise[p] : null,
                    null, null, null, null, null, null, Double.isFinite(partSigma) ? gain[p] * partSigma : null, valid[p],
                    eps[p], warnings));
            curves.add(new RiseCurve(parts.get(p).ref(), new double[]{before.tSeconds(), after.tSeconds()},
                    new double[]{0, rise[p]}, null, null, null));
        }
        return new Analysis(result(v, results, hotspots, records, o, context, pixelSigma), board, curves, sm.map(),
                null, xa);
    }

    private static boolean usable(FrameRegistration r) {
        return r != null && r.status().usable() && r.boardToFrame() != null;
    }

    private static FrameRecord record(Frame f, FrameRegistration r) {
        return new FrameRecord(f.fileName(), f.tSeconds(), f.sha256(), usable(r), r == null ? null
                : new FrameRecord.Registration(r.status().word(), Double.isFinite(r.rmsPx()) ? r.rmsPx() : null,
                r.reason(), r.boardCornersPx())).withInstant(f.instant());
    }

    private static AnalysisResult result(Verdict v, List<PartResult> parts, List<Hotspot> hotspots,
                                         List<FrameRecord> frames, AnalysisOptions o, SeriesAnalysis.Context c,
                                         double pixelSigma) {
        Map<String, Object> params = o.asMap();
        params.put("mode", "compare");
        params.put("ambient_source", c.ambientSource());
        params.put("pixel_noise_k", Double.isFinite(pixelSigma) ? pixelSigma : null);
        return new AnalysisResult(AnalysisResult.SCHEMA, "risetrace", c.version(), Instant.now().toString(), c.series(),
                c.boardFile(), c.profile(), params, c.injection(), v, parts, hotspots, frames);
    }
}
