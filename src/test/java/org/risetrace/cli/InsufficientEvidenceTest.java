package org.risetrace.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.io.write.FrameEncoding;
import org.risetrace.io.write.FrameWriters;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.Simulator;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A verdict needs evidence (issue 16, item 2): a simulated shorted board (Q1 at 1.5 W) whose data cannot decide
 * must never be called {@code no-heating}; the status is {@code inconclusive} and the reason says what is missing.
 */
class InsufficientEvidenceTest {
    @TempDir
    static Path shared;
    static Path tiff, png;
    static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    Path dir;

    @BeforeAll
    static void simulate() {
        png = shared.resolve("png");
        Simulator.run(Scenarios.small(1.5), png);
        tiff = shared.resolve("tiff");
        Simulator.run(Scenarios.small(1.5).withEncoding(FrameEncoding.F32_TIFF), tiff);
    }

    private Path copy(Path from) throws IOException {
        Path to = dir.resolve("series");
        Files.createDirectories(to);
        try (Stream<Path> s = Files.list(from)) {
            for (Path p : s.toList()) Files.copy(p, to.resolve(p.getFileName()), StandardCopyOption.REPLACE_EXISTING);
        }
        return to;
    }

    private static List<Path> frames(Path series, String ext) throws IOException {
        try (Stream<Path> s = Files.list(series)) {
            return s.filter(p -> p.toString().endsWith(ext)).sorted().toList();
        }
    }

    /** The verdict of analyze (status and reason) through the command line. */
    private JsonNode verdict(Path series, String... extra) throws IOException {
        List<String> args = new ArrayList<>(List.of("analyze", series.toString(), "--out", dir.resolve("out").toString(),
                "--threads", "2"));
        args.addAll(Arrays.asList(extra));
        InspectCommandTest.Result r = InspectCommandTest.run(args.toArray(String[]::new));
        assertEquals(0, r.code(), r.err());
        return JSON.readTree(dir.resolve("out").resolve("analysis.json").toFile()).get("verdict");
    }

    private static void assertUndecided(JsonNode v, String reasonPart) {
        assertEquals("inconclusive", v.get("status").asText(), v.toString());
        assertTrue(v.get("reason").asText().contains(reasonPart), v.toString());
    }

    @Test
    void theUntouchedSeriesIdentifiesTheShortedPart() throws IOException {
        // the control: with the evidence present the same series names Q1
        JsonNode v = verdict(copy(png));
        assertEquals("identified", v.get("status").asText(), v.toString());
        assertEquals("Q1", v.get("ref").asText());
    }

    @Test
    void anOutlineFarOffTheFrameCannotDecide() throws IOException {
        Path s = copy(png);
        ObjectNode board = (ObjectNode) JSON.readTree(s.resolve("board.json").toFile());
        for (JsonNode c : board.get("outline").get("corners_px")) {
            ((ArrayNode) c).set(0, JSON.getNodeFactory().numberNode(c.get(0).asDouble() + 5000));
        }
        JSON.writeValue(s.resolve("board.json").toFile(), board);
        assertUndecided(verdict(s), "");
    }

    @Test
    void allNanFramesCannotDecide() throws IOException {
        Path s = copy(tiff);
        float[] nan = new float[160 * 128];
        Arrays.fill(nan, Float.NaN);
        for (Path f : frames(s, ".tif")) FrameWriters.write(f, FrameEncoding.F32_TIFF, 160, 128, nan, null);
        assertUndecided(verdict(s), "");
    }

    @Test
    void aSingleFrameCannotDecide() throws IOException {
        Path s = copy(png);
        List<Path> f = frames(s, ".png");
        for (Path p : f.subList(1, f.size())) Files.delete(p);
        assertUndecided(verdict(s), "usable frame");
    }

    @Test
    void anInjectionStartAfterTheLastFrameCannotDecide() throws IOException {
        Path s = copy(png);
        ObjectNode sidecar = (ObjectNode) JSON.readTree(s.resolve("series.json").toFile());
        ((ObjectNode) sidecar.get("injection")).put("start_s", 1000.0);
        JSON.writeValue(s.resolve("series.json").toFile(), sidecar);
        assertUndecided(verdict(s), "after the injection start");
    }

    @Test
    void aComparisonWithNoPartVisibleCannotDecide() throws IOException {
        Path s = copy(Path.of("sample-frames", "before-after"));
        // a board raster too coarse for any footprint is refused (it gave no-heating from one averaged pixel)
        InspectCommandTest.Result coarse = InspectCommandTest.run("compare", s.resolve("f0001.tif").toString(),
                s.resolve("f0002.tif").toString(), "--out", dir.resolve("coarse").toString(), "--px-per-mm", "0.01");
        assertEquals(1, coarse.code(), coarse.err());
        assertTrue(coarse.err().contains("--px-per-mm of at least"), coarse.err());
        // the outline far off the frames: the frames do not map at all
        ObjectNode board = (ObjectNode) JSON.readTree(s.resolve("board.json").toFile());
        for (JsonNode c : board.get("outline").get("corners_px"))
            ((ArrayNode) c).set(0, JSON.getNodeFactory().numberNode(c.get(0).asDouble() + 5000));
        JSON.writeValue(s.resolve("board.json").toFile(), board);
        InspectCommandTest.Result r = InspectCommandTest.run("compare", s.resolve("f0001.tif").toString(),
                s.resolve("f0002.tif").toString(), "--out", dir.resolve("out").toString());
        assertEquals(0, r.code(), r.err());
        assertUndecided(JSON.readTree(dir.resolve("out").resolve("analysis.json").toFile()).get("verdict"), "");
    }

    @Test
    void aUselessBoardResolutionCannotDecideOrIsRefused() throws IOException {
        Path s = copy(png);
        InspectCommandTest.Result r = InspectCommandTest.run("analyze", s.toString(), "--out",
                dir.resolve("out").toString(), "--px-per-mm", "0.001");
        assertEquals(1, r.code(), r.err());
        assertTrue(r.err().contains("less than one pixel across") && r.err().contains("--px-per-mm of at least"), r.err());
    }
}
