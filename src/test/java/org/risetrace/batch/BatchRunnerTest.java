package org.risetrace.batch;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.Verdict;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.cli.Main;
import org.risetrace.io.ReadContext;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.Simulator;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code risetrace batch} over a tree of small simulated series (160 x 128 px, 12-14 frames) and broken ones: a
 * truncated reference frame, a truncated later frame, a missing board file, a folder without frames. References:
 * each series analysed alone through the analyze command's core call ({@link SeriesAnalyzer#analyze}), the
 * unsharded run for merged shards, RFC 4180 as Commons CSV parses it for summary.csv.
 */
class BatchRunnerTest {
    @TempDir
    static Path tmp;
    static Path root;
    static Outcome baseline;

    record Outcome(BatchRunner.Outcome outcome, Path out) {
    }

    static final List<String> GOOD = List.of("boardA/inj1", "boardA/inj2", "boardB/run1", "boardB/run2-late-frame-cut");

    @BeforeAll
    static void makeTree() throws IOException {
        root = tmp.resolve("captures");
        // two series of one board sharing the parent's board.json (inherited), one heating, one barely
        sim(root.resolve("boardA/inj1"), 1.5, 14, 7L);
        sim(root.resolve("boardA/inj2"), 0.4, 12, 7L);
        Files.move(root.resolve("boardA/inj1/board.json"), root.resolve("boardA/board.json"));
        Files.delete(root.resolve("boardA/inj2/board.json"));
        // a series with its own board file, and one whose 9th frame is cut short (left out with a warning)
        sim(root.resolve("boardB/run1"), 2.0, 12, 11L);
        sim(root.resolve("boardB/run2-late-frame-cut"), 2.0, 12, 11L);
        truncate(root.resolve("boardB/run2-late-frame-cut/f0009.png"));
        // a square-wave injection (period_s in series.json): analysed by the lock-in path, as analyze does
        Simulator.run(Scenarios.small(2.0).withFrames(16, 0.5, 2.0).withSeed(5L).withSquareWave(2.0, 0.5),
                root.resolve("boardC/pulsed"));
        // broken: the reference frame cut short; no board file anywhere up to the root; no frames at all
        sim(root.resolve("broken/truncated"), 1.5, 12, 3L);
        truncate(root.resolve("broken/truncated/f0001.png"));
        Path noBoard = root.resolve("broken/no board, A&B");
        sim(noBoard, 1.5, 12, 3L);
        Files.delete(noBoard.resolve("board.json"));
        Path notImages = Files.createDirectories(root.resolve("broken/not-images"));
        Files.copy(root.resolve("boardB/run1/series.json"), notImages.resolve("series.json"));
        Files.writeString(notImages.resolve("notes.txt"), "bench notes, no frames\n");
        Files.writeString(notImages.resolve("board.json"), "{}");
        baseline = new Outcome(BatchRunner.run(root, tmp.resolve("out-all"), options(), BatchRunner.Listener.NONE),
                tmp.resolve("out-all"));
    }

    static void sim(Path dir, double powerW, int frames, long seed) {
        Simulator.run(Scenarios.small(powerW).withFrames(frames, 0.5, 2.0).withSeed(seed), dir);
        try {
            Files.deleteIfExists(dir.resolve("truth.json"));
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    static void truncate(Path file) throws IOException {
        byte[] b = Files.readAllBytes(file);
        Files.write(file, java.util.Arrays.copyOf(b, b.length / 3));
    }

    static BatchRunner.Options options() {
        return BatchRunner.Options.defaults().withJobs(2);
    }

    static Map<String, SeriesSummary> bySeries(BatchSummary s) {
        Map<String, SeriesSummary> m = new TreeMap<>();
        for (SeriesSummary r : s.series()) m.put(r.series(), r);
        return m;
    }

    @Test
    void summaryVerdictsEqualThoseOfEachSeriesAnalysedAlone() {
        Map<String, SeriesSummary> rows = bySeries(baseline.outcome().summary());
        assertEquals(8, rows.size(), rows.keySet().toString());
        BatchRunner.Options o = options();
        for (String rel : GOOD) {
            SeriesSummary row = rows.get(rel);
            assertNull(row.error(), rel + ": " + row.error());
            Path folder = root.resolve(rel);
            Path board = Files.exists(folder.resolve("board.json")) ? folder.resolve("board.json")
                    : folder.getParent().resolve("board.json");
            Series s = Series.open(folder, null, ReadContext.DEFAULT_MAX_PIXELS);
            // reference: the analyze command's core call on the series alone, same parameters and thread count
            Analysis alone = SeriesAnalyzer.analyze(s, BoardFile.read(board, Materials.load().names()), board,
                    folder.toString(), o.analysis(), SeriesAnalyzer.emissivity(s.profile()), o.threads(),
                    Analyzer.Progress.NONE);
            Verdict v = alone.result().verdict();
            assertEquals(v.status().word(), row.status(), rel);
            assertEquals(v.ref(), row.designator(), rel);
            assertEquals(v.rateKPerS(), row.rateKPerS(), rel);
            assertEquals(v.separationSigma(), row.separationSigma(), rel);
            assertEquals(s.size(), row.frames(), rel);
            assertEquals(s.tSeconds(s.size() - 1) - s.tSeconds(0), row.durationS(), 1e-12, rel);
            assertEquals("steady", row.mode());
            assertTrue(Files.isRegularFile(baseline.out().resolve(rel).resolve("analysis.json")), rel);
            assertTrue(Files.isRegularFile(baseline.out().resolve(rel).resolve("parts.csv")), rel);
            assertTrue(Files.isRegularFile(baseline.out().resolve(row.report())), row.report());
        }
        // the heating series' verdict names the simulated short (Q1 dissipating 90 % of the power; Scenarios.small)
        assertEquals("Q1", rows.get("boardA/inj1").designator());
        assertTrue(rows.get("boardB/run2-late-frame-cut").warnings().stream()
                .anyMatch(w -> w.contains("1 of 12 frames not used") && w.contains("f0009.png")),
                rows.get("boardB/run2-late-frame-cut").warnings().toString());
    }

    @Test
    void aPeriodicSeriesGetsTheLockInVerdictOfTheSeriesAnalysedAlone() {
        SeriesSummary row = bySeries(baseline.outcome().summary()).get("boardC/pulsed");
        assertNull(row.error(), row.error());
        assertEquals("lock-in", row.mode());
        Path folder = root.resolve("boardC/pulsed");
        Series s = Series.open(folder, null, ReadContext.DEFAULT_MAX_PIXELS);
        BatchRunner.Options o = options();
        // reference: the analyze command's lock-in call on the series alone
        Verdict v = org.risetrace.analysis.LockInAnalyzer.analyze(s,
                BoardFile.read(folder.resolve("board.json"), Materials.load().names()), folder.resolve("board.json"),
                folder.toString(), o.analysis(), SeriesAnalyzer.emissivity(s.profile()), o.threads(),
                Analyzer.Progress.NONE).result().verdict();
        assertEquals(v.status().word(), row.status());
        assertEquals(v.ref(), row.designator());
        assertEquals(v.rateKPerS(), row.rateKPerS());
        assertEquals(v.separationSigma(), row.separationSigma());
    }

    @Test
    void brokenSeriesCarryTheirOneLineErrorAndExitCodeIsOneThroughMain() throws IOException {
        Path out = tmp.resolve("out-main");
        Result r = runMain("batch", root.toString(), "--out", out.toString(), "--jobs", "2", "--quiet");
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
        assertFalse(r.err().contains("\tat "), "no stack trace: " + r.err());
        Map<String, SeriesSummary> rows = bySeries(BatchSummary.read(out.resolve("summary.json")));
        SeriesSummary truncated = rows.get("broken/truncated");
        assertEquals("failed", truncated.status());
        assertTrue(truncated.error().contains("f0001.png"), truncated.error());
        assertTrue(rows.get("broken/no board, A&B").error().contains("board file not found"),
                rows.get("broken/no board, A&B").error());
        assertTrue(rows.get("broken/not-images").error().contains("no frame files"), rows.get("broken/not-images").error());
        for (SeriesSummary row : rows.values()) {
            if (row.error() != null) assertFalse(row.error().contains("\n"), row.error());
            if (row.error() != null) assertFalse(row.error().contains(tmp.toString()), "paths relative to the root: " + row.error());
        }
        assertEquals(3, rows.values().stream().filter(SeriesSummary::failed).count());
        // the quiet log names each failed series on one line, and the totals go to stdout
        assertEquals(3, r.err().lines().filter(l -> l.contains("FAILED")).count(), r.err());
        assertTrue(r.out().contains("8 series: 8 analysed, 0 unchanged and skipped, 3 failed"), r.out());
        String index = Files.readString(out.resolve("index.html"));
        assertTrue(index.contains("no board, A&amp;B"), "HTML-escaped");
        assertFalse(index.contains("A&B"), "no raw ampersand");
        assertTrue(index.contains("href=\"boardA/inj1/report.html\""), "links every report");
        assertFalse(index.contains("http://") || index.contains("https://") || index.contains("src=\""), "no external address");
        assertTrue(index.contains("<script>"), "sorting script inline");
    }

    @Test
    void aSecondRunSkipsEverythingAndForceRedoesIt() throws IOException {
        Path out = tmp.resolve("out-rerun");
        BatchRunner.Outcome first = BatchRunner.run(root, out, options(), BatchRunner.Listener.NONE);
        assertEquals(8, first.analysed());
        byte[] json = Files.readAllBytes(out.resolve("boardA/inj1/analysis.json"));
        BatchRunner.Outcome second = BatchRunner.run(root, out, options(), BatchRunner.Listener.NONE);
        assertEquals(0, second.analysed());
        assertEquals(8, second.skipped());
        assertEquals(first.summary(), second.summary());
        assertEquals(new String(json, StandardCharsets.UTF_8), Files.readString(out.resolve("boardA/inj1/analysis.json")),
                "kept, not rewritten");
        // a changed input redoes only its series (series.json of one series gets a note), and so does a manifest
        // that is empty or cut short
        Path sidecar = root.resolve("boardB/run1/series.json");
        String before = Files.readString(sidecar);
        Files.writeString(out.resolve("boardA/inj1").resolve(Manifest.FILE_NAME), "{}");
        Files.writeString(out.resolve("boardA/inj2").resolve(Manifest.FILE_NAME), "{\"schema\" : \"risetrace-batch-man");
        try {
            Files.writeString(sidecar, before.replaceFirst("\\{", "{\n  \"notes\" : \"re-run\","));
            BatchRunner.Outcome third = BatchRunner.run(root, out, options(), BatchRunner.Listener.NONE);
            assertEquals(3, third.analysed());
            assertEquals(5, third.skipped());
        } finally {
            Files.writeString(sidecar, before);
        }
        BatchRunner.Outcome forced = BatchRunner.run(root, out, options().withForce(true), BatchRunner.Listener.NONE);
        assertEquals(8, forced.analysed());
        assertEquals(0, forced.skipped());
        assertEquals(first.summary(), forced.summary());
    }

    @Test
    void twoShardsMergedEqualTheUnshardedSummary() throws IOException {
        Path s1 = tmp.resolve("out-shard1"), s2 = tmp.resolve("out-shard2"), merged = tmp.resolve("out-merged");
        BatchSummary a = BatchRunner.run(root, s1, options().withShard(Shard.parse("1/2")), BatchRunner.Listener.NONE).summary();
        BatchSummary b = BatchRunner.run(root, s2, options().withShard(Shard.parse("2/2")), BatchRunner.Listener.NONE).summary();
        assertEquals(4, a.total());
        assertEquals(4, b.total());
        assertEquals("1/2", a.shard());
        Result r = runMain("batch", "merge", s1.toString(), s2.toString(), "--out", merged.toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), "three series failed: " + r.err());
        // reference: the unsharded run over the same tree
        assertEquals(Files.readString(baseline.out().resolve("summary.json")), Files.readString(merged.resolve("summary.json")));
        assertEquals(Files.readString(baseline.out().resolve("summary.csv")), Files.readString(merged.resolve("summary.csv")));
        assertEquals(Files.readString(baseline.out().resolve("index.html")), Files.readString(merged.resolve("index.html")));
        for (String rel : GOOD) assertTrue(Files.isRegularFile(merged.resolve(rel).resolve("report.html")), rel);
        // a merge's own output folder is accepted again: merging anew gives the same summary
        Result again = runMain("batch", "merge", s1.toString(), s2.toString(), "--out", merged.toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, again.code(), "three series failed: " + again.err());
        assertFalse(again.err().contains("did not write"), again.err());
        assertEquals(Files.readString(baseline.out().resolve("summary.json")), Files.readString(merged.resolve("summary.json")));
        // the same shard twice is refused
        Result twice = runMain("batch", "merge", s1.toString(), s1.toString(), "--out", tmp.resolve("out-twice").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, twice.code());
        assertTrue(twice.err().contains("is also in"), twice.err());
    }

    @Test
    void summaryCsvParsesBackUnderRfc4180() throws IOException {
        String text = Files.readString(baseline.out().resolve("summary.csv"));
        // reference: RFC 4180 as Apache Commons CSV parses it (CRLF records, quoted fields with commas)
        try (CSVParser p = CSVParser.parse(new StringReader(text),
                CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).build())) {
            assertEquals(List.of(SummaryCsv.HEADER), p.getHeaderNames());
            List<CSVRecord> records = p.getRecords();
            List<SeriesSummary> rows = baseline.outcome().summary().series();
            assertEquals(rows.size(), records.size());
            for (int i = 0; i < rows.size(); i++) {
                SeriesSummary row = rows.get(i);
                CSVRecord rec = records.get(i);
                assertEquals(row.series(), rec.get("series"));
                assertEquals(row.status(), rec.get("status"));
                assertEquals(row.error() == null ? "" : row.error(), rec.get("error"));
                assertEquals(row.designator() == null ? "" : row.designator(), rec.get("designator"));
                if (row.rateKPerS() != null) assertEquals(row.rateKPerS(), Double.parseDouble(rec.get("rate_k_per_s")));
                if (row.frames() != null) assertEquals(row.frames(), Integer.parseInt(rec.get("frames")));
            }
        }
        assertTrue(text.contains("\"broken/no board, A&B\""), "a comma in a field is quoted");
        assertTrue(text.contains("\r\n"), "CRLF line ends (RFC 4180 section 2)");
    }

    @Test
    void discoveryInheritsTheNearestBoardAndSkipsOutputAndHiddenFolders() throws IOException {
        Path r = tmp.resolve("discovery");
        Files.createDirectories(r.resolve("a/b/.hidden"));
        Files.createDirectories(r.resolve("out/x"));
        Files.writeString(r.resolve("board.json"), "{}");
        Files.writeString(r.resolve("a/board.json"), "{}");
        for (String d : new String[]{"a/b", "a/b/.hidden", "out/x", "."}) Files.writeString(r.resolve(d).resolve("f1.png"), "x");
        // an earlier batch's output and an analyze output inside the root are not series
        Files.createDirectories(r.resolve("risetrace-out/batch-old/a"));
        Files.writeString(r.resolve("risetrace-out/batch-old/summary.json"), "{}");
        Files.writeString(r.resolve("risetrace-out/batch-old/index.html"), "");
        Files.writeString(r.resolve("risetrace-out/batch-old/a/f1.png"), "x");
        Files.createDirectories(r.resolve("risetrace-out/one"));
        Files.writeString(r.resolve("risetrace-out/one/parts.csv"), "x");
        List<SeriesTask> found = SeriesDiscovery.find(r, r.resolve("out"));
        List<String> rels = new ArrayList<>();
        for (SeriesTask t : found) rels.add(t.relativePath());
        assertEquals(List.of(".", "a/b"), rels);
        assertEquals(r.resolve("a/board.json"), found.get(1).boardFile());
        assertEquals(r.resolve("board.json"), found.get(0).boardFile());
    }

    @Test
    void shardsPartitionTheSortedSeriesDeterministically() {
        List<SeriesTask> tasks = new ArrayList<>();
        for (int i = 0; i < 7; i++) tasks.add(new SeriesTask(Path.of("s" + i), "s" + i, null));
        List<String> all = new ArrayList<>();
        for (int i = 1; i <= 3; i++) for (SeriesTask t : new Shard(i, 3).select(tasks)) all.add(t.relativePath());
        assertEquals(List.of("s0", "s3", "s6", "s1", "s4", "s2", "s5"), all);
    }

    @Test
    void aBadShardOrMissingRootIsAUsageError() {
        assertEquals(Main.EXIT_USAGE, runMain("batch", root.toString(), "--shard", "3/2").code());
        assertEquals(Main.EXIT_USAGE, runMain("batch", root.toString(), "--shard", "two").code());
        assertEquals(Main.EXIT_USAGE, runMain("batch").code());
        assertEquals(Main.EXIT_USAGE, runMain("batch", root.toString(), "--jobs", "0").code());
    }

    @Test
    void aSeriesWithNoFrameMappedCountsAsFailedAndOneLeftOutFrameAsAWarning() {
        org.risetrace.analysis.FrameRecord.Registration failed =
                new org.risetrace.analysis.FrameRecord.Registration("failed", null, "no match", null);
        org.risetrace.analysis.FrameRecord.Registration ok =
                new org.risetrace.analysis.FrameRecord.Registration("ok", 0.1, null, null);
        var a = new org.risetrace.analysis.FrameRecord("f1.png", 0, "x", false, failed);
        var b = new org.risetrace.analysis.FrameRecord("f2.png", 1, "y", false, failed);
        var c = new org.risetrace.analysis.FrameRecord("f3.png", 2, "z", true, ok);
        assertTrue(BatchRunner.noFrameUsed(List.of(a, b)));
        assertFalse(BatchRunner.noFrameUsed(List.of(a, b, c)));
        assertEquals("2 of 3 frames not used (first: f1.png: no match)", BatchRunner.unusedFrames(List.of(a, b, c)));
        assertNull(BatchRunner.unusedFrames(List.of(c)));
    }

    @Test
    void theRootAsOutputFolderIsRefusedInOneLine() {
        Result r = runMain("batch", root.toString(), "--out", root.toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code());
        assertTrue(r.err().strip().lines().count() == 1 && r.err().contains("the output folder is the root"), r.err());
    }

    @Test
    void aBatchRefusesAnOutputFolderHoldingAUsersFilesBeforeAnyWork() throws IOException {
        Path own = tmp.resolve("own3");
        Path mine = Files.createDirectories(own.resolve("boardA/inj1")).resolve("report.html");
        Files.writeString(mine, "<p>my report</p>\n");
        for (String force : new String[]{"--quiet", "--force"}) {
            Result r = runMain("batch", root.toString(), "--out", own.toString(), force);
            // README, "Exit codes": a rejected input exits 1 with one line on stderr
            assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
            // the line names the folder, its first foreign entry and what to do instead
            assertTrue(r.err().strip().lines().count() == 1 && r.err().contains(own.toString())
                    && r.err().contains("did not write (boardA)") && r.err().contains("name a new or empty folder"), r.err());
            // common practice: never overwrite a user's file, with or without --force (as analyze refuses)
            assertEquals("<p>my report</p>\n", Files.readString(mine));
            // refused before any work: not even the marker or an empty series folder was added
            assertEquals(List.of("boardA"), names(own));
            assertEquals(List.of("inj1"), names(own.resolve("boardA")));
        }
    }

    @Test
    void mergeRefusesAnOutputFolderHoldingAUsersFileBeforeAnyWork() throws IOException {
        Path own = Files.createDirectories(tmp.resolve("own2"));
        Path mine = Files.writeString(own.resolve("summary.csv"), "mine\n");
        Result r = runMain("batch", "merge", baseline.out().toString(), "--out", own.toString());
        // README, "Exit codes": a rejected input exits 1 with one line naming the folder and the foreign entry
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
        assertTrue(r.err().strip().lines().count() == 1 && r.err().contains(own.toString())
                && r.err().contains("(summary.csv)"), r.err());
        // common practice: never overwrite a user's file
        assertEquals("mine\n", Files.readString(mine));
        // refused before any work: no series' outputs were copied in
        assertEquals(List.of("summary.csv"), names(own));
    }

    @Test
    void anEarlierBatchOutputIsReusedUnlessAUserAddedAFile() throws IOException {
        Path out = copyTree(baseline.out(), tmp.resolve("out-reused"));
        Path notes = Files.writeString(out.resolve("boardA/notes.txt"), "mine\n");
        Result r = runMain("batch", root.toString(), "--out", out.toString(), "--quiet");
        // a file the batch did not write stays the user's even inside its output: refused, named by its path there
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
        assertTrue(r.err().contains("(boardA/notes.txt)"), r.err());
        assertEquals("mine\n", Files.readString(notes));
        Files.delete(notes);
        // the batch's own folder (it holds the marker) is accepted: a re-run resumes and skips every unchanged series
        assertTrue(Files.isRegularFile(out.resolve(BatchOutput.MARKER)));
        assertEquals(8, BatchRunner.run(root, out, options(), BatchRunner.Listener.NONE).skipped());
        // an output written before the marker existed is recognised by its batch summary.json, and marked
        Files.delete(out.resolve(BatchOutput.MARKER));
        assertEquals(8, BatchRunner.run(root, out, options(), BatchRunner.Listener.NONE).skipped());
        assertTrue(Files.isRegularFile(out.resolve(BatchOutput.MARKER)));
        // what a killed run leaves (a temporary file, a staging folder) belongs to the batch, so resume still works
        Files.writeString(out.resolve("boardA/inj1/.report.html.tmp-" + java.util.UUID.randomUUID()), "half");
        Files.createDirectories(out.resolve("boardA/inj1/" + BatchRunner.STAGING_PREFIX + java.util.UUID.randomUUID()));
        assertEquals(8, BatchRunner.run(root, out, options(), BatchRunner.Listener.NONE).skipped());
    }

    @Test
    void anOutputFolderThatIsOrLiesInASeriesFolderIsRefused() throws IOException {
        Path r2 = tmp.resolve("r2");
        // placeholder frames: the placement is checked before any frame is read
        for (String d : new String[]{"a", "b"}) Files.writeString(Files.createDirectories(r2.resolve(d)).resolve("f0001.png"), "x");
        Files.writeString(r2.resolve("board.json"), "{}");
        for (Path out : List.of(r2.resolve("a"), r2.resolve("a/results"))) {
            Result r = runMain("batch", r2.toString(), "--out", out.toString(), "--quiet");
            // README, "Exit codes": a rejected input exits 1, one line naming the folder and the series, with a hint
            assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
            assertTrue(r.err().strip().lines().count() == 1 && r.err().contains(out.toString())
                    && r.err().contains("the series folder 'a'") && r.err().contains("outside every series folder"), r.err());
            // nothing written among the captured frames (the series was silently dropped before)
            assertEquals(List.of("f0001.png"), names(r2.resolve("a")));
        }
        // the default output location, risetrace-out/batch-NAME, when run from within the root is still accepted
        assertEquals(2, BatchRunner.run(r2, r2.resolve("risetrace-out/batch-r2"), options(), BatchRunner.Listener.NONE)
                .summary().total());
        // likewise when the root is itself a series: its output folder is a subfolder it does not read
        Path r3 = tmp.resolve("r3");
        Files.writeString(Files.createDirectories(r3).resolve("f0001.png"), "x");
        assertEquals(1, BatchRunner.run(r3, r3.resolve("risetrace-out/batch-r3"), options(), BatchRunner.Listener.NONE)
                .summary().total());
        // a series folder that an earlier version wrote a summary into (it looked like a batch output) is a series again
        Files.writeString(r2.resolve("a/summary.json"), "{}");
        Files.writeString(r2.resolve("a/index.html"), "");
        List<String> rels = new ArrayList<>();
        for (SeriesTask t : SeriesDiscovery.find(r2, null)) rels.add(t.relativePath());
        assertEquals(List.of("a", "b"), rels);
    }

    static List<String> names(Path dir) throws IOException {
        try (var s = Files.list(dir)) {
            return s.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    static Path copyTree(Path from, Path to) throws IOException {
        try (var s = Files.walk(from)) {
            for (Path p : s.toList()) {
                Path q = to.resolve(from.relativize(p).toString());
                if (Files.isDirectory(p)) Files.createDirectories(q);
                else Files.copy(p, q);
            }
        }
        return to;
    }

    record Result(int code, String out, String err) {
    }

    /** Main in-process with stdout and stderr captured (as cli/InspectCommandTest does). */
    static Result runMain(String... args) {
        PrintStream oldOut = System.out, oldErr = System.err;
        ByteArrayOutputStream out = new ByteArrayOutputStream(), err = new ByteArrayOutputStream();
        try {
            System.setOut(new PrintStream(out, true, StandardCharsets.UTF_8));
            System.setErr(new PrintStream(err, true, StandardCharsets.UTF_8));
            int code = Main.run(args);
            return new Result(code, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
        } finally {
            System.setOut(oldOut);
            System.setErr(oldErr);
        }
    }
}
