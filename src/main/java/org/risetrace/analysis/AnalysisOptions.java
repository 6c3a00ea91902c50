package org.risetrace.analysis;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Every tunable of the analysis, with its default. All are written into analysis.json ("parameters").
 *
 * @param baselineFrames     frames used as the baseline when the sidecar gives no injection start (null: the first
 *                           frame only)
 * @param kSigma             onset threshold and significance level, in multiples of the measured noise sigma
 * @param onsetFrames        consecutive frames above k sigma that make an onset
 * @param rateWindowS        length of the early window, after the injection start, over which initial rates are fitted
 * @param minRateFrames      the rate window is widened to hold at least this many frames
 * @param separationSigma    combined standard errors by which the leader must beat the runner-up to be identified
 * @param lastFrames         frames averaged for the end-of-series rise and the rise map
 * @param hotspotKSigma      hot spots must exceed the rise map's median by this many map sigmas (higher than kSigma:
 *                           the map has many pixels, so many chances for a noise peak)
 * @param blurPx             optics blur, Gaussian sigma in frame pixels; the rise map is smoothed at this scale
 * @param maxHotspots        most hot spots reported
 * @param weakFractionLimit  above this fraction of weakly registered frames an identified verdict says so
 * @param ambientGapMm       background band: gap outside the outline
 * @param ambientBandMm      background band: width
 * @param pxPerMm            board-space resolution (null: the rectifier's default for the board)
 * @param stillCamera        the user declares that the camera did not move (on a stand): every frame takes the
 *                           outline as marked unless its own alignment is trusted and says otherwise
 */
public record AnalysisOptions(Integer baselineFrames, double kSigma, int onsetFrames, double rateWindowS,
                              int minRateFrames, double separationSigma, int lastFrames, double hotspotKSigma,
                              double blurPx, int maxHotspots, double weakFractionLimit, double ambientGapMm,
                              double ambientBandMm, Double pxPerMm, boolean stillCamera) {

    public static AnalysisOptions defaults() {
        return new AnalysisOptions(null, 3.0, 2, 30.0, 12, 3.0, 5, 5.0, 1.0, 10, 0.25, 1.0, 3.0, null, false);
    }

    public AnalysisOptions {
        if (baselineFrames != null && baselineFrames < 1) throw new IllegalArgumentException("baseline frames must be >= 1");
        if (!(kSigma > 0)) throw new IllegalArgumentException("k sigma must be > 0");
        if (onsetFrames < 1) throw new IllegalArgumentException("onset frames must be >= 1");
        if (!(rateWindowS > 0)) throw new IllegalArgumentException("rate window must be > 0 s");
        if (minRateFrames < 3) throw new IllegalArgumentException("the rate window needs at least 3 frames");
        if (lastFrames < 1) throw new IllegalArgumentException("last frames must be >= 1");
        if (pxPerMm != null && !(pxPerMm > 0)) throw new IllegalArgumentException("px per mm must be > 0");
    }

    public AnalysisOptions withBaselineFrames(Integer n) {
        return new AnalysisOptions(n, kSigma, onsetFrames, rateWindowS, minRateFrames, separationSigma, lastFrames,
                hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, pxPerMm, stillCamera);
    }

    public AnalysisOptions withKSigma(double k) {
        return new AnalysisOptions(baselineFrames, k, onsetFrames, rateWindowS, minRateFrames, separationSigma,
                lastFrames, hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, pxPerMm, stillCamera);
    }

    public AnalysisOptions withRateWindowS(double s) {
        return new AnalysisOptions(baselineFrames, kSigma, onsetFrames, s, minRateFrames, separationSigma, lastFrames,
                hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, pxPerMm, stillCamera);
    }

    public AnalysisOptions withSeparationSigma(double s) {
        return new AnalysisOptions(baselineFrames, kSigma, onsetFrames, rateWindowS, minRateFrames, s, lastFrames,
                hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, pxPerMm, stillCamera);
    }

    public AnalysisOptions withPxPerMm(Double p) {
        return new AnalysisOptions(baselineFrames, kSigma, onsetFrames, rateWindowS, minRateFrames, separationSigma,
                lastFrames, hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, p, stillCamera);
    }

    public AnalysisOptions withLastFrames(int n) {
        return new AnalysisOptions(baselineFrames, kSigma, onsetFrames, rateWindowS, minRateFrames, separationSigma, n,
                hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, pxPerMm, stillCamera);
    }

    public AnalysisOptions withStillCamera(boolean still) {
        return new AnalysisOptions(baselineFrames, kSigma, onsetFrames, rateWindowS, minRateFrames, separationSigma,
                lastFrames, hotspotKSigma, blurPx, maxHotspots, weakFractionLimit, ambientGapMm, ambientBandMm, pxPerMm,
                still);
    }

    /** The parameters as written to analysis.json, snake_case names. */
    public Map<String, Object> asMap() {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("baseline_frames", baselineFrames);
        m.put("k_sigma", kSigma);
        m.put("onset_frames", onsetFrames);
        m.put("rate_window_s", rateWindowS);
        m.put("min_rate_frames", minRateFrames);
        m.put("separation_sigma", separationSigma);
        m.put("last_frames", lastFrames);
        m.put("hotspot_k_sigma", hotspotKSigma);
        m.put("blur_px", blurPx);
        m.put("max_hotspots", maxHotspots);
        m.put("weak_fraction_limit", weakFractionLimit);
        m.put("ambient_gap_mm", ambientGapMm);
        m.put("ambient_band_mm", ambientBandMm);
        m.put("px_per_mm", pxPerMm);
        m.put("still_camera", stillCamera);
        m.put("ranking_statistic", "p95");
        return m;
    }
}
