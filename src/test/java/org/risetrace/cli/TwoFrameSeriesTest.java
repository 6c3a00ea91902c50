package org.risetrace.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A series folder of two frames is a before/after pair (common practice: one frame cold, one under injection). Over
 * time it could only be inconclusive, since a rate needs three frames; analysed as a series it came out
 * inconclusive with its parts ranked in the board file's order (a part risen 0.06 K above one risen 4.4 K) while
 * {@code compare} and the demo identified the part from the same two frames. {@code analyze} and {@code batch} now
 * compare such a pair, with the same numbers as {@code compare}.
 */
class TwoFrameSeriesTest {
    private static final ObjectMapper JSON = new ObjectMapper();
    @TempDir
    Path dir;

    @Test
    void analyzeAndBatchCompareAPairAsCompareDoes() throws Exception {
        Path pair = dir.resolve("root").resolve("before-after");
        Files.createDirectories(pair);
        try (var files = Files.list(Path.of("sample-frames", "before-after"))) {
            for (Path f : files.toList()) Files.copy(f, pair.resolve(f.getFileName()));
        }
        InspectCommandTest.Result cmp = InspectCommandTest.run("compare", pair.resolve("f0001.tif").toString(),
                pair.resolve("f0002.tif").toString(), "--out", dir.resolve("cmp").toString());
        assertEquals(0, cmp.code(), cmp.err());
        InspectCommandTest.Result an = InspectCommandTest.run("analyze", pair.toString(), "--out",
                dir.resolve("an").toString());
        assertEquals(0, an.code(), an.err());
        assertTrue(an.out().contains("mode: compare"), an.out());
        assertTrue(an.err().contains("two frames: compared as before and after (f0001.tif -> f0002.tif)"), an.err());

        JsonNode c = JSON.readTree(dir.resolve("cmp/analysis.json").toFile());
        JsonNode a = JSON.readTree(dir.resolve("an/analysis.json").toFile());
        assertEquals("compare", a.get("parameters").get("mode").asText());
        assertEquals(c.get("verdict"), a.get("verdict"));
        assertEquals("identified", a.get("verdict").get("status").asText());
        assertEquals(c.get("parts"), a.get("parts"), "the same rises, ranks and errors as compare");
        // ranked by rise: the ranks follow the rises, largest first
        double last = Double.POSITIVE_INFINITY;
        for (JsonNode p : a.get("parts")) {
            double rise = p.get("rise_k").asDouble();
            assertTrue(rise <= last, p.get("ref") + " rise " + rise + " after " + last);
            last = rise;
        }

        InspectCommandTest.Result batch = InspectCommandTest.run("batch", dir.resolve("root").toString(), "--out",
                dir.resolve("batch").toString(), "--quiet");
        assertEquals(0, batch.code(), batch.err());
        JsonNode summary = JSON.readTree(dir.resolve("batch/summary.json").toFile());
        JsonNode row = summary.get("series").get(0);
        assertEquals("compare", row.get("mode").asText(), row.toString());
        assertEquals(c.get("verdict").get("ref").asText(), row.get("designator").asText(), row.toString());
        assertEquals(List.of("identified"), List.of(row.get("status").asText()));
    }

    @Test
    void aSwappedPairIsRefusedRatherThanReadAsCooling() throws Exception {
        // swapped, a heated part reads as cooled and the comparison found "no heating" with confidence; the series
        // knows the order (series.json t_s: f0001 at 0 s, f0002 at 30 s)
        Path s = Path.of("sample-frames", "before-after");
        InspectCommandTest.Result r = InspectCommandTest.run("compare", s.resolve("f0002.tif").toString(),
                s.resolve("f0001.tif").toString(), "--out", dir.resolve("swapped").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
        assertTrue(r.err().contains("the before frame f0002.tif was captured 30 s after the after frame f0001.tif"),
                r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(Files.notExists(dir.resolve("swapped").resolve("analysis.json")), "nothing written");
    }

    @Test
    void framesFromTwoFoldersAreReadWithoutTheFirstFoldersSidecar() throws Exception {
        // the before folder's series.json describes its own frames: applied to a cut frame from another folder it
        // asked for that frame's t_s, and the message named a missing time instead of the cut file
        Path other = Files.createDirectories(dir.resolve("other"));
        byte[] whole = Files.readAllBytes(Path.of("sample-frames", "before-after", "f0002.tif"));
        Files.write(other.resolve("cut.tif"), java.util.Arrays.copyOf(whole, 5000));
        InspectCommandTest.Result r = InspectCommandTest.run("compare",
                Path.of("sample-frames", "before-after", "f0001.tif").toString(), other.resolve("cut.tif").toString(),
                "--out", dir.resolve("x").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
        assertTrue(r.err().contains("in different folders") && r.err().contains("cut.tif"), r.err());
        assertTrue(!r.err().contains("has no t_s"), r.err());
    }
}
