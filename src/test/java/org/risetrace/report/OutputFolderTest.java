package org.risetrace.report;

import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The output set is replaced as one step: a "kill" (an Error thrown from the step hook, after which nothing of the
 * write runs, as after kill -9) at every step leaves the previous complete set or the new complete one.
 */
class OutputFolderTest {
    /** Stands in for kill -9: nothing after the step runs. */
    static final class Killed extends Error {
        Killed(String step) { super(step); }
    }

    @AfterEach
    void noHook() {
        OutputFolder.stepHook = s -> { };
    }

    private static Map<String, String> contents(Path dir) throws IOException {
        Map<String, String> m = new TreeMap<>();
        try (Stream<Path> s = Files.list(dir)) {
            for (Path p : s.toList()) m.put(p.getFileName().toString(), Files.readString(p));
        }
        return m;
    }

    private static final Analysis FIRST = DemoAnalysis.build(), SECOND = DemoAnalysis.build(true, false);

    private static Analysis first() { return FIRST; }

    private static Analysis second() { return SECOND; }

    @Test
    void theOutputFolderHasTheUsualPermissionsOrTheReplacedOnes(@TempDir Path tmp) throws IOException {
        // a results folder is for the whole bench to read (common practice: shared benches): a new one gets what a
        // folder made here gets (0755 under umask 0022; the staging's temporary directory gave 0700), a replaced
        // one keeps its own
        org.junit.jupiter.api.Assumptions.assumeTrue(tmp.getFileSystem().supportedFileAttributeViews().contains("posix"));
        var usual = Files.getPosixFilePermissions(Files.createDirectory(tmp.resolve("probe")));
        Path out = tmp.resolve("out");
        Reports.writeAll(first(), out, null, false);
        assertEquals(usual, Files.getPosixFilePermissions(out));
        var chosen = java.nio.file.attribute.PosixFilePermissions.fromString("rwxr-x---");
        Files.setPosixFilePermissions(out, chosen);
        Reports.writeAll(second(), out, null, true);
        assertEquals(chosen, Files.getPosixFilePermissions(out));
    }

    @Test
    void anEarlierAnalysisIsKeptWithoutReplace(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("out");
        Reports.writeAll(first(), out, null, false);
        Map<String, String> before = contents(out);
        assertEquals(List.of("analysis.json", "parts.csv", "report.html"), List.copyOf(before.keySet()));
        InputRejected e = assertThrows(InputRejected.class, () -> Reports.writeAll(second(), out, null, false));
        assertTrue(e.getMessage().contains("--force"), e.getMessage());
        assertEquals(before, contents(out));
        Reports.writeAll(second(), out, null, true);
        assertNotEquals(before, contents(out));
        assertEquals(contents(out).keySet(), before.keySet());
    }

    @Test
    void aKillAtAnyStepLeavesTheOldOrTheNewCompleteSet(@TempDir Path tmp) throws IOException {
        Path scratch = tmp.resolve("expected");
        Reports.writeAll(second(), scratch, null, false);
        Map<String, String> newSet = contents(scratch);
        for (String step : List.of("file:analysis.json", "file:parts.csv", "file:report.html", "staged", "aside",
                "placed")) {
            Path out = tmp.resolve("out-" + step.replace(':', '-'));
            Reports.writeAll(first(), out, null, false);
            Map<String, String> oldSet = contents(out);
            OutputFolder.stepHook = s -> { if (s.equals(step)) throw new Killed(s); };
            assertThrows(Killed.class, () -> Reports.writeAll(second(), out, null, true), step);
            OutputFolder.stepHook = s -> { };
            // what a reader finds at the output name right after the kill: the old set, the new set, or (between
            // the two renames only) nothing
            if (Files.exists(out)) {
                Map<String, String> now = contents(out);
                assertTrue(now.equals(oldSet) || now.equals(newSet), step + ": a mixed or partial set " + now.keySet());
                assertEquals(step.equals("placed"), now.equals(newSet), step);
            } else {
                assertEquals("aside", step);
            }
            // the next run (here only its check) restores the previous set and removes the leftovers
            Reports.checkOutputFolder(out, true);
            Map<String, String> after = contents(out);
            assertEquals(step.equals("placed") ? newSet : oldSet, after, step);
            try (Stream<Path> s = Files.list(tmp)) {
                assertFalse(s.anyMatch(p -> p.getFileName().toString().startsWith("." + out.getFileName())),
                        step + ": leftovers beside the output");
            }
        }
    }

    @Test
    void aFolderHoldingOtherFilesIsNeverReplaced(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("mine");
        Files.createDirectories(out);
        Files.writeString(out.resolve("notes.txt"), "my own notes");
        InputRejected e = assertThrows(InputRejected.class, () -> Reports.writeAll(first(), out, null, true));
        assertTrue(e.getMessage().contains("other files"), e.getMessage());
        assertEquals(Map.of("notes.txt", "my own notes"), contents(out));
    }

    @Test
    void anEmptyFolderTakesTheOutputs(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("empty");
        Files.createDirectories(out);
        Reports.writeAll(first(), out, null, false);
        assertEquals(3, contents(out).size());
    }

    @Test
    void aFileWhereTheFolderShouldBeIsRefused(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("file");
        Files.writeString(out, "x");
        InputRejected e = assertThrows(InputRejected.class, () -> Reports.writeAll(first(), out, null, true));
        assertTrue(e.getMessage().contains("not a folder"), e.getMessage());
    }
}
