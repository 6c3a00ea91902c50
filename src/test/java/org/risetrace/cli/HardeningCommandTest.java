package org.risetrace.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Hardening through the command line (issue 16): output folders, option ranges, messages. */
class HardeningCommandTest {
    @TempDir
    Path dir;

    static final Path SAMPLES = Path.of("sample-frames");

    @Test
    void compareKeepsAnEarlierAnalysisUnlessForced() throws IOException {
        Path out = dir.resolve("out");
        String before = SAMPLES.resolve("before-after/f0001.tif").toString();
        String after = SAMPLES.resolve("before-after/f0002.tif").toString();
        InspectCommandTest.Result r = InspectCommandTest.run("compare", before, after, "--out", out.toString());
        assertEquals(0, r.code(), r.err());
        byte[] json = Files.readAllBytes(out.resolve("analysis.json"));
        Files.writeString(out.resolve("report.html"), "kept"); // marks the earlier set

        r = InspectCommandTest.run("compare", before, after, "--out", out.toString());
        assertEquals(1, r.code(), r.err());
        assertTrue(r.err().contains("holds an earlier analysis") && r.err().contains("--force"), r.err());
        assertEquals("kept", Files.readString(out.resolve("report.html")));
        assertArrayEquals(json, Files.readAllBytes(out.resolve("analysis.json")));

        r = InspectCommandTest.run("compare", before, after, "--out", out.toString(), "--force");
        assertEquals(0, r.code(), r.err());
        assertTrue(Files.readString(out.resolve("report.html")).startsWith("<!DOCTYPE html>"));
    }
}
