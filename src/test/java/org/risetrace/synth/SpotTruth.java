package org.risetrace.synth;

import org.risetrace.analysis.AmbientSampler;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.BaselinePlan;
import org.risetrace.analysis.BoardMapper;
import org.risetrace.analysis.FrameSource;
import org.risetrace.analysis.SeriesAnalysis;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Homographies;
import org.risetrace.registration.Homography;
import org.risetrace.registration.Rectifier;
import org.risetrace.registration.RegistrationStatus;

import java.util.HashMap;
import java.util.Map;

/**
 * Analysis of a {@link SpotSeries} with its true mappings instead of registration (as
 * {@code ConfidenceCalibrationTest.truthMapper} does for the main simulator), so the analysis' confidence can be
 * checked apart from registration.
 */
public final class SpotTruth {
    private SpotTruth() {
    }

    /** A mapper that grades every frame ok with its true board-to-frame homography. */
    public static BoardMapper mapper(SpotSeries.Output out, Board board, Rectifier rect) {
        Map<String, Homography> hs = new HashMap<>();
        for (int k = 0; k < out.fileNames().size(); k++)
            hs.put(out.fileNames().get(k), Homography.fromRows(out.boardToFrame(k)));
        return new BoardMapper() {
            @Override public FrameRegistration register(Frame f) {
                Homography h = hs.get(f.fileName());
                if (h == null) throw new IllegalArgumentException("no truth for " + f.fileName());
                return new FrameRegistration(f.fileName(), f.tSeconds(), RegistrationStatus.OK, null, h,
                        Homographies.boardCorners(board, h), 0, Double.NaN, Double.NaN);
            }

            @Override public BoardRaster rectify(Frame f, Homography h) { return rect.rectify(f, h); }
        };
    }

    /** The analysis of the series with its true mappings (bundled materials, default options, two threads). */
    public static Analysis analyze(SpotSeries.Output out) {
        Series s = Series.open(out.directory());
        Board b = BoardFile.read(out.boardFile(), Materials.load().names());
        AnalysisOptions o = AnalysisOptions.defaults();
        double[] times = new double[s.size()];
        for (int i = 0; i < times.length; i++) times[i] = s.tSeconds(i);
        BaselinePlan plan = BaselinePlan.plan(times, s.sidecar().injection().startS(), o.baselineFrames(), o.lastFrames());
        Rectifier rect = new Rectifier(b, Rectifier.defaultPxPerMm(b));
        AmbientSampler probe = AmbientSampler.forBoard(b, o.ambientGapMm(), o.ambientBandMm());
        SeriesAnalysis sa = new SeriesAnalysis(b, o, plan, SeriesAnalyzer.emissivity(s.profile()),
                new SeriesAnalysis.Context(out.directory().toString(), out.boardFile().toString(), s.profile().name(),
                        s.sidecar().injection(), s.sidecar().reflectedC(), "test", probe.source()));
        FrameSource src = new FrameSource() {
            @Override public int size() { return s.size(); }
            @Override public String fileName(int i) { return s.fileName(i); }
            @Override public double tSeconds(int i) { return s.tSeconds(i); }
            @Override public Frame read(int i) { return s.read(i); }
        };
        return Analyzer.run(src, b, () -> mapper(out, b, rect),
                () -> AmbientSampler.forBoard(b, o.ambientGapMm(), o.ambientBandMm()), sa, 2, Analyzer.Progress.NONE);
    }
}
