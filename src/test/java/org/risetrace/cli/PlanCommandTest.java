package org.risetrace.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.io.Sidecars;
import org.risetrace.planning.SeriesInjection;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;

import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.risetrace.cli.InspectCommandTest.assertRejected;
import static org.risetrace.cli.InspectCommandTest.run;

/** {@code risetrace plan} and {@code risetrace readings} end to end through {@link Main#run}. */
class PlanCommandTest {
    @TempDir
    Path dir;

    static final String READINGS = """
            what,where,value,unit,instrument,frequency_hz,inductance_uh
            phase inductor,L1,0.15,ohm,ESR meter,100000,0.22
            phase inductor,L2,0.16,ohm,ESR meter,100000,0.22
            phase inductor,L3,0.14,ohm,ESR meter,100000,0.22
            phase inductor,L4,0.004,ohm,ESR meter,100000,0.22
            """;

    @Test
    void planPrintsTheSettingsTheWarningsAndTheCautions() {
        // Ohm: 0.9 V / 0.02 ohm = 45 A wanted, the 5 A limit holds: 0.1 V between the leads, 0.5 W (Joule)
        InspectCommandTest.Result r = run("plan", "--topology", "rail-to-ground", "--rail", "VDD_GPU", "--rail-volts",
                "0.9", "--ohms", "0.02", "--supply-volts", "30", "--supply-amps", "5");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("supply setting    0.9 V, current limit 5 A"), r.out());
        assertTrue(r.out().contains("constant-current"), r.out());
        assertTrue(r.out().contains("power in short    0.5 W"), r.out());
        assertTrue(r.out().contains("supply-caps-current"), r.out());
        assertTrue(r.out().contains("local electrical codes and licensed practice"), r.out());
        assertTrue(r.out().contains("Disconnect the battery"), r.out());
    }

    @Test
    void planAsJsonCarriesTheNumbersAndTheWarningCodes() throws Exception {
        InspectCommandTest.Result r = run("plan", "--topology", "across-switch", "--rail", "VCORE", "--rail-volts", "1.0",
                "--high-rail", "VIN", "--high-rail-volts", "12", "--ohms", "0.05", "--path-ohms", "0.002",
                "--supply-volts", "30", "--supply-amps", "3", "--set-volts", "15", "--mains-connected", "--json");
        assertEquals(0, r.code(), r.err());
        JsonNode j = new ObjectMapper().readTree(r.out());
        assertEquals("risetrace-plan/1", j.get("schema").asText());
        assertEquals(12.0, j.get("set_volts").asDouble(), 1e-12); // 15 V asked, clamped to the 12 V nominal
        assertEquals(0.432, j.get("short_power_w").asDouble(), 1e-12); // 3^2 x 0.048 ohm
        StringBuilder codes = new StringBuilder();
        j.get("warnings").forEach(w -> codes.append(w.get("code").asText()).append(' '));
        assertEquals("above-nominal supply-caps-current mains-connected output-rail-stays ", codes.toString());
        assertTrue(j.get("cautions").size() >= 5);
    }

    @Test
    void badPlanInputsGiveAUsageErrorNamingTheValue() {
        InspectCommandTest.Result r = run("plan", "--topology", "rail-to-ground", "--rail-volts", "0.9", "--ohms", "-1",
                "--supply-volts", "30", "--supply-amps", "5");
        assertEquals(Main.EXIT_USAGE, r.code());
        assertTrue(r.err().startsWith("risetrace: the measured resistance must be a positive number"), r.err());
        assertFalse(r.err().contains("\tat "));
        r = run("plan", "--topology", "across-switch", "--rail-volts", "0.9", "--ohms", "0.1", "--supply-volts", "30",
                "--supply-amps", "5");
        assertEquals(Main.EXIT_USAGE, r.code());
        assertTrue(r.err().contains("higher rail's nominal voltage"), r.err());
        r = run("plan", "--topology", "sideways", "--rail-volts", "0.9", "--ohms", "0.1", "--supply-volts", "30",
                "--supply-amps", "5");
        assertEquals(Main.EXIT_USAGE, r.code());
        assertTrue(r.err().contains("rail-to-ground or across-switch"), r.err());
        r = run("plan", "--topology", "rail-to-ground", "--rail-volts", "0.9", "--supply-volts", "30", "--supply-amps", "5");
        assertEquals(Main.EXIT_USAGE, r.code());
        assertTrue(r.err().contains("--ohms"), r.err());
    }

    @Test
    void writeSeriesIntoAMissingFolderIsRejectedInOneLine() {
        Path missing = dir.resolve("no-such-series");
        InspectCommandTest.Result r = run("plan", "--topology", "rail-to-ground", "--rail-volts", "0.9", "--ohms",
                "0.1", "--supply-volts", "30", "--supply-amps", "5", "--write-series", missing.toString());
        assertRejected(r, missing, "not a folder");
    }

    @Test
    void readingsCommandFlagsTheShortedPhase() throws Exception {
        Path csv = dir.resolve("readings.csv");
        Files.writeString(csv, READINGS);
        InspectCommandTest.Result r = run("readings", dir.toString());
        assertEquals(0, r.code(), r.err());
        String l4 = r.out().lines().filter(l -> l.contains(" L4 ")).findFirst().orElseThrow();
        assertTrue(l4.endsWith("OUTLIER"), l4);
        assertTrue(l4.contains("-9.5"), l4);
        assertEquals(1, r.out().lines().filter(l -> l.endsWith("OUTLIER")).count(), r.out());
        assertTrue(r.out().contains("L4 (phase inductor) reads 0.004 ohm"), r.out());
        InspectCommandTest.Result j = run("readings", csv.toString(), "--json");
        assertEquals(0, j.code(), j.err());
        assertTrue(new ObjectMapper().readTree(j.out()).get("rows").get(3).get("outlier").asBoolean());
    }

    @Test
    void badReadingsAreRejectedInOneLineNamingFileAndLine() throws Exception {
        Path csv = dir.resolve("bad.csv");
        Files.writeString(csv, "what,where,value,unit\nphase inductor,L1,0.15,ohm\nphase inductor,L2,0..16,ohm\n");
        assertRejected(run("readings", csv.toString()), csv, "line 3", "field 'value'", "not a number");
        Path empty = Files.createDirectory(dir.resolve("empty"));
        assertRejected(run("readings", empty.toString()), empty, "no readings.csv");
    }

    @Test
    void analyzeShowsThePlanAndTheReadingsOfTheSeriesFolder() throws Exception {
        SimulationOutput sim = Simulator.run(Scenarios.small(1.5).withFrames(8, 1.0, 2.0), dir.resolve("series"));
        Path series = sim.directory();
        Files.writeString(series.resolve("readings.csv"), READINGS);
        InspectCommandTest.Result p = run("plan", "--topology", "rail-to-ground", "--rail", "VCORE", "--rail-volts",
                "1.0", "--ohms", "0.005", "--supply-volts", "30", "--supply-amps", "5", "--write-series", series.toString());
        assertEquals(0, p.code(), p.err());
        assertTrue(Files.exists(series.resolve(SeriesInjection.BACKUP_FILE)));
        assertEquals(5.0, Sidecars.load(series.resolve("series.json")).injection().currentLimitA());
        Path out = dir.resolve("out");
        InspectCommandTest.Result a = run("analyze", series.toString(), "--out", out.toString());
        assertEquals(0, a.code(), a.err());
        assertFalse(a.err().contains("readings.csv"), "readings.csv is not taken for a frame: " + a.err());
        JsonNode json = new ObjectMapper().readTree(out.resolve("analysis.json").toFile());
        assertEquals("L4", json.get("bench_readings").get("rows").get(3).get("where").asText());
        assertTrue(json.get("bench_readings").get("rows").get(3).get("outlier").asBoolean());
        assertEquals(0.125, json.get("injection").get("plan").get("short_power_w").asDouble(), 1e-12);
        String html = Files.readString(out.resolve("report.html"));
        assertTrue(html.contains("<h2>Injection plan</h2>"));
        assertTrue(html.contains("supply-caps-current"));
        assertTrue(html.contains("<h2>Bench readings</h2>"));
        assertTrue(html.contains("<tr class=\"outlier-row\"><td>phase inductor</td><td class=\"ref\">L4</td>"), html);
    }
}
