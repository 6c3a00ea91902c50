package org.risetrace.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.sim.Truth;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The weak-source demo (sample-frames/leak-pulse: a leaky capacitor dissipating 2 mW while the supply is switched on
 * and off every 4 s, its temperature swing at the fundamental about 0.04 K against a camera noise of 0.05 K per frame)
 * through {@code risetrace analyze}: the series.json gives a period, so lock-in runs; the steady analysis of the
 * same frames cannot name the source (inconclusive), lock-in names it; both asserted, the source from the
 * simulation's truth.json. The reference is the lock-in principle itself: noise falls with the square root of the
 * number of periods while the periodic response stays (Breitenstein, Warta and Langenkamp, Lock-in Thermography,
 * Springer, chapter 1).
 */
class LockInDemoTest {
    static final Path SERIES = Path.of("sample-frames", "leak-pulse");

    @Test
    void weakPeriodicSourceIsInconclusiveSteadyAndIdentifiedByLockIn(@TempDir Path out) throws IOException {
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", SERIES.toString(), "--out", out.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        String source = Truth.read(SERIES.resolve("truth.json")).primarySource();
        assertEquals("C9", source);
        assertTrue(r.out().startsWith("leak-pulse: identified " + source + " "), r.out());
        assertTrue(r.out().contains("mode: lock-in, period 8.000 s (from series.json), 7 whole periods"), r.out());

        JsonNode doc = new ObjectMapper().readTree(out.resolve("analysis.json").toFile());
        assertEquals("lock-in", doc.get("mode").asText());
        JsonNode lockIn = doc.get("lock_in");
        assertEquals("identified", doc.get("verdict").get("status").asText());
        assertEquals(source, doc.get("verdict").get("ref").asText());
        // not named by the steady analysis: inconclusive, or no-heating since an onset needs the part still risen
        // above k sigma at the end (a part switched off half the time need not be)
        String steady = lockIn.get("steady_verdict").get("status").asText();
        assertTrue(steady.equals("inconclusive") || steady.equals("no-heating"),
                "the steady analysis cannot name a 2 mW source: " + steady);
        assertEquals(7, lockIn.get("periods").asInt());
        assertEquals(28, lockIn.get("periods_to_halve_sensitivity").asInt());
        JsonNode lead = lockIn.get("parts").get(0);
        assertEquals(source, lead.get("ref").asText());
        // the source is weaker than the camera's noise per frame (0.05 K, scenario.json) yet stands clear of its
        // standard error; a directly heated part lags its power by 0 to 90 degrees (first-order response)
        assertTrue(lead.get("amplitude_k").asDouble() < 0.05, lead.toString());
        assertTrue(lead.get("snr").asDouble() > 6, lead.toString());
        double lag = lead.get("lag_deg").asDouble();
        assertTrue(lag > 0 && lag < 90, lead.toString());
        // the per-pixel sensitivity follows sigma sqrt(2/N): NETD 0.05 K (with 0.02 K fixed pattern, which the
        // trend removes) over 112 frames gives 3 x 0.05 x sqrt(2/112) = 0.020 K; blur averages neighbours, so lower
        double sensitivity = lockIn.get("sensitivity_k").asDouble();
        assertTrue(sensitivity > 0.005 && sensitivity < 0.021, "sensitivity " + sensitivity);
        String html = Files.readString(out.resolve("report.html"));
        assertTrue(html.contains("lock-in analysis") && html.contains("Lock-in amplitude map")
                && html.contains("Lock-in phase map") && html.contains("To halve it"), "report sections");
        // the cautions right under the lock-in answer, with the switched supply's (README "Lock-in"), before the
        // steady analysis shown for comparison
        int caution = html.indexOf("A switched supply is still a live supply");
        assertTrue(caution > html.indexOf("lock-in analysis") && caution < html.indexOf("Lock-in amplitude map")
                && caution < html.indexOf("Steady analysis of the same frames"), "safety under the lock-in verdict");
    }

    @Test
    void steadyModeCanBeForcedOnAPeriodicSeries(@TempDir Path out) {
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", SERIES.toString(), "--mode", "steady",
                "--out", out.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        assertTrue(r.out().startsWith("leak-pulse: inconclusive") || r.out().startsWith("leak-pulse: no-heating"),
                r.out());
        assertTrue(r.out().contains("mode: steady"), r.out());
    }

    /** A copy of a simulated series whose series.json has no period (the injection's timing is not recorded). */
    static Path withoutPeriod(Path series, Path dir) throws IOException {
        return withInjection(series, dir.resolve("no-period"), injection -> {
            injection.remove("period_s");
            injection.remove("on_s");
        });
    }

    /** A copy of a simulated series (frames, board) with its series.json's injection record changed. */
    static Path withInjection(Path series, Path s, java.util.function.Consumer<com.fasterxml.jackson.databind.node.ObjectNode> change)
            throws IOException {
        Files.createDirectories(s);
        try (var files = Files.list(series)) {
            for (Path f : (Iterable<Path>) files::iterator)
                if (f.getFileName().toString().endsWith(".png") || f.getFileName().toString().equals("board.json"))
                    Files.copy(f, s.resolve(f.getFileName()));
        }
        ObjectMapper json = new ObjectMapper();
        com.fasterxml.jackson.databind.node.ObjectNode sidecar =
                (com.fasterxml.jackson.databind.node.ObjectNode) json.readTree(series.resolve("series.json").toFile());
        change.accept((com.fasterxml.jackson.databind.node.ObjectNode) sidecar.get("injection"));
        json.writeValue(s.resolve("series.json").toFile(), sidecar);
        return s;
    }

    @Test
    void periodIsFoundFromTheSpectrumWhenTheSourceMovesTheBoardMean(@TempDir Path dir) throws IOException {
        // the demo board at 50 mW: the board's mean temperature swings by about 5 mK at the fundamental (heat
        // capacity of the board about 7 J/K: P1 / (omega C)), well above its noise (0.05 K / sqrt(pixels))
        org.risetrace.sim.Scenario sc = org.risetrace.sim.Scenario.read(SERIES.resolve("scenario.json")).withPower(0.05)
                .withFrames(96, 0.5, 2.0); // 5 whole periods
        org.risetrace.sim.SimulationOutput sim = org.risetrace.sim.Simulator.run(sc, dir.resolve("sim"));
        Path s = withoutPeriod(sim.directory(), dir);
        InspectCommandTest.Result auto = InspectCommandTest.run("analyze", s.toString(), "--out", dir.resolve("a").toString());
        assertTrue(auto.out().contains("mode: steady"), "no period in series.json: steady by default");
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", s.toString(), "--mode", "lock-in", "--out",
                dir.resolve("o").toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        assertTrue(r.out().contains("(found from the spectrum)"), r.out());
        assertTrue(r.out().startsWith("no-period: identified C9 "), r.out());
        JsonNode ex = new ObjectMapper().readTree(dir.resolve("o/analysis.json").toFile()).get("lock_in").get("excitation");
        // the periodogram's resolution: about period^2 / (5 x series length) = 0.2 s, refined by a parabola
        assertEquals(8.0, ex.get("period_s").asDouble(), 0.1);
        assertTrue(ex.get("source").asText().contains("only phase differences between parts are meaningful"));
    }

    @Test
    void aSourceTooWeakForTheBoardMeanLeavesThePeriodToTheSidecar(@TempDir Path dir) throws IOException {
        // at 2 mW the board mean swings by about 0.2 mK against a noise of about 0.06 mK per fitted amplitude: a
        // peak that noise reaches too often over about 50 independent trial frequencies; refused, asking for the
        // period
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", withoutPeriod(SERIES, dir).toString(),
                "--mode", "lock-in", "--out", dir.resolve("o").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.out());
        assertTrue(r.err().contains("no periodic heating found") && r.err().contains("injection.period_s"), r.err());
        assertEquals(1, r.err().strip().lines().count(), r.err());
    }

    @Test
    void tooFewPeriodsIsRefusedInOneLine(@TempDir Path dir) throws IOException {
        Path s = dir.resolve("short");
        Files.createDirectories(s);
        for (int i = 1; i <= 12; i++) {
            String f = String.format("f%04d.png", i);
            Files.copy(SERIES.resolve(f), s.resolve(f));
        }
        Files.copy(SERIES.resolve("board.json"), s.resolve("board.json"));
        // the same sidecar without its per-frame times (frame_interval_s gives them)
        ObjectMapper json = new ObjectMapper();
        com.fasterxml.jackson.databind.node.ObjectNode sidecar =
                (com.fasterxml.jackson.databind.node.ObjectNode) json.readTree(SERIES.resolve("series.json").toFile());
        sidecar.remove("frames");
        json.writeValue(s.resolve("series.json").toFile(), sidecar);
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", s.toString(), "--out", dir.resolve("o").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.out());
        assertTrue(r.err().contains("lock-in needs at least 2"), r.err());
        assertEquals(1, r.err().strip().lines().count(), r.err());
    }

    @Test
    void aPeriodOfTooFewFramesIsRefusedInOneLine(@TempDir Path dir) throws IOException {
        // frames every 0.5 s and a 1 s period: two frames a period, the Nyquist limit, where the fundamental's
        // quadrature part cannot be seen (sampling theorem; the fit gave amplitudes of 1e12 K); the README asks for
        // at least 4 frames a period
        Path s = withInjection(SERIES, dir.resolve("fast"), injection -> {
            injection.put("period_s", 1.0);
            injection.put("on_s", 0.5);
        });
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", s.toString(), "--out", dir.resolve("o").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.out());
        assertTrue(r.err().contains("holds 2 frames") && r.err().contains("lock-in needs at least 4 a period"), r.err());
        assertEquals(1, r.err().strip().lines().count(), r.err());
    }
}
