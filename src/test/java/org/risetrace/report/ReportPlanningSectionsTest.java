package org.risetrace.report;

import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisResult;
import org.risetrace.io.Sidecar;
import org.risetrace.planning.BenchReading;
import org.risetrace.planning.BenchReadings;
import org.risetrace.planning.InjectionPlan;
import org.risetrace.planning.PlanRequest;
import org.risetrace.planning.Planner;
import org.risetrace.planning.Topology;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** report.html's injection plan and bench readings sections (ReportHtml.injectionPlanSection, benchReadingsSection). */
class ReportPlanningSectionsTest {
    private static Analysis with(Sidecar.Injection injection, BenchReadings readings) {
        Analysis a = DemoAnalysis.build();
        AnalysisResult r = a.result();
        AnalysisResult changed = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), r.parameters(), injection, r.verdict(), r.parts(), r.hotspots(), r.frames(),
                readings, r.seriesWarnings());
        return new Analysis(changed, a.board(), a.curves(), a.riseMap(), a.onsetMap(), a.lastFrame());
    }

    private static Sidecar.Injection injectionWith(InjectionPlan plan) {
        return new Sidecar.Injection(10.0, "VCORE", "GND", plan.setVolts(), plan.currentLimitA(), null, null,
                new ObjectMapper().valueToTree(plan));
    }

    private static BenchReadings readings(String where4) {
        String[] v = {"0.15", "0.16", "0.14", "0.004"};
        String[] w = {"L1", "L2", "L3", where4};
        List<BenchReading> l = new java.util.ArrayList<>();
        for (int i = 0; i < 4; i++)
            l.add(new BenchReading(i + 2, "phase inductor", w[i], v[i], Double.parseDouble(v[i]), "ohm", "ESR meter",
                    100e3, 0.22, null));
        return BenchReadings.assess("readings.csv", l);
    }

    @Test
    void noPlanAndNoReadingsMeansNoSections() {
        String page = ReportHtml.toHtml(with(null, null), null);
        assertFalse(page.contains("<h2>Injection plan</h2>"));
        assertFalse(page.contains("<h2>Bench readings</h2>"));
    }

    @Test
    void planSectionShowsSettingsRailsAndEveryWarning() {
        InjectionPlan plan = Planner.plan(new PlanRequest(Topology.ACROSS_SWITCH, "VCORE", 1.0, "VIN", 12.0, 0.05,
                0.002, 30, 3, null, null, null, true, false, null, null, null));
        String page = ReportHtml.toHtml(with(injectionWith(plan), null), null);
        assertTrue(page.contains("<h2>Injection plan</h2>"));
        assertTrue(page.contains("12 V, current limit 3 A (constant-current)"), page);
        assertTrue(page.contains("<th>VCORE against ground</th><td>unchanged"), page);
        for (var w : plan.warnings()) assertTrue(page.contains("<strong>" + w.code().word() + "</strong>"), w.code().word());
        assertTrue(page.contains("<li class=\"sev-stop\"><strong>cell-connected</strong>"), page);
    }

    @Test
    void readingsSectionHighlightsTheOutlierAndEscapesText() {
        String page = ReportHtml.toHtml(with(null, readings("<L4>")), null);
        assertTrue(page.contains("<h2>Bench readings</h2>"));
        assertTrue(page.contains("<tr class=\"outlier-row\"><td>phase inductor</td><td class=\"ref\">&lt;L4&gt;</td>"), page);
        assertFalse(page.contains("<L4>"));
        assertEquals(1, page.split("class=\"outlier-row\"", -1).length - 1);
        assertTrue(page.contains("&lt;L4&gt; (phase inductor) reads 0.004 ohm"), page);
        assertTrue(page.contains("<td>0.138 ohm</td>"), "ideal reactance 2 pi f L of 0.22 uH at 100 kHz");
    }

    @Test
    void aPlanThatCannotBeReadIsSaidSoNotThrown() throws Exception {
        Sidecar.Injection bad = new Sidecar.Injection(10.0, "VCORE", "GND", 1.0, 5.0, null, null,
                new ObjectMapper().readTree("{\"schema\": 7, \"colour\": \"red\"}"));
        String page = ReportHtml.toHtml(with(bad, null), null);
        assertTrue(page.contains("The series' injection plan cannot be read"), page);
    }
}
