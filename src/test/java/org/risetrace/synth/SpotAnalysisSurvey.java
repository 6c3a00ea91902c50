package org.risetrace.synth;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.Verdict;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;
import org.risetrace.synth.SpotSeries.Encoding;
import org.risetrace.synth.SpotSeries.HeatingMode;
import org.risetrace.synth.SpotSeries.MotionKind;

import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;

/**
 * Verdicts of the analysis (registration included, and with the true mappings) on random spot-model series, per
 * heating mode, motion and encoding: counts of identified-right, identified-wrong, inconclusive and no-heating,
 * and how often the rank-1 part is the true leader. A survey for the confidence work, not a test: nothing is
 * asserted. Run with {@code mvn -B test -Dbench.exclude=none -Dgroups=benchmark -Dtest=SpotAnalysisSurvey}
 * ({@code -Dspot.series=N} series per case, default 10; {@code -Dspot.leaderMinSideMm=X}, default 3).
 */
@Tag("benchmark")
class SpotAnalysisSurvey {
    @TempDir
    Path dir;

    private static String key(Verdict v, SpotSeries.Output out) {
        String w = v.status().word();
        if (!w.equals("identified")) return w;
        return out.leaders().contains(v.ref()) ? "identified-right" : "identified-WRONG";
    }

    @Test
    void verdictsOnRandomSpotSeries() {
        int n = Integer.getInteger("spot.series", 10);
        double minSide = Double.parseDouble(System.getProperty("spot.leaderMinSideMm", "3"));
        Object[][] cases = {
                {HeatingMode.LEADER, MotionKind.STAND, Encoding.U16_CENTIKELVIN},
                {HeatingMode.LEADER, MotionKind.HANDHELD, Encoding.U16_CENTIKELVIN},
                {HeatingMode.LEADER, MotionKind.HANDHELD, Encoding.U8_SPAN},
                {HeatingMode.TWO_ALIKE, MotionKind.STAND, Encoding.U16_CENTIKELVIN},
                {HeatingMode.NONE, MotionKind.HANDHELD, Encoding.U8_SPAN}};
        StringBuilder log = new StringBuilder();
        for (Object[] c : cases) {
            HeatingMode mode = (HeatingMode) c[0];
            MotionKind motion = (MotionKind) c[1];
            Encoding enc = (Encoding) c[2];
            Map<String, Integer> registered = new TreeMap<>(), truth = new TreeMap<>();
            int rank1 = 0, rank1Truth = 0;
            for (int i = 0; i < n; i++) {
                SpotSeries.Config config = SpotSeries.random(5000 + i, mode, motion, enc).withLeaderMinSideMm(minSide);
                SpotSeries.Output out = SpotSeries.generate(config, dir.resolve(mode + "-" + motion + "-" + enc + "-" + i));
                Series s = Series.open(out.directory());
                Board b = BoardFile.read(out.boardFile(), Materials.load().names());
                Analysis a = SeriesAnalyzer.analyze(s, b, out.boardFile(), out.directory().toString(),
                        AnalysisOptions.defaults(), SeriesAnalyzer.emissivity(s.profile()), 2, Analyzer.Progress.NONE);
                Analysis t = SpotTruth.analyze(out);
                registered.merge(key(a.result().verdict(), out), 1, Integer::sum);
                truth.merge(key(t.result().verdict(), out), 1, Integer::sum);
                if (out.leaders().contains(a.result().parts().get(0).ref())) rank1++;
                if (out.leaders().contains(t.result().parts().get(0).ref())) rank1Truth++;
            }
            log.append(String.format(Locale.ROOT, "%n  %s %s %s, %d series: registered %s, rank 1 a true leader %d; "
                    + "true mappings %s, rank 1 %d", mode, motion, enc.profile, n, registered, rank1, truth, rank1Truth));
        }
        System.out.println("SpotAnalysisSurvey (leaders with a side >= " + minSide + " mm):" + log);
    }
}
