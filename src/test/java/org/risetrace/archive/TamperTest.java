package org.risetrace.archive;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.cli.CaseVerifyCommand;
import org.risetrace.cli.Main;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Tamper evidence: one byte flipped in a stored original or output, a stored file deleted, a row edited, removed or
 * added behind risetrace's back (the triggers dropped first, as a determined intruder would): verify names each.
 * Every test starts from a copy of one archive that verifies clean.
 */
class TamperTest {
    @TempDir
    static Path shared;
    @TempDir
    Path tmp;

    static Path template;
    static Archive.SeriesRecord series;
    static Archive.AnalysisRecord analysis;

    @BeforeAll
    static void makeArchive() {
        template = shared.resolve("archive");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(template), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            a.createCase(Fixtures.newCase("C-2"));
            series = a.addSeries("C-1", Fixtures.series(shared.resolve("bench-1"), 11), null, null).series();
            analysis = CaseAnalysis.analyse(a, "C-1", "bench-1", AnalysisOptions.defaults(), CaseAnalysis.Mode.AUTO, 2,
                    Analyzer.Progress.NONE);
        }
    }

    private Archive copy() throws Exception {
        Path dir = Files.createTempDirectory(tmp, "copy-");
        Fixtures.copyTree(template, dir);
        return Archive.open(ArchiveSettings.sqlite(dir), "auditor");
    }

    private static List<String> problems(Archive a) {
        return Verifier.verify(a, null).problems();
    }

    private static void assertNamed(List<String> problems, String... words) {
        assertFalse(problems.isEmpty(), "verify found nothing");
        assertTrue(problems.stream().anyMatch(p -> java.util.Arrays.stream(words).allMatch(p::contains)),
                "no problem names " + List.of(words) + ": " + problems);
    }

    @Test
    void anUntouchedCopyVerifiesClean() throws Exception {
        try (Archive a = copy()) {
            Verifier.Report r = Verifier.verify(a, null);
            assertTrue(r.clean(), r.problems().toString());
            assertEquals(series.fileCount() + analysis.outputs().size(), r.filesChecked());
        }
    }

    @Test
    void aFlippedByteInAnyStoredOriginalIsNamed() throws Exception {
        try (Archive a = copy()) {
            for (Archive.StoredFile f : List.of(series.files().get(0), series.files().get(7),
                    series.files().get(series.files().size() - 1))) {
                Fixtures.flipByte(a.store().path(f.sha256()), f.sizeBytes() / 2);
                assertNamed(problems(a), "series bench-1", f.fileName(), "altered");
            }
        }
    }

    @Test
    void aFlippedByteInAStoredOutputIsNamed() throws Exception {
        try (Archive a = copy()) {
            Archive.OutputRecord report = analysis.outputs().stream().filter(o -> o.name().equals("report.html"))
                    .findFirst().orElseThrow();
            Fixtures.flipByte(a.store().path(report.sha256()), 100);
            assertNamed(problems(a), "analysis " + analysis.id(), "report.html", "altered");
        }
    }

    @Test
    void aDeletedStoredFileIsNamed() throws Exception {
        try (Archive a = copy()) {
            Archive.StoredFile f = series.files().get(3);
            Files.delete(a.store().path(f.sha256()));
            assertNamed(problems(a), f.fileName(), "missing");
        }
    }

    @Test
    void anEditedFileRecordIsNamed() throws Exception {
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "DROP TRIGGER frames_no_update",
                    "UPDATE frames SET file_name = 'f9999.png' WHERE file_index = 2");
            assertNamed(problems(a), "series bench-1", "changed after custody entry");
        }
    }

    @Test
    void anEditedCaseRecordIsNamed() throws Exception {
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "UPDATE cases SET device = 'another board' WHERE case_number = 'C-2'");
            assertNamed(problems(a), "case C-2", "changed after custody entry");
        }
    }

    @Test
    void anEditedVerdictIsNamed() throws Exception {
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "UPDATE analyses SET verdict_ref = 'R99'");
            assertNamed(problems(a), "analysis " + analysis.id(), "changed");
        }
    }

    @Test
    void anEditedRemovedOrAddedCustodyEntryBreaksTheChain() throws Exception {
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "DROP TRIGGER custody_no_update",
                    "UPDATE custody SET who = 'mallory' WHERE seq = 2");
            assertNamed(problems(a), "entry 2", "edited");
        }
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "DROP TRIGGER custody_no_delete", "DELETE FROM custody WHERE seq = 3");
            assertNamed(problems(a), "custody log", "missing");
        }
    }

    @Test
    void removedAndAddedRecordsAreNamed() throws Exception {
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "DELETE FROM outputs", "DELETE FROM analyses");
            assertNamed(problems(a), "analysis " + analysis.id(), "missing");
        }
        try (Archive a = copy()) {
            Fixtures.sql(a.settings().folder(), "INSERT INTO cases (case_number, status, opened_at) VALUES "
                    + "('C-X', 'open', '2026-01-01T00:00:00.000Z')");
            assertNamed(problems(a), "case C-X", "not in the custody log");
        }
    }

    @Test
    void theCommandExitsNonZeroAndNamesTheDamage() throws Exception {
        Path dir;
        try (Archive a = copy()) {
            dir = a.settings().folder();
            Fixtures.flipByte(a.store().path(series.files().get(5).sha256()), 10);
        }
        PrintStream old = System.out;
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int code;
        try {
            System.setOut(new PrintStream(out, true, StandardCharsets.UTF_8));
            code = Main.run("case", "verify", "--archive", dir.toString(), "--by", "auditor");
        } finally {
            System.setOut(old);
        }
        assertEquals(CaseVerifyCommand.EXIT_DAMAGED, code);
        String text = out.toString(StandardCharsets.UTF_8);
        assertTrue(text.contains("DAMAGED: case C-1, series bench-1, " + series.files().get(5).fileName()), text);
    }
}
