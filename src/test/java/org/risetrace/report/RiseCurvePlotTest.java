package org.risetrace.report;

import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.XYPlot;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.junit.jupiter.api.Test;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.analysis.RiseModelFit;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The rise plot's dashed line is the chosen model and follows the measured points; parts that never rose get none.
 * The check reads the chart's own data set (what JFreeChart draws), interpolates the line at each measured time after
 * the start and compares the residual RMS with the part's measured noise.
 */
class RiseCurvePlotTest {

    /** Residual RMS of the measured points after t0 against the chart's line for that curve; NaN without a line. */
    static double lineResidualRms(XYSeriesCollection data, RiseCurve c) {
        int index = data.getSeriesIndex(c.ref() + " fitted model");
        if (index < 0) return Double.NaN;
        XYSeries line = data.getSeries(index);
        double ss = 0;
        int n = 0;
        for (int i = 0; i < c.tS().length; i++) {
            double t = c.tS()[i];
            if (!(t > c.fit().t0S()) || !Double.isFinite(c.riseK()[i])) continue;
            double v = interpolate(line, t);
            ss += (c.riseK()[i] - v) * (c.riseK()[i] - v);
            n++;
        }
        return Math.sqrt(ss / n);
    }

    static double interpolate(XYSeries s, double t) {
        for (int k = 1; k < s.getItemCount(); k++) {
            double t0 = s.getX(k - 1).doubleValue(), t1 = s.getX(k).doubleValue();
            if (t >= t0 && t <= t1) {
                double v0 = s.getY(k - 1).doubleValue(), v1 = s.getY(k).doubleValue();
                return t1 == t0 ? v0 : v0 + (v1 - v0) * (t - t0) / (t1 - t0);
            }
        }
        return Double.NaN;
    }

    static XYSeriesCollection chartData(List<RiseCurve> curves, Double start) {
        JFreeChart chart = Plots.curvesChart(curves, start);
        return (XYSeriesCollection) ((XYPlot) chart.getPlot()).getDataset();
    }

    @Test
    void dashedLineFollowsTheDemoPoints() {
        Analysis a = DemoAnalysis.build();
        XYSeriesCollection data = chartData(a.curves(), 10.0);
        for (RiseCurve c : a.curves()) {
            assertNotNull(c.fit(), c.ref());
            double rms = lineResidualRms(data, c);
            // the demo's noise is 0.03 K (DemoAnalysis): the line through the model leaves about that
            assertTrue(rms < 1.5 * 0.03, c.ref() + ": " + rms);
        }
        // the demo fault has a die and a board term: two time constants drawn
        assertEquals(RiseModelFit.DOUBLE, a.curves().get(0).fit().model(), a.curves().get(0).fit().selection());
        String caption = ReportHtml.curvesCaption(a.curves().subList(0, 5));
        assertTrue(caption.contains("two time constants") && caption.contains("for Q3"), caption);
        assertTrue(caption.contains("one time constant"), caption);
        // below the ranking, the two-constant model in full: both amplitudes and time constants with errors
        String page = ReportHtml.toHtml(a, null);
        RiseModelFit.Term fast = a.curves().get(0).fit().terms().get(0);
        assertTrue(page.contains("Q3: \u0394T1 = " + Html.withError(fast.dtK(), fast.dtSe()) + " K, \u03c41 = "
                + Html.withError(fast.tauS(), fast.tauSe()) + " s"), "two-constant note");
    }

    @Test
    void partWithoutOnsetGetsNoLine() {
        Analysis a = DemoAnalysis.build();
        RiseCurve q3 = a.curves().get(0);
        // the same points and fit, but no onset: the record drops the fit and the chart has no line for it
        RiseCurve cold = new RiseCurve("X9", q3.tS(), q3.riseK(), null, q3.fit());
        assertNull(cold.fit());
        XYSeriesCollection data = chartData(List.of(q3, cold), 10.0);
        assertTrue(data.getSeriesIndex("Q3 fitted model") >= 0);
        assertEquals(-1, data.getSeriesIndex("X9 fitted model"));
        assertTrue(data.getSeriesIndex("X9") >= 0, "its points are still drawn");
        assertEquals(0, Plots.fitLine(cold)[0].length);
    }

    @Test
    void bundledPhaseShortLinesFollowTheirPointsAndColdPartsHaveNone() {
        Path dir = Path.of("sample-frames", "phase-short");
        assertTrue(Files.isDirectory(dir), "bundled series missing");
        Series s = Series.open(dir);
        Board b = BoardFile.read(dir.resolve("board.json"), Materials.load().names());
        Analysis a = SeriesAnalyzer.analyze(s, b, dir.resolve("board.json"), dir.toString(), AnalysisOptions.defaults(),
                SeriesAnalyzer.emissivity(s.profile()), 2, Analyzer.Progress.NONE);
        XYSeriesCollection data = chartData(a.curves(), a.result().injection().startS());
        List<String> drawn = new ArrayList<>();
        for (RiseCurve c : a.curves()) {
            PartResult p = a.result().parts().stream().filter(r -> r.ref().equals(c.ref())).findFirst().orElseThrow();
            if (c.onsetS() == null) {
                assertEquals(-1, data.getSeriesIndex(c.ref() + " fitted model"), c.ref() + " never rose");
                continue;
            }
            if (c.fit() == null) continue;
            drawn.add(c.ref());
            double rms = lineResidualRms(data, c);
            // the line is the model: its residual is the fit's own RMS (interpolation adds under 1 mK)
            assertEquals(c.fit().rmsK(), rms, 0.001, c.ref());
            // and the leader's follows its points to its noise (RiseModelSeriesTest: 0.0176 K vs 0.0170 K)
            if (c.ref().equals("Q3")) assertTrue(rms < 1.5 * p.noiseK(), "Q3 " + rms + " vs " + p.noiseK());
        }
        assertTrue(drawn.contains("Q3"), "drawn: " + drawn);
        assertFalse(a.curves().stream().allMatch(c -> c.onsetS() != null), "phase-short has parts that never rose");
    }

    @Test
    void fitLineIsDashedAlongItsWholeLength() {
        // issue 17: the caption says dashed, but drawn segment by segment each short segment restarted the dash
        // pattern and the line looked solid; drawn as one path per series the pattern runs along the whole line
        Analysis a = DemoAnalysis.build();
        JFreeChart chart = Plots.curvesChart(a.curves(), 10.0);
        XYPlot plot = (XYPlot) chart.getPlot();
        org.jfree.chart.renderer.xy.XYLineAndShapeRenderer r =
                (org.jfree.chart.renderer.xy.XYLineAndShapeRenderer) plot.getRenderer();
        assertTrue(r.getDrawSeriesLineAsPath(), "one path per series");
        XYSeriesCollection data = (XYSeriesCollection) plot.getDataset();
        int fit = data.getSeriesIndex(a.curves().get(0).ref() + " fitted model");
        java.awt.BasicStroke stroke = (java.awt.BasicStroke) r.getSeriesStroke(fit);
        assertNotNull(stroke.getDashArray(), "the fit line is dashed");
        assertTrue(r.getSeriesLinesVisible(fit) && !r.getSeriesShapesVisible(fit));
        // the measured points are dots without a line when a fit is drawn over them
        int measured = data.getSeriesIndex(a.curves().get(0).ref());
        assertEquals(Boolean.FALSE, r.getSeriesLinesVisible(measured));
    }
}
