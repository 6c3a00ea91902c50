package org.risetrace.archive;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The case store: originals stored byte for byte, once, read-only; records and custody entries; queries. */
class ArchiveStoreTest {
    @TempDir
    Path tmp;

    @Test
    void originalsAreStoredByteForByteOnceAndReadOnlyUnderTheirSha256() throws Exception {
        Path src = Fixtures.series(tmp.resolve("s1"), 11);
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            Archive.Added first = a.addSeries("C-1", src, null, null);
            assertFalse(first.alreadyPresent());
            // 12 frames, board.json, series.json (the simulator writes both)
            assertEquals(14, first.series().fileCount());
            assertEquals(12, first.series().files().stream().filter(f -> f.role().equals("frame")).count());
            for (Archive.StoredFile f : first.series().files()) {
                Path original = src.resolve(f.fileName());
                Path stored = a.store().path(f.sha256());
                // reference: GNU coreutils sha256sum, outside the JVM (FIPS 180-4)
                assertEquals(Fixtures.sha256sum(original), f.sha256(), f.fileName());
                assertEquals(-1L, Files.mismatch(original, stored), f.fileName() + " stored byte for byte");
                assertEquals("r--r--r--", PosixFilePermissions.toString(Files.getPosixFilePermissions(stored)));
                assertEquals(Files.size(original), f.sizeBytes());
            }
            int storedFiles = a.store().all().size();
            // the same folder again: nothing new, nothing duplicated
            assertTrue(a.addSeries("C-1", src, null, null).alreadyPresent());
            // the same bytes under another name and in another case: a new record, no new stored file
            a.createCase(Fixtures.newCase("C-2"));
            a.addSeries("C-2", src, "again", null);
            assertEquals(storedFiles, a.store().all().size());
            assertEquals(2, a.show("C-2").custody().size(), "create and add-series logged");
            assertTrue(Verifier.verify(a, null).clean());
        }
    }

    @Test
    void otherFilesUnderATakenSeriesNameAreRefusedAndChangeNothing() throws Exception {
        Path s1 = Fixtures.series(tmp.resolve("s1"), 11), s2 = Fixtures.series(tmp.resolve("s2"), 12);
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            a.addSeries("C-1", s1, "bench", null);
            int storedFiles = a.store().all().size();
            ArchiveException e = assertThrows(ArchiveException.class, () -> a.addSeries("C-1", s2, "bench", null));
            assertTrue(e.getMessage().contains("other files"), e.getMessage());
            assertEquals(1, a.show("C-1").series().size());
            // the refusal is decided before storing: none of s2's files is left behind, named by no record
            assertEquals(storedFiles, a.store().all().size());
            assertEquals(List.of(), Verifier.verify(a, null).notes());
            assertTrue(a.addSeries("C-1", s1, "bench", null).alreadyPresent(), "the same files again change nothing");
            assertThrows(ArchiveException.class, () -> a.addSeries("C-9", s1, null, null), "unknown case");
            assertThrows(ArchiveException.class, () -> a.addSeries("C-1", s1, "../up", null), "unsafe name");
        }
    }

    @Test
    void aBoardTheAnalysisCannotReadIsRefusedNamingTheFileAndNothingIsStored() throws Exception {
        Path src = Fixtures.series(tmp.resolve("ba"), 11);
        Path malformed = Files.writeString(tmp.resolve("malformed.json"), "{\"size_mm\": [40, 30],");
        Path unknownMaterial = editedBoard(src, "unknown-material.json",
                b -> ((ObjectNode) b.get("parts").get(0)).put("material", "unobtainium"));
        Path otherFrame = editedBoard(src, "other-frame.json", b -> ((ObjectNode) b.get("outline")).put("frame", "f9999.png"));
        Path inFolder = Fixtures.series(tmp.resolve("bb"), 11);
        Files.writeString(inFolder.resolve("board.json"), "{\"size_mm\": [40, 30],");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            // each as analysis would meet it (BoardFile.read with the materials table, the outline's frame): the
            // message names the user's file and the problem, never a copy inside the archive
            for (Object[] bad : new Object[][]{{malformed, "malformed JSON"}, {unknownMaterial, "unknown material 'unobtainium'"},
                    {otherFrame, "frame 'f9999.png', which is not in the series"}}) {
                Path board = (Path) bad[0];
                ArchiveException e = assertThrows(ArchiveException.class, () -> a.addSeries("C-1", src, "ba", board));
                assertTrue(e.getMessage().startsWith(board + ": the board file cannot be analysed: "), e.getMessage());
                assertTrue(e.getMessage().contains((String) bad[1]), e.getMessage());
                assertTrue(e.getMessage().contains("nothing was stored"), e.getMessage());
                assertFalse(e.getMessage().contains(tmp.resolve("archive").toString()), e.getMessage());
            }
            // the folder's own board.json is checked alike
            ArchiveException e = assertThrows(ArchiveException.class, () -> a.addSeries("C-1", inFolder, null, null));
            assertTrue(e.getMessage().startsWith(inFolder.resolve("board.json") + ": the board file cannot be analysed: "
                    + "malformed JSON"), e.getMessage());
            // nothing stored, nothing recorded: verify is clean without a note of stored files no record names
            assertEquals(List.of(), a.store().all());
            assertTrue(a.show("C-1").series().isEmpty());
            Verifier.Report v = Verifier.verify(a, null);
            assertTrue(v.clean(), v.problems().toString());
            assertEquals(List.of(), v.notes());
            // so the series can still go in under the same name with a board that can be analysed
            Archive.Added added = a.addSeries("C-1", src, "ba", null);
            assertFalse(added.alreadyPresent());
            assertEquals(14, added.series().fileCount());
            v = Verifier.verify(a, null);
            assertTrue(v.clean(), v.problems().toString());
            assertEquals(List.of(), v.notes());
        }
    }

    @Test
    void anAnalysisRefusalNamesTheArchivedFileNotItsTemporaryCopy() throws Exception {
        Path src = Fixtures.series(tmp.resolve("s1"), 11);
        Path malformed = Files.writeString(tmp.resolve("malformed.json"), "{\"size_mm\": [40, 30],");
        Path otherFrame = editedBoard(src, "other-frame.json", b -> ((ObjectNode) b.get("outline")).put("frame", "f9999.png"));
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            Archive.SeriesRecord good = a.addSeries("C-1", src, null, null).series();
            // series recorded as an archive from before add-series checked board files holds them (written to the
            // index directly: add-series itself now refuses these boards)
            for (Object[] bad : new Object[][]{{malformed, "ba", "board.json: malformed JSON"},
                    {otherFrame, "bf", "board.json: the outline is marked on frame 'f9999.png', which is not in the series"}}) {
                ContentStore.Stored st = a.store().put((Path) bad[0], null);
                List<Archive.StoredFile> files = good.files().stream().map(f -> !f.role().equals("board") ? f
                        : new Archive.StoredFile(f.index(), "board", "board.json", st.sha256(), st.sizeBytes(), f.modifiedAt()))
                        .toList();
                String name = (String) bad[1];
                a.index().write(c -> {
                    Archive.insertSeries(c, new Archive.SeriesRecord("C-1", name, Index.now(), "tess", src.toString(),
                            null, null, files.size(), files));
                    return null;
                });
                ArchiveException e = assertThrows(ArchiveException.class, () -> CaseAnalysis.analyse(a, "C-1", name,
                        AnalysisOptions.defaults(), CaseAnalysis.Mode.AUTO, 2, Analyzer.Progress.NONE));
                // named as the shop knows it: case, series, file; the temporary copy is gone by the time it is read
                assertTrue(e.getMessage().startsWith("case C-1, series " + name + ", " + bad[2]), e.getMessage());
                assertFalse(e.getMessage().contains(ContentStore.TMP + "/work-"), e.getMessage());
                assertFalse(e.getMessage().contains(tmp.toString()), e.getMessage());
                assertTrue(e.getMessage().contains("add the series again under another name with --name"), e.getMessage());
            }
        }
    }

    /** The fixture's board.json with one change, written to {@code name} beside the series. */
    private Path editedBoard(Path series, String name, java.util.function.Consumer<ObjectNode> change) throws Exception {
        ObjectMapper m = new ObjectMapper();
        ObjectNode b = (ObjectNode) m.readTree(series.resolve("board.json").toFile());
        change.accept(b);
        return Files.writeString(tmp.resolve(name), m.writeValueAsString(b));
    }

    @Test
    void aLinkedFrameIsRefused() throws Exception {
        Path s1 = Fixtures.series(tmp.resolve("s1"), 11);
        Path outside = tmp.resolve("outside.png");
        Files.move(s1.resolve("f0003.png"), outside);
        Files.createSymbolicLink(s1.resolve("f0003.png"), outside);
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            ArchiveException e = assertThrows(ArchiveException.class, () -> a.addSeries("C-1", s1, null, null));
            assertTrue(e.getMessage().contains("f0003.png"), e.getMessage());
            assertTrue(a.show("C-1").series().isEmpty());
        }
    }

    @Test
    void theCustodyLogAndTheFileRecordsRefuseUpdatesAndDeletes() throws Exception {
        Path archive = tmp.resolve("archive");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(archive), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            a.addSeries("C-1", Fixtures.series(tmp.resolve("s1"), 11), null, null);
        }
        try (Connection c = Fixtures.sqlite(archive); Statement st = c.createStatement()) {
            for (String sql : List.of("UPDATE custody SET who = 'mallory'", "DELETE FROM custody",
                    "UPDATE frames SET sha256 = 'x'", "DELETE FROM frames"))
                assertTrue(assertThrows(SQLException.class, () -> st.execute(sql), sql).getMessage()
                        .matches("(?s).*(append-only|never changed).*"), sql);
        }
    }

    @Test
    void listingFiltersByStatusDateAndTextIncludingTheVerdictPart() throws Exception {
        Path src = Fixtures.series(tmp.resolve("s1"), 11);
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            Archive.CaseRecord auto = a.createCase(new Archive.NewCase(null, "walk-in", "bench supply", null, "hums", null));
            assertEquals(LocalDate.now(ZoneOffset.UTC).getYear() + "-0001", auto.caseNumber(), "the year's first number");
            assertEquals("tess", auto.technician(), "the technician defaults to who works");
            a.createCase(new Archive.NewCase(null, "ticket 100%", "charger DB-7", null, "dead", null));
            a.createCase(Fixtures.newCase("C-1"));
            a.addSeries("C-1", src, null, null);
            Archive.AnalysisRecord r = CaseAnalysis.analyse(a, "C-1", "s1", AnalysisOptions.defaults(),
                    CaseAnalysis.Mode.AUTO, 2, Analyzer.Progress.NONE);
            a.setStatus(auto.caseNumber(), "closed");
            LocalDate today = LocalDate.now(ZoneOffset.UTC);
            assertEquals(3, a.listCases(Archive.CaseQuery.all()).size());
            assertEquals(Set.of(auto.caseNumber()), numbers(a.listCases(new Archive.CaseQuery("closed", null, null, null, 10))));
            assertEquals(2, a.listCases(new Archive.CaseQuery("open", null, null, null, 10)).size());
            assertEquals(3, a.listCases(new Archive.CaseQuery(null, today, today, null, 10)).size());
            assertEquals(0, a.listCases(new Archive.CaseQuery(null, today.plusDays(1), null, null, 10)).size());
            assertEquals(0, a.listCases(new Archive.CaseQuery(null, null, today.minusDays(1), null, 10)).size());
            assertEquals(Set.of("C-1"), numbers(a.listCases(new Archive.CaseQuery(null, null, null, "db-12", 10))));
            // % and _ are the shop's characters, not wildcards
            assertEquals(1, a.listCases(new Archive.CaseQuery(null, null, null, "100%", 10)).size());
            assertEquals(0, a.listCases(new Archive.CaseQuery(null, null, null, "_", 10)).size());
            assertEquals(r.verdictRef() == null ? 0 : 1,
                    a.listCases(new Archive.CaseQuery(null, null, null, String.valueOf(r.verdictRef()), 10)).stream()
                            .filter(x -> x.caseNumber().equals("C-1")).count());
        }
    }

    @Test
    void anArchivedAnalysisEqualsTheAnalysisOfTheSourceFolderAndKeepsItsOutputs() throws Exception {
        Path src = Fixtures.series(tmp.resolve("s1"), 11);
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            a.addSeries("C-1", src, null, null);
            Archive.AnalysisRecord r = CaseAnalysis.analyse(a, "C-1", "s1", AnalysisOptions.defaults(),
                    CaseAnalysis.Mode.STEADY, 2, Analyzer.Progress.NONE);
            // reference: the analysis entry point run directly on the source folder
            Series s = Series.open(src);
            Analysis direct = SeriesAnalyzer.analyze(s, BoardFile.read(src.resolve("board.json"), Materials.load().names()),
                    src.resolve("board.json"), "direct", AnalysisOptions.defaults(), SeriesAnalyzer.emissivity(s.profile()), 2,
                    Analyzer.Progress.NONE);
            assertEquals(direct.result().verdict().status().word(), r.verdictStatus());
            assertEquals(direct.result().verdict().ref(), r.verdictRef());
            assertEquals(Set.of("analysis.json", "parts.csv", "report.html"),
                    new HashSet<>(r.outputs().stream().map(Archive.OutputRecord::name).toList()));
            for (Archive.OutputRecord o : r.outputs()) assertTrue(a.store().contains(o.sha256()), o.name());
            assertTrue(Files.readString(a.store().path(r.outputs().stream().filter(o -> o.name().equals("report.html"))
                    .findFirst().orElseThrow().sha256())).contains("Disconnect batteries and mains"));
            assertTrue(Verifier.verify(a, "C-1").clean());
        }
    }

    @Test
    void aPeriodicSeriesIsAnalysedByLockInAsAnalyzeWouldAndItsOutputsKept() {
        // the simulator records the square wave's period in series.json, which makes 'auto' choose lock-in
        Path src = tmp.resolve("pulsed");
        org.risetrace.sim.Simulator.run(org.risetrace.sim.Scenarios.small(2.0).withFrames(16, 0.5, 2.0).withSeed(5L)
                .withSquareWave(2.0, 0.5), src);
        assertTrue(org.risetrace.analysis.LockInAnalyzer.periodic(Series.open(src)), "the reference says periodic");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(tmp.resolve("archive")), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            a.addSeries("C-1", src, null, null);
            Archive.AnalysisRecord r = CaseAnalysis.analyse(a, "C-1", "pulsed", AnalysisOptions.defaults(),
                    CaseAnalysis.Mode.AUTO, 2, Analyzer.Progress.NONE);
            assertEquals("lock-in", r.mode());
            assertTrue(r.outputs().stream().anyMatch(o -> o.name().equals("report.html")));
            assertTrue(a.show("C-1").series().get(0).injection().contains("period_s"), "the injection record is kept");
            assertTrue(Verifier.verify(a, null).clean());
        }
    }

    @Test
    void theSchemaIsVersionedAndANewerArchiveIsRefused() throws Exception {
        Path archive = tmp.resolve("archive");
        Archive.open(ArchiveSettings.sqlite(archive), "tess").close();
        Archive.open(ArchiveSettings.sqlite(archive), "tess").close(); // opening again applies nothing twice
        try (Connection c = Fixtures.sqlite(archive); Statement st = c.createStatement();
             var rs = st.executeQuery("SELECT COUNT(*), MAX(version) FROM schema_version")) {
            rs.next();
            assertEquals(Schema.MIGRATIONS.size(), rs.getInt(1));
            assertEquals(Schema.latest(), rs.getInt(2));
        }
        Fixtures.sql(archive, "INSERT INTO schema_version VALUES (99, 'from the future', '2030-01-01')");
        ArchiveException e = assertThrows(ArchiveException.class, () -> Archive.open(ArchiveSettings.sqlite(archive), "tess"));
        assertTrue(e.getMessage().contains("newer"), e.getMessage());
    }

    @Test
    void aFolderIsNeverUsedWithAnotherIndex() throws Exception {
        Path one = tmp.resolve("one"), two = tmp.resolve("two");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(one), "tess")) {
            a.createCase(Fixtures.newCase("C-1"));
            a.addSeries("C-1", Fixtures.series(tmp.resolve("s1"), 11), null, null);
        }
        Archive.open(ArchiveSettings.sqlite(two), "tess").close();
        Files.copy(two.resolve(Index.SQLITE_FILE), one.resolve(Index.SQLITE_FILE), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        Files.deleteIfExists(one.resolve(Index.SQLITE_FILE + "-wal"));
        Files.deleteIfExists(one.resolve(Index.SQLITE_FILE + "-shm"));
        ArchiveException e = assertThrows(ArchiveException.class, () -> Archive.open(ArchiveSettings.sqlite(one), "tess"));
        assertTrue(e.getMessage().contains("another index"), e.getMessage());
    }

    @Test
    void onlyOpenCreatesAnArchiveAndNeverInAFolderOfOtherFiles() throws Exception {
        Path typo = tmp.resolve("typo");
        ArchiveException e = assertThrows(ArchiveException.class, () -> Archive.openExisting(ArchiveSettings.sqlite(typo), "tess"));
        // a mistyped path is said, not taken for an empty archive
        assertTrue(e.getMessage().startsWith("no archive at " + typo), e.getMessage());
        // and nothing is created for it
        assertFalse(Files.exists(typo));
        Path mine = Files.createDirectories(tmp.resolve("mine"));
        Files.writeString(mine.resolve("keep.txt"), "the user's own");
        e = assertThrows(ArchiveException.class, () -> Archive.openExisting(ArchiveSettings.sqlite(mine), "tess"));
        assertTrue(e.getMessage().startsWith("no archive at " + mine), e.getMessage());
        e = assertThrows(ArchiveException.class, () -> Archive.open(ArchiveSettings.sqlite(mine), "tess"));
        // the create-if-missing entry point (case create, import, the workbench) never fills a user's folder
        assertTrue(e.getMessage().contains("holds other files and no archive"), e.getMessage());
        try (var list = Files.list(mine)) {
            // the user's folder as it was
            assertEquals(List.of(mine.resolve("keep.txt")), list.toList());
        }
        e = assertThrows(ArchiveException.class, () -> Archive.open(ArchiveSettings.sqlite(Path.of("")), "tess"));
        // an empty path would have put the index into the working folder
        assertTrue(e.getMessage().contains("empty path"), e.getMessage());
        Archive.open(ArchiveSettings.sqlite(typo), "tess").close();
        // once created, it is an archive and opens as one
        assertTrue(Archive.exists(typo));
        Archive.openExisting(ArchiveSettings.sqlite(typo), "tess").close();
        // a first opening killed before its marker left only the archive's own entries: it may be created there
        Path unfinished = Files.createDirectories(tmp.resolve("unfinished").resolve(ContentStore.FILES));
        Files.createDirectories(unfinished.resolveSibling(ContentStore.TMP));
        Archive.open(ArchiveSettings.sqlite(unfinished.getParent()), "tess").close();
        assertTrue(Archive.exists(unfinished.getParent()));
    }

    private static Set<String> numbers(List<Archive.CaseRecord> cases) {
        Set<String> s = new HashSet<>();
        for (Archive.CaseRecord r : cases) s.add(r.caseNumber());
        return s;
    }
}
