package org.risetrace.analysis;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.report.AnalysisJson;
import org.risetrace.report.ReportHtml;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * What reading a series assumed is part of the evidence: a series without its sidecar is read with an assumed
 * calibration profile and an assumed 1 s between frames, and every rate rests on that interval (at a true 0.5 s,
 * every rate is half what it should be). The assumptions go into analysis.json and beside the report's answer, not
 * only to the terminal; so does the number of worker threads, on which the last digits depend.
 */
class SeriesWarningsTest {
    @TempDir
    Path dir;

    @Test
    void assumptionsTravelWithTheResult() throws Exception {
        SimulationOutput out = Simulator.run(Scenarios.small(1.5).withSeed(7).withFrames(16, 0.5, 2.0),
                dir.resolve("s"));
        Analysis with = SimulatedSeriesTest.analyze(out.directory());
        assertEquals(List.of(), with.result().seriesWarnings(), "a complete series assumes nothing");
        assertFalse(AnalysisJson.toJson(with.result()).contains("series_warnings"), "absent when empty");
        assertEquals(2, ((Number) with.result().parameters().get("worker_threads")).intValue());

        Files.delete(out.directory().resolve("series.json"));
        Analysis without = SimulatedSeriesTest.analyze(out.directory());
        List<String> w = without.result().seriesWarnings();
        assertTrue(w.stream().anyMatch(s -> s.contains("assumed 1 s between frames")), w.toString());
        assertTrue(w.stream().anyMatch(s -> s.startsWith("no calibration profile named")), w.toString());
        String json = AnalysisJson.toJson(without.result());
        assertTrue(json.contains("\"series_warnings\"") && json.contains("assumed 1 s between frames"), json);
        String html = ReportHtml.toHtml(without, null);
        int verdict = html.indexOf("class=\"verdict"), safety = html.indexOf("class=\"safety\"");
        int said = html.indexOf("assumed 1 s between frames");
        assertTrue(verdict < said && said < safety, "said in the verdict block, before the safety notes");
    }
}
