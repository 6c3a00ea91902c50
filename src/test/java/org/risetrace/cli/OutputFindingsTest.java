package org.risetrace.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The findings of issue 17 about what the outputs say, each run as a user runs it: through {@link Main#run} on the
 * bundled demo series, reading back the files written. References: the demo's own series.json and scenario.json
 * (what the outputs must repeat), the bundled materials table, and the first-order emissivity correction for a
 * small rise with the reflected temperature at ambient, dT_object = dT_apparent / e (common practice).
 */
class OutputFindingsTest {
    static final Path BEFORE_AFTER = Path.of("sample-frames", "before-after");
    static final Path CAP_SHORT = Path.of("sample-frames", "cap-short");
    static final Path PHASE_SHORT = Path.of("sample-frames", "phase-short");

    @Test
    void compareCarriesTheInjectionRecordEmissivitiesAndCaptureInstants(@TempDir Path out) throws IOException {
        InspectCommandTest.Result r = InspectCommandTest.run("compare", BEFORE_AFTER.resolve("f0001.tif").toString(),
                BEFORE_AFTER.resolve("f0002.tif").toString(), "--out", out.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        ObjectMapper m = new ObjectMapper();
        JsonNode doc = m.readTree(out.resolve("analysis.json").toFile());
        JsonNode series = m.readTree(BEFORE_AFTER.resolve("series.json").toFile());
        // the injection record is series.json's, field for field
        assertEquals(series.get("injection"), doc.get("injection"));

        // each part's emissivity: its material's from the bundled table, else the f32-celsius profile's default 0.95
        JsonNode board = m.readTree(BEFORE_AFTER.resolve("board.json").toFile());
        Materials materials = Materials.load();
        int checked = 0;
        for (JsonNode part : doc.get("parts")) {
            JsonNode def = null;
            for (JsonNode b : board.get("parts")) if (b.get("ref").asText().equals(part.get("ref").asText())) def = b;
            double expected = def.has("material") ? materials.get(def.get("material").asText()).emissivity() : 0.95;
            assertEquals(expected, part.get("emissivity").asDouble(), 1e-12, part.toString());
            checked++;
        }
        assertEquals(board.get("parts").size(), checked);

        // capture instants: scenario.json camera.exif_start 2026-11-30T14:05:00Z, frames 30 s apart (series.json t_s)
        assertEquals("2026-11-30T14:05:00Z", doc.get("frames").get(0).get("instant").asText());
        assertEquals("2026-11-30T14:05:30Z", doc.get("frames").get(1).get("instant").asText());
    }

    @Test
    void compareCorrectsEachRiseByItsEmissivity() {
        Series s = Series.open(BEFORE_AFTER);
        Board board = BoardFile.read(BEFORE_AFTER.resolve("board.json"), Materials.load().names());
        AnalysisOptions o = AnalysisOptions.defaults();
        Analysis plain = SeriesAnalyzer.compare(s.read(0), s.read(1), board, null, o, "f32-celsius");
        Analysis corrected = SeriesAnalyzer.compare(s.read(0), s.read(1), board, null, o, s.sidecar(), s.profile());
        int checked = 0;
        for (PartResult p : corrected.result().parts()) {
            PartResult q = plain.result().parts().stream().filter(x -> x.ref().equals(p.ref())).findFirst().orElseThrow();
            if (q.riseK() < 1.0) continue; // the first-order rule is checked where the rise stands clear of noise
            // dT_object = dT_apparent / e to first order (reflected at ambient): within 2 % for a few kelvin
            assertEquals(q.riseK() / p.emissivity(), p.riseK(), 0.02 * p.riseK(), p.ref());
            checked++;
        }
        assertTrue(checked >= 1, "premise: at least one part rose by 1 K or more");
        assertEquals(org.risetrace.sim.Truth.read(BEFORE_AFTER.resolve("truth.json")).primarySource(),
                corrected.result().verdict().ref());
    }

    @Test
    void hottestSpotOnNoMarkedPartIsNotPresentedAsAMarkedLeader(@TempDir Path out) throws IOException {
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", CAP_SHORT.toString(), "--out", out.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        // the demo's source C17 is not marked (scenario.json "marked"): the line names no marked part
        assertTrue(r.out().startsWith("cap-short: inconclusive - the hottest spot"), r.out());
        JsonNode doc = new ObjectMapper().readTree(out.resolve("analysis.json").toFile());
        assertTrue(doc.get("verdict").get("ref").isNull(), doc.get("verdict").toString());
        String html = Files.readString(out.resolve("report.html"));
        assertFalse(html.contains("class=\"leader\""), "no ranking row is highlighted as the answer");
        assertEquals(1, count(html, "is on no marked part"), "the request to mark the part is made once");

        // the rise map's colour bar reaches the hot spot table's maximum: no points beyond its top
        Matcher caption = Pattern.compile("Rise above ambient at the end of the series[^<]*").matcher(html);
        assertTrue(caption.find());
        assertFalse(caption.group().contains("clipped"), caption.group());

        // an onset only for a part still risen above k sigma at the end
        double k = doc.get("parameters").get("k_sigma").asDouble();
        for (JsonNode p : doc.get("parts"))
            if (!p.get("onset_s").isNull())
                assertTrue(p.get("rise_k").asDouble() > k * p.get("noise_k").asDouble(), p.toString());
    }

    @Test
    void compareOnTwoFramesOfASeriesDoesNotWarnAboutTheFramesItWasNotGiven(@TempDir Path out) {
        // two frames picked from a capture: the sidecar's 88 other entries are left out on purpose
        InspectCommandTest.Result r = InspectCommandTest.run("compare", PHASE_SHORT.resolve("f0001.png").toString(),
                PHASE_SHORT.resolve("f0090.png").toString(), "--out", out.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        assertEquals(0, count(r.err(), "series.json lists"), r.err());
        assertTrue(r.out().contains("Q3"), r.out());
    }

    @Test
    void aFolderMissingSomeOfItsSidecarsFramesSaysSoOnceButPickedFramesDoNot(@TempDir Path dir) throws IOException {
        Path copy = dir.resolve("phase-short");
        Files.createDirectories(copy);
        try (var files = Files.list(PHASE_SHORT)) {
            for (Path f : files.toList()) Files.copy(f, copy.resolve(f.getFileName()));
        }
        Files.delete(copy.resolve("f0010.png"));
        Files.delete(copy.resolve("f0011.png"));
        // a folder read as a series: the two entries series.json lists without frames, in one line
        java.util.List<String> folder = Series.open(copy).warnings();
        assertEquals(1, folder.stream().filter(w -> w.contains("series.json lists")).count(), folder.toString());
        assertTrue(folder.toString().contains("lists 2 frames that are not among the frames read ('f0010.png' to 'f0011.png')"),
                folder.toString());
        // two frames picked from it (compare, frame-view): the other 87 entries are left out on purpose
        java.util.List<String> picked = Series.open(java.util.List.of(copy.resolve("f0001.png"), copy.resolve("f0090.png")),
                copy.resolve("series.json"), null).warnings();
        assertTrue(picked.stream().noneMatch(w -> w.contains("series.json lists")), picked.toString());
    }

    @Test
    void compareHelpOffersOnlyWhatAComparisonUses() {
        InspectCommandTest.Result r = InspectCommandTest.run("compare", "--help");
        assertEquals(Main.EXIT_OK, r.code());
        for (String seriesOnly : new String[]{"--rate-window", "--baseline-frames", "--last-frames", "--threads"})
            assertFalse(r.out().contains(seriesOnly), seriesOnly + " in:\n" + r.out());
        assertTrue(r.out().contains("--k-sigma") && r.out().contains("--separation"), r.out());
        // and a series option given to compare is a usage error, not silently ignored
        assertEquals(Main.EXIT_USAGE, InspectCommandTest.run("compare", "a.tif", "b.tif", "--rate-window", "10").code());
    }

    @Test
    void registerHelpExplainsEachMethod() {
        InspectCommandTest.Result r = InspectCommandTest.run("register", "--help");
        String help = r.out().replaceAll("\\s+", " ");
        assertTrue(help.contains("auto (from the previous frame's mapping") && help.contains("features (always")
                && help.contains("search (coarse search only"), r.out());
    }

    @Test
    void boardCheckAcceptsABoardWithoutOutlineWithAWarning(@TempDir Path dir) throws IOException {
        ObjectMapper m = new ObjectMapper();
        ObjectNode board = (ObjectNode) m.readTree(CAP_SHORT.resolve("board.json").toFile());
        board.remove("outline");
        Path file = dir.resolve("board.json");
        m.writeValue(file.toFile(), board);
        InspectCommandTest.Result r = InspectCommandTest.run("board", "check", file.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        assertTrue(r.out().contains("reference none (no outline yet)"), r.out());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().contains("has no outline yet"), r.err());
        // analyze still refuses it, naming the file and the missing field
        InspectCommandTest.Result a = InspectCommandTest.run("analyze", CAP_SHORT.toString(), "--board", file.toString(),
                "--out", dir.resolve("out").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, a.code(), a.out());
        assertTrue(a.err().contains("outline"), a.err());
    }

    static int count(String text, String what) {
        int n = 0;
        for (int i = text.indexOf(what); i >= 0; i = text.indexOf(what, i + 1)) n++;
        return n;
    }

    // --- the three analysis commands through the command line entry point (issue 17: never run that way before)

    @Test
    void demoThroughTheEntryPointChecksEachSeriesAgainstItsTruth(@TempDir Path dir) throws IOException {
        Path samples = dir.resolve("samples"), out = dir.resolve("out");
        Path copy = samples.resolve("before-after");
        Files.createDirectories(copy);
        try (var files = Files.list(BEFORE_AFTER)) {
            for (Path f : (Iterable<Path>) files::iterator) Files.copy(f, copy.resolve(f.getFileName()));
        }
        InspectCommandTest.Result r = InspectCommandTest.run("demo", "--samples", samples.toString(), "--out",
                out.toString());
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        // truth.json of the demo: U3 (the LED driver) is the source
        assertTrue(r.out().startsWith("before-after: identified U3 - U3 warmed most"), r.out());
        assertTrue(r.out().contains("  matches the simulation's truth"), r.out());
        for (String f : new String[]{"analysis.json", "parts.csv", "report.html"})
            assertTrue(Files.size(out.resolve("before-after").resolve(f)) > 0, f);
        JsonNode doc = new ObjectMapper().readTree(out.resolve("before-after").resolve("analysis.json").toFile());
        assertEquals("compare", doc.get("parameters").get("mode").asText());
        assertEquals("U3", doc.get("verdict").get("ref").asText());

        InspectCommandTest.Result empty = InspectCommandTest.run("demo", "--samples", dir.resolve("none").toString(),
                "--out", out.toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, empty.code(), empty.out());
        assertEquals(1, empty.err().lines().count(), empty.err());
    }

    @Test
    void analyzeAndCompareWithJsonPrintOnlyTheDocument(@TempDir Path dir) throws IOException {
        ObjectMapper m = new ObjectMapper();
        InspectCommandTest.Result a = InspectCommandTest.run("analyze", PHASE_SHORT.toString(), "--json", "--out",
                dir.resolve("a").toString());
        assertEquals(Main.EXIT_OK, a.code(), a.err());
        JsonNode doc = m.readTree(a.out());
        // truth.json of the demo: Q3 shorted
        assertEquals("Q3", doc.get("verdict").get("ref").asText());
        assertEquals(m.readTree(dir.resolve("a").resolve("analysis.json").toFile()).get("verdict"), doc.get("verdict"));
        InspectCommandTest.Result c = InspectCommandTest.run("compare", BEFORE_AFTER.resolve("f0001.tif").toString(),
                BEFORE_AFTER.resolve("f0002.tif").toString(), "--json", "--out", dir.resolve("c").toString());
        assertEquals(Main.EXIT_OK, c.code(), c.err());
        assertEquals("U3", m.readTree(c.out()).get("verdict").get("ref").asText());
        // a missing series folder: exit 1, one line naming it
        InspectCommandTest.Result missing = InspectCommandTest.run("analyze", dir.resolve("nope").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, missing.code());
        assertTrue(missing.err().contains("nope") && missing.err().lines().count() == 1, missing.err());
    }
}
