package org.risetrace.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.Simulator;

import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code risetrace case} end to end through {@link Main#run}, as a shop uses it: create, add a series, analyse,
 * report, export, import into a fresh archive, verify; listings; and the user's mistakes as one line on stderr with
 * exit code 1 (refused) or 2 (usage), never a stack trace.
 */
class CaseCommandTest {
    @TempDir
    Path dir;

    private static InspectCommandTest.Result run(String... args) {
        return InspectCommandTest.run(args);
    }

    @Test
    void aShopTakesACaseFromCreationToAVerifiedBagInAnotherArchive() throws Exception {
        Path series = dir.resolve("bench-1");
        Simulator.run(Scenarios.small(0.9).withFrames(12, 0.5, 2.0).withSeed(11), series);
        String a = dir.resolve("archive").toString(), b = dir.resolve("other").toString();
        InspectCommandTest.Result r = run("case", "create", "--archive", a, "--by", "tess", "--number", "C-1",
                "--customer", "ticket 9", "--device", "test board DB-9", "--fault", "hot at idle");
        assertEquals(0, r.code(), r.err());
        assertEquals("C-1", r.out().strip());
        r = run("case", "add-series", "--archive", a, "--by", "tess", "C-1", series.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("C-1/bench-1: 14 files stored"), r.out());
        r = run("case", "analyse", "--archive", a, "--by", "tess", "C-1", "bench-1", "--threads", "2");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("analysis 1 stored"), r.out());
        Files.writeString(dir.resolve("archive/shop.json"), "{\"name\": \"Bench Nine\", \"contact\": [\"12 Mill Lane\"]}");
        Path report = dir.resolve("report.html");
        r = run("case", "report", "--archive", a, "C-1", "--out", report.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(Files.readString(report).contains("Bench Nine"));
        assertEquals(1, run("case", "report", "--archive", a, "C-1", "--out", report.toString()).code(),
                "an existing report file is never overwritten");
        Path bag = dir.resolve("C-1.zip");
        r = run("case", "export", "--archive", a, "C-1", bag.toString());
        assertEquals(0, r.code(), r.err());
        r = run("case", "import", "--archive", b, bag.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().startsWith("C-1: imported"), r.out());
        r = run("case", "verify", "--archive", b);
        assertEquals(0, r.code(), r.out() + r.err());
        assertTrue(r.out().startsWith("whole: "), r.out());
        r = run("case", "show", "--archive", b, "C-1", "--files");
        assertTrue(r.out().contains("import-case") && r.out().contains("f0001.png"), r.out());
        r = run("case", "status", "--archive", a, "C-1", "closed");
        assertEquals(0, r.code(), r.err());
        assertTrue(run("case", "list", "--archive", a, "--status", "closed").out().contains("C-1"));
        assertTrue(run("case", "list", "--archive", a, "--status", "open").out().contains("no cases"));
        assertTrue(run("case", "search", "--archive", a, "db-9").out().contains("C-1"));
        assertTrue(run("case", "show", "--archive", a, "C-1").out().contains("set-status"));
    }

    @Test
    void mistakesAreOneLineWithTheRightExitCode() throws Exception {
        String a = dir.resolve("archive").toString();
        InspectCommandTest.Result r = run("case", "show", "--archive", a, "NOPE");
        assertEquals(1, r.code());
        assertOneLine(r.err(), "no case NOPE");
        r = run("case", "create", "--archive", a, "--number", "../x");
        assertEquals(1, r.code());
        assertOneLine(r.err(), "case number");
        r = run("case", "create", "--archive", a, "--number", "C-1", "--fault", "line one\nline two");
        assertEquals(1, r.code());
        assertOneLine(r.err(), "control character");
        r = run("case", "list", "--archive", a, "--status", "lost");
        assertEquals(2, r.code());
        r = run("case", "list", "--archive", a, "--from", "yesterday");
        assertEquals(1, r.code());
        assertOneLine(r.err(), "YYYY-MM-DD");
        Files.createDirectories(dir.resolve("not-a-bag"));
        r = run("case", "import", "--archive", a, dir.resolve("not-a-bag").toString());
        assertEquals(1, r.code());
        assertOneLine(r.err(), "no bagit.txt");
        r = run("case", "add-series", "--archive", a, "C-9", dir.toString());
        assertEquals(1, r.code());
        r = run("case");
        assertEquals(2, r.code());
    }

    @Test
    void aBoardThatCannotBeAnalysedIsRefusedAndTheSeriesCanThenBeAddedWithAGoodOne() throws Exception {
        Path series = dir.resolve("ba");
        Simulator.run(Scenarios.small(0.9).withFrames(12, 0.5, 2.0).withSeed(11), series);
        Path malformed = Files.writeString(dir.resolve("malformed.json"), "{\"size_mm\": [40, 30],");
        String a = dir.resolve("archive").toString();
        assertEquals(0, run("case", "create", "--archive", a, "--by", "tess", "--number", "2026-0001").code());
        InspectCommandTest.Result r = run("case", "add-series", "--archive", a, "--by", "tess", "2026-0001",
                series.toString(), "--board", malformed.toString());
        assertEquals(1, r.code(), r.out() + r.err());
        // the user's file and the problem, on one line; nothing stored, no path inside the archive
        assertOneLine(r.err(), malformed + ": the board file cannot be analysed: malformed JSON");
        assertFalse(r.err().contains("work-"), r.err());
        assertEquals("", r.out());
        r = run("case", "verify", "--archive", a, "--by", "tess");
        assertEquals(0, r.code(), r.out() + r.err());
        assertFalse(r.out().contains("belong to no record"), r.out());
        assertTrue(r.out().startsWith("whole: 0 stored files"), r.out());
        // the same series under the same name with its good board
        r = run("case", "add-series", "--archive", a, "--by", "tess", "2026-0001", series.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("2026-0001/ba: 14 files stored"), r.out());
        r = run("case", "verify", "--archive", a, "--by", "tess");
        assertEquals(0, r.code(), r.out() + r.err());
        assertFalse(r.out().contains("note:"), r.out());
    }

    private static void assertOneLine(String err, String contains) {
        String[] lines = err.strip().split("\n");
        assertEquals(1, lines.length, err);
        assertTrue(lines[0].startsWith("risetrace: ") && lines[0].contains(contains), err);
        assertFalse(err.contains("\tat "), "no stack trace");
    }
}
