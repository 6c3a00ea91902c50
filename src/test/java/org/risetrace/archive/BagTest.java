package org.risetrace.archive;

import gov.loc.repository.bagit.domain.Bag;
import gov.loc.repository.bagit.reader.BagReader;
import gov.loc.repository.bagit.verify.BagVerifier;
import org.apache.commons.compress.archivers.zip.ZipArchiveEntry;
import org.apache.commons.compress.archivers.zip.ZipArchiveOutputStream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import java.util.zip.ZipFile;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Bags: exported bags are valid by an independent RFC 8493 checker and by the Library of Congress BagIt library;
 * a bag imports into a fresh archive whole; hostile bags are refused whole and write nothing outside a temporary
 * folder.
 */
class BagTest {
    @TempDir
    static Path shared;
    @TempDir
    Path tmp;

    static Path source;
    static Path folderBag;
    static Path zipBag;
    static Archive.CaseDetail exported;

    @BeforeAll
    static void export() {
        source = shared.resolve("archive");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(source), "tess")) {
            a.createCase(new Archive.NewCase("C-7", "ticket 7", "sensor board DB-12 rev B", "SN 7", "no boot", "tess"));
            a.addSeries("C-7", Fixtures.series(shared.resolve("bench 1"), 11), "bench-1", null);
            CaseAnalysis.analyse(a, "C-7", "bench-1", AnalysisOptions.defaults(), CaseAnalysis.Mode.AUTO, 2, Analyzer.Progress.NONE);
            folderBag = shared.resolve("bags/C-7");
            zipBag = shared.resolve("bags/C-7.zip");
            BagExport.export(a, "C-7", folderBag, "risetrace test");
            BagExport.export(a, "C-7", zipBag, "risetrace test");
            exported = a.show("C-7");
        }
    }

    @Test
    void exportedBagsAreValidByAnIndependentRfc8493CheckerAndByTheLibraryOfCongressLibrary() throws Exception {
        assertEquals(List.of(), Rfc8493Checker.check(folderBag));
        Path unzipped = tmp.resolve("unzipped");
        unzipPlain(zipBag, unzipped);
        assertEquals(List.of("C-7"), names(unzipped), "the zip holds one bag folder named as the zip");
        assertEquals(List.of(), Rfc8493Checker.check(unzipped.resolve("C-7")));
        for (Path bag : List.of(folderBag, unzipped.resolve("C-7"))) {
            Bag b = new BagReader().read(bag);
            try (BagVerifier v = new BagVerifier()) {
                v.isValid(b, false); // throws on any violation
            }
            assertEquals("1.0", b.getVersion().toString());
            assertEquals(List.of("C-7"), b.getMetadata().get("Case-Number"));
            assertEquals(List.of("sensor board DB-12 rev B"), b.getMetadata().get("Device"));
        }
        // the checkers can fail: one flipped byte in a copy
        Path copy = tmp.resolve("copy");
        Fixtures.copyTree(folderBag, copy);
        Fixtures.flipByte(copy.resolve("data/series/bench-1/f0004.png"), 40);
        assertFalse(Rfc8493Checker.check(copy).isEmpty());
        try (BagVerifier v = new BagVerifier()) {
            assertThrows(Exception.class, () -> v.isValid(new BagReader().read(copy), false));
        }
    }

    @Test
    void aBagImportsIntoAFreshArchiveWholeAndVerifiesClean() {
        for (Path bag : List.of(folderBag, zipBag)) {
            Path fresh = tmp.resolve("fresh-" + bag.getFileName());
            try (Archive b = Archive.open(ArchiveSettings.sqlite(fresh), "uma")) {
                BagImport.Result r = BagImport.importBag(b, bag, BagImport.Limits.defaults());
                assertEquals("C-7", r.caseNumber());
                Archive.CaseDetail d = b.show("C-7");
                assertEquals(exported.record(), d.record(), "the case fields as they were");
                assertEquals(exported.series().get(0).files(), d.series().get(0).files(), "the same originals");
                assertEquals(exported.analyses().get(0).headline(), d.analyses().get(0).headline());
                assertEquals(exported.analyses().get(0).outputs().stream().map(Archive.OutputRecord::sha256).toList(),
                        d.analyses().get(0).outputs().stream().map(Archive.OutputRecord::sha256).toList());
                assertTrue(d.custody().stream().anyMatch(e -> e.action().equals("import-case")));
                Verifier.Report v = Verifier.verify(b, null);
                assertTrue(v.clean(), v.problems().toString());
                ArchiveException again = assertThrows(ArchiveException.class,
                        () -> BagImport.importBag(b, bag, BagImport.Limits.defaults()));
                assertTrue(again.getMessage().contains("already"), again.getMessage());
            }
        }
    }

    // ------------------------------------------------------------------ hostile bags

    /** Imports {@code bag} into a fresh archive and asserts it is refused whole, naming {@code words}. */
    private void assertRefused(Path bag, BagImport.Limits limits, String... words) throws IOException {
        Path fresh = Files.createTempDirectory(tmp, "archive-");
        Path sentinel = tmp.resolve("outside");
        try (Archive b = Archive.open(ArchiveSettings.sqlite(fresh), "uma")) {
            ArchiveException e = assertThrows(ArchiveException.class, () -> BagImport.importBag(b, bag, limits));
            for (String w : words) assertTrue(e.getMessage().contains(w), "'" + w + "' in: " + e.getMessage());
            assertTrue(b.listCases(Archive.CaseQuery.all()).isEmpty(), "no case recorded");
            assertEquals(0, b.store().all().size(), "nothing stored");
            assertEquals(0, b.custody(null).size(), "nothing logged");
            try (Stream<Path> s = Files.list(fresh.resolve(ContentStore.TMP))) {
                assertEquals(0, s.count(), "the temporary folder is removed");
            }
        }
        assertFalse(Files.exists(sentinel), "nothing written outside the archive");
        assertFalse(Files.exists(Path.of("/tmp/risetrace-evil")), "nothing written at an absolute path");
    }

    private Path folderCopy() throws IOException {
        Path copy = Files.createTempDirectory(tmp, "bag-").resolve("C-7");
        Fixtures.copyTree(folderBag, copy);
        return copy;
    }

    private static void appendLine(Path manifest, String line) throws IOException {
        Files.writeString(manifest, Files.readString(manifest) + line + "\n");
    }

    @Test
    void manifestPathsThatClimbOutOrAreAbsoluteAreRefused() throws IOException {
        Path bag = folderCopy();
        appendLine(bag.resolve("manifest-sha256.txt"), "0".repeat(64) + "  data/../../outside");
        assertRefused(bag, BagImport.Limits.defaults(), "climbs out");
        bag = folderCopy();
        appendLine(bag.resolve("manifest-sha256.txt"), "0".repeat(64) + "  /tmp/risetrace-evil");
        assertRefused(bag, BagImport.Limits.defaults(), "absolute");
    }

    @Test
    void aSymbolicLinkInAFolderBagIsRefused() throws IOException {
        Path bag = folderCopy();
        Path frame = bag.resolve("data/series/bench-1/f0002.png");
        Path elsewhere = tmp.resolve("elsewhere.png");
        Files.move(frame, elsewhere);
        Files.createSymbolicLink(frame, elsewhere); // same bytes: only the link gives it away
        assertRefused(bag, BagImport.Limits.defaults(), "symbolic link", "f0002.png");
    }

    @Test
    void zipEntriesThatClimbOutAreAbsoluteOrLinksAreRefused() throws IOException {
        List<Entry> good = entriesOf(folderBag, "C-7");
        List<Entry> climb = new ArrayList<>(good);
        climb.add(new Entry("C-7/../../outside", "x".getBytes(StandardCharsets.UTF_8), 0100644));
        assertRefused(zip(climb), BagImport.Limits.defaults(), "climbs out");
        List<Entry> absolute = new ArrayList<>(good);
        absolute.add(new Entry("/tmp/risetrace-evil", "x".getBytes(StandardCharsets.UTF_8), 0100644));
        assertRefused(zip(absolute), BagImport.Limits.defaults(), "absolute");
        List<Entry> link = new ArrayList<>(good);
        link.add(new Entry("C-7/data/evil", "/etc/passwd".getBytes(StandardCharsets.UTF_8), 0120777));
        assertRefused(zip(link), BagImport.Limits.defaults(), "symbolic link");
    }

    @Test
    void aZipBombBeyondTheLimitsIsRefusedWhileUnpacking() throws IOException {
        List<Entry> bomb = new ArrayList<>(entriesOf(folderBag, "C-7"));
        bomb.add(new Entry("C-7/data/zeros.bin", new byte[48 << 20], 0100644)); // 48 MB of zeros, about 48 kB zipped
        Path zip = zip(bomb);
        assertTrue(Files.size(zip) < 16 << 20, "the bomb is small when zipped: " + Files.size(zip));
        assertRefused(zip, new BagImport.Limits(10_000, 32L << 20), "more than", "bytes");
        List<Entry> many = new ArrayList<>(entriesOf(folderBag, "C-7"));
        for (int i = 0; i < 30; i++) many.add(new Entry("C-7/data/n" + i, new byte[0], 0100644));
        assertRefused(zip(many), new BagImport.Limits(40, 1L << 30), "entries", "limit");
    }

    @Test
    void duplicateEntriesAreRefused() throws IOException {
        List<Entry> dup = new ArrayList<>(entriesOf(folderBag, "C-7"));
        Entry first = dup.stream().filter(e -> e.name().endsWith("f0003.png")).findFirst().orElseThrow();
        dup.add(new Entry(first.name(), "other bytes".getBytes(StandardCharsets.UTF_8), 0100644));
        assertRefused(zip(dup), BagImport.Limits.defaults(), "twice");
        Path bag = folderCopy();
        String line = Files.readAllLines(bag.resolve("manifest-sha256.txt")).get(3);
        appendLine(bag.resolve("manifest-sha256.txt"), line);
        assertRefused(bag, BagImport.Limits.defaults(), "twice");
    }

    @Test
    void aManifestThatLiesIsRefused() throws IOException {
        // a checksum that does not hold
        Path bag = folderCopy();
        Fixtures.flipByte(bag.resolve("data/series/bench-1/f0005.png"), 99);
        assertRefused(bag, BagImport.Limits.defaults(), "f0005.png", "checksum");
        // a payload file the manifest does not list
        bag = folderCopy();
        Files.writeString(bag.resolve("data/series/bench-1/planted.png"), "planted");
        assertRefused(bag, BagImport.Limits.defaults(), "planted.png", "not in");
        // a listed file that is missing
        bag = folderCopy();
        Files.delete(bag.resolve("data/series/bench-1/f0006.png"));
        assertRefused(bag, BagImport.Limits.defaults(), "f0006.png", "not in the bag");
    }

    // ------------------------------------------------------------------ zip helpers

    record Entry(String name, byte[] bytes, int unixMode) { }

    private static List<Entry> entriesOf(Path bag, String top) throws IOException {
        List<Entry> out = new ArrayList<>();
        for (Path p : Fixtures.regularFiles(bag))
            out.add(new Entry(top + "/" + bag.relativize(p).toString().replace('\\', '/'), Files.readAllBytes(p), 0100644));
        return out;
    }

    /** A zip written with Apache Commons Compress, which writes what it is given: duplicates, '..', links. */
    private Path zip(List<Entry> entries) throws IOException {
        Path z = Files.createTempFile(tmp, "bag-", ".zip");
        try (ZipArchiveOutputStream out = new ZipArchiveOutputStream(z.toFile())) {
            for (Entry e : entries) {
                ZipArchiveEntry ze = new ZipArchiveEntry(e.name());
                ze.setUnixMode(e.unixMode());
                out.putArchiveEntry(ze);
                out.write(e.bytes());
                out.closeArchiveEntry();
            }
        }
        return z;
    }

    private static void unzipPlain(Path zip, Path into) throws IOException {
        try (ZipFile z = new ZipFile(zip.toFile())) {
            for (var e : java.util.Collections.list(z.entries())) {
                Path t = into.resolve(e.getName()).normalize();
                assertTrue(t.startsWith(into));
                if (e.isDirectory()) continue;
                Files.createDirectories(t.getParent());
                try (InputStream in = z.getInputStream(e)) {
                    Files.copy(in, t);
                }
            }
        }
    }

    private static List<String> names(Path dir) throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }
}
