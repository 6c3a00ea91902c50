package org.risetrace.batch;

import com.fasterxml.jackson.core.JsonProcessingException;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.FrameRecord;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInAnalyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.Verdict;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.ReadContext;
import org.risetrace.io.Series;
import org.risetrace.report.LockInReport;
import org.risetrace.report.Reports;

import java.io.File;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.UUID;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.stream.Stream;

/**
 * Runs a batch: discovery, then every series of this shard analysed as {@code risetrace analyze} analyses one
 * (the import stage's {@link Series}, {@link BoardFile}, {@link SeriesAnalyzer} or, for a periodic injection,
 * {@link LockInAnalyzer}, and the report stage's writers), several series at a time; a series that fails is
 * recorded with its error and the batch goes on. Outputs of a series are written into a staging folder, renamed
 * into place one by one, and the manifest last; summary.json, summary.csv and index.html are written after every
 * series, each through a temporary name. Before any of that the output folder is checked and marked as the
 * batch's own ({@link BatchOutput}), so that a user's files are never written over.
 */
public final class BatchRunner {
    static final String STAGING_PREFIX = ".staging-";
    private static final String[] SERIES_OUTPUTS = {Reports.JSON_FILE, Reports.CSV_FILE, Reports.HTML_FILE};

    private BatchRunner() {
    }

    /**
     * How a batch runs.
     *
     * @param analysis         the analysis parameters (as {@code analyze} takes them)
     * @param profile          calibration profile override, or null (each series.json decides)
     * @param jobs             series analysed at once
     * @param threadsPerSeries worker threads of each series' analysis; null: all cores with one job, else 1
     * @param force            analyse every series even when its manifest says it is unchanged
     * @param shard            which share of the series to analyse
     */
    public record Options(AnalysisOptions analysis, String profile, int jobs, Integer threadsPerSeries, boolean force,
                          Shard shard) {
        public Options {
            if (analysis == null) throw new IllegalArgumentException("analysis options missing");
            if (jobs < 1) throw new IllegalArgumentException("jobs must be at least 1");
            if (threadsPerSeries != null && threadsPerSeries < 1) throw new IllegalArgumentException("threads must be at least 1");
            if (shard == null) shard = Shard.ALL;
        }

        public static Options defaults() {
            return new Options(AnalysisOptions.defaults(), null, Runtime.getRuntime().availableProcessors(), null,
                    false, Shard.ALL);
        }

        public Options withJobs(int n) { return new Options(analysis, profile, n, threadsPerSeries, force, shard); }
        public Options withForce(boolean f) { return new Options(analysis, profile, jobs, threadsPerSeries, f, shard); }
        public Options withShard(Shard s) { return new Options(analysis, profile, jobs, threadsPerSeries, force, s); }

        /** Series in parallel share the cores: one thread each; a single job's analysis gets them all. */
        public int threads() {
            if (threadsPerSeries != null) return threadsPerSeries;
            return jobs == 1 ? SeriesAnalyzer.defaultThreads() : 1;
        }

        /** The parameters that change results, as one canonical JSON text (compared by the manifest). */
        String parametersJson() {
            Map<String, Object> m = new LinkedHashMap<>(analysis.asMap());
            m.put("profile", profile);
            m.put("mode", "auto");
            try {
                return BatchSummary.JSON.writer().without(com.fasterxml.jackson.databind.SerializationFeature.INDENT_OUTPUT)
                        .writeValueAsString(m);
            } catch (JsonProcessingException e) {
                throw new IllegalStateException(e);
            }
        }
    }

    /** Told of the batch's progress, from the worker threads one call at a time. */
    public interface Listener {
        Listener NONE = new Listener() { };

        /** Before the first series. */
        default void started(int total) { }

        /**
         * A series is done.
         *
         * @param skipped       its outputs were current and were kept
         * @param internalError a programming error (not a rejected input) that failed it, else null
         */
        default void seriesDone(SeriesSummary row, boolean skipped, Throwable internalError, int done, int total,
                                int failed, long framesAnalysed) { }
    }

    /** What a run did. */
    public record Outcome(BatchSummary summary, int analysed, int skipped, Path out) {
    }

    /** Runs the batch over root into out. */
    public static Outcome run(Path root, Path out, Options options, Listener listener) {
        BatchOutput.checkPlacement(root, out);
        BatchOutput.checkOwned(out);
        List<SeriesTask> all = SeriesDiscovery.find(root, out);
        if (all.isEmpty())
            throw new InputRejected(root, "no series found", "a series is a folder of frames with a board.json in it or in a parent folder");
        BatchOutput.claim(out);
        List<SeriesTask> mine = options.shard().select(all);
        String version = SeriesAnalyzer.version();
        String parameters = options.parametersJson();
        SeriesSummary[] rows = new SeriesSummary[mine.size()];
        int[] counts = new int[4]; // done, failed, skipped, analysed
        long[] frames = new long[1];
        listener.started(mine.size());
        int pool = Math.max(1, Math.min(options.jobs(), mine.size()));
        ExecutorService exec = Executors.newFixedThreadPool(pool, r -> {
            Thread t = new Thread(r, "risetrace-batch");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<?>> futures = new ArrayList<>();
            for (int i = 0; i < mine.size(); i++) {
                final int k = i;
                futures.add(exec.submit(() -> {
                    Result r = runOne(root, mine.get(k), out, options, version, parameters);
                    rows[k] = r.row();
                    synchronized (counts) {
                        counts[0]++;
                        if (r.row().failed()) counts[1]++;
                        if (r.skipped()) counts[2]++;
                        else counts[3]++;
                        if (!r.skipped() && r.row().frames() != null) frames[0] += r.row().frames();
                        listener.seriesDone(r.row(), r.skipped(), r.internalError(), counts[0], mine.size(), counts[1],
                                frames[0]);
                    }
                }));
            }
            for (Future<?> f : futures) f.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("batch interrupted", e);
        } catch (ExecutionException e) {
            throw new IllegalStateException("batch failed: " + e.getCause(), e.getCause());
        } finally {
            exec.shutdownNow();
        }
        BatchSummary summary = BatchSummary.of(version, options.shard(), List.of(rows));
        writeSummary(summary, out);
        return new Outcome(summary, counts[3], counts[2], out);
    }

    private record Result(SeriesSummary row, boolean skipped, Throwable internalError) {
    }

    /** What was learnt about a series before it failed. */
    private static final class Known {
        Integer frames;
        Double durationS;
        List<String> warnings = List.of();
    }

    private static Result runOne(Path root, SeriesTask task, Path out, Options options, String version,
                                 String parameters) {
        Path dir = outputFolder(out, task.relativePath());
        Path manifestFile = dir.resolve(Manifest.FILE_NAME);
        String inputs;
        try {
            inputs = Manifest.inputsSha256(task.folder(), task.boardFile());
        } catch (IOException | UncheckedIOException e) {
            return new Result(SeriesSummary.failure(task.relativePath(), null, null, List.of(),
                    relative(root, "cannot read the inputs: " + e.getMessage())), false, null);
        }
        Manifest old = Manifest.readOrNull(manifestFile);
        if (!options.force() && old != null && old.matches(version, inputs, parameters)
                && task.relativePath().equals(old.summary().series()))
            return new Result(old.summary(), true, null);
        Known known = new Known();
        try {
            Files.createDirectories(dir);
            Files.deleteIfExists(manifestFile); // from here until the new manifest, the outputs are not known complete
            removeStaging(dir);
            SeriesSummary row = analyse(root, task, dir, options, known);
            AtomicFiles.writeString(manifestFile, new Manifest(Manifest.SCHEMA, version, inputs, parameters, row).toJson());
            return new Result(row, false, null);
        } catch (InputRejected e) {
            // the inputs decide this failure: recorded in a manifest too, so an unchanged broken series is not redone
            SeriesSummary row = SeriesSummary.failure(task.relativePath(), known.frames, known.durationS,
                    known.warnings, relative(root, e.getMessage()));
            try {
                for (String name : SERIES_OUTPUTS) Files.deleteIfExists(dir.resolve(name));
                AtomicFiles.writeString(manifestFile, new Manifest(Manifest.SCHEMA, version, inputs, parameters, row).toJson());
            } catch (IOException io) {
                // the row still reaches the summary; without a manifest the series is simply tried again next time
            }
            return new Result(row, false, null);
        } catch (IOException | UncheckedIOException e) {
            return new Result(SeriesSummary.failure(task.relativePath(), known.frames, known.durationS, known.warnings,
                    "cannot write the results to " + dir + ": " + BatchSummary.oneLine(e.getMessage())), false, null);
        } catch (RuntimeException | OutOfMemoryError | StackOverflowError e) {
            return new Result(SeriesSummary.failure(task.relativePath(), known.frames, known.durationS, known.warnings,
                    "internal error: " + e.getClass().getSimpleName() + ": " + relative(root, e.getMessage())), false, e);
        }
    }

    /** The series' analysis and outputs, as {@code risetrace analyze} makes them. */
    private static SeriesSummary analyse(Path root, SeriesTask task, Path dir, Options options, Known known)
            throws IOException {
        Series s = Series.open(task.folder(), options.profile(), ReadContext.DEFAULT_MAX_PIXELS);
        known.frames = s.size();
        known.durationS = s.size() == 0 ? null : s.tSeconds(s.size() - 1) - s.tSeconds(0);
        known.warnings = s.warnings();
        if (task.boardFile() == null)
            throw new InputRejected(task.folder().resolve(SeriesDiscovery.BOARD_FILE),
                    "board file not found, in the folder or a parent up to the batch root",
                    "mark the board with 'risetrace board'");
        Board b = BoardFile.read(task.boardFile(), Materials.load().names());
        String notes = s.sidecar() == null ? null : s.sidecar().notes();
        String label = task.folder().toString();
        Path stage = dir.resolve(STAGING_PREFIX + UUID.randomUUID());
        Verdict verdict;
        List<FrameRecord> frameRecords;
        String mode;
        try {
            if (LockInAnalyzer.periodic(s)) {
                LockIn li = LockInAnalyzer.analyze(s, b, task.boardFile(), label, options.analysis(),
                        SeriesAnalyzer.emissivity(s.profile()), options.threads(), Analyzer.Progress.NONE);
                LockInReport.writeAll(li, stage, notes);
                verdict = li.result().verdict();
                frameRecords = li.steady().result().frames();
                mode = "lock-in";
            } else {
                Analysis a = SeriesAnalyzer.analyzeOrCompare(s, b, task.boardFile(), label, options.analysis(),
                        options.threads(), Analyzer.Progress.NONE);
                Reports.writeAll(a, stage, notes);
                verdict = a.result().verdict();
                frameRecords = a.result().frames();
                mode = SeriesAnalyzer.isComparison(a) ? "compare" : "steady";
            }
            for (String name : SERIES_OUTPUTS) AtomicFiles.move(stage.resolve(name), dir.resolve(name));
        } finally {
            deleteTree(stage);
        }
        List<String> warnings = new ArrayList<>(s.warnings());
        String unused = unusedFrames(frameRecords);
        if (unused != null) warnings.add(unused);
        String report = ".".equals(task.relativePath()) ? Reports.HTML_FILE : task.relativePath() + "/" + Reports.HTML_FILE;
        if (noFrameUsed(frameRecords))
            // registration failed on every frame: the analysis ends "inconclusive", but for a batch this is a
            // series that could not be analysed, and it belongs among the failures (its report says why per frame)
            return new SeriesSummary(task.relativePath(), s.size(), known.durationS, mode, SeriesSummary.FAILED, null,
                    null, null, warnings, relative(root, task.folder() + ": " + verdict.reason()), report);
        return new SeriesSummary(task.relativePath(), s.size(), known.durationS, mode, verdict.status().word(),
                verdict.ref(), verdict.rateKPerS(), verdict.separationSigma(), warnings, null, report);
    }

    /** True when not one frame was mapped onto the board. */
    static boolean noFrameUsed(List<FrameRecord> frames) {
        if (frames == null || frames.isEmpty()) return true;
        for (FrameRecord f : frames) if (f.used()) return false;
        return true;
    }

    /** "k of n frames not used (first: name: reason)", or null when every frame was used. */
    static String unusedFrames(List<FrameRecord> frames) {
        if (frames == null) return null;
        int unused = 0;
        FrameRecord first = null;
        for (FrameRecord f : frames) {
            if (f.used()) continue;
            unused++;
            if (first == null) first = f;
        }
        if (unused == 0) return null;
        String reason = first.registration() == null || first.registration().reason() == null ? ""
                : ": " + BatchSummary.oneLine(first.registration().reason());
        return unused + " of " + frames.size() + " frames not used (first: " + first.file() + reason + ")";
    }

    /** One line, with the root's prefix taken off paths so the summary does not depend on where the tree lies. */
    static String relative(Path root, String message) {
        String m = BatchSummary.oneLine(message);
        String prefix = root.toString() + File.separator;
        return m.replace(prefix, "");
    }

    static Path outputFolder(Path out, String relativePath) {
        return ".".equals(relativePath) ? out : out.resolve(relativePath.replace('/', File.separatorChar));
    }

    /** Staging folders left by a run that was killed. */
    private static void removeStaging(Path dir) throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            for (Path p : s.toList())
                if (p.getFileName().toString().startsWith(STAGING_PREFIX) && Files.isDirectory(p)) deleteTree(p);
        }
    }

    private static void deleteTree(Path p) throws IOException {
        if (!Files.exists(p)) return;
        try (Stream<Path> s = Files.walk(p)) {
            for (Path q : s.sorted(Comparator.reverseOrder()).toList()) Files.deleteIfExists(q);
        }
    }

    /** summary.json, summary.csv and index.html, each through a temporary name. */
    static void writeSummary(BatchSummary summary, Path out) {
        try {
            AtomicFiles.writeString(out.resolve(BatchSummary.JSON_FILE), summary.toJson());
            AtomicFiles.writeString(out.resolve(SummaryCsv.FILE_NAME), SummaryCsv.toCsv(summary.series()));
            AtomicFiles.writeString(out.resolve(IndexHtml.FILE_NAME), IndexHtml.toHtml(summary));
        } catch (IOException e) {
            throw new InputRejected(out, "cannot write the summary: " + e.getMessage());
        }
    }

    /**
     * Merges the output folders of shards into one: every series' outputs copied (each through a temporary name)
     * to the same relative place, and one summary and index over all of them.
     */
    public static BatchSummary merge(List<Path> shardOuts, Path out) {
        if (shardOuts.isEmpty()) throw new InputRejected(null, "no shard output folders named");
        BatchOutput.checkOwned(out);
        List<SeriesSummary> rows = new ArrayList<>();
        Map<String, Path> seen = new LinkedHashMap<>();
        String version = null;
        for (Path shardOut : shardOuts) {
            BatchSummary s = BatchSummary.read(shardOut.resolve(BatchSummary.JSON_FILE));
            if (version == null) version = s.version();
            for (SeriesSummary row : s.series()) {
                Path before = seen.put(row.series(), shardOut);
                if (before != null)
                    throw new InputRejected(shardOut, "series '" + row.series() + "' is also in " + before,
                            "merge the outputs of distinct shards of one batch");
                rows.add(row);
            }
        }
        // every shard read and no series twice: only now is anything written
        BatchOutput.claim(out);
        for (SeriesSummary row : rows) {
            Path shardOut = seen.get(row.series());
            Path from = outputFolder(shardOut, row.series()), to = outputFolder(out, row.series());
            if (!from.toAbsolutePath().normalize().equals(to.toAbsolutePath().normalize())) {
                try {
                    for (String name : new String[]{Reports.JSON_FILE, Reports.CSV_FILE, Reports.HTML_FILE, Manifest.FILE_NAME})
                        if (Files.isRegularFile(from.resolve(name))) AtomicFiles.copy(from.resolve(name), to.resolve(name));
                } catch (IOException e) {
                    throw new InputRejected(to, "cannot copy the outputs of " + from + ": " + e.getMessage());
                }
            }
        }
        rows.sort(Comparator.comparing(SeriesSummary::series));
        BatchSummary merged = BatchSummary.of(version, null, rows);
        writeSummary(merged, out);
        return merged;
    }
}
