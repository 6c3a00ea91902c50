package org.risetrace.cli;

import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;
import org.risetrace.batch.BatchRunner;
import org.risetrace.batch.BatchSummary;
import org.risetrace.batch.SeriesSummary;
import org.risetrace.batch.Shard;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/**
 * {@code risetrace batch}: every series under a folder, and {@code risetrace batch merge} for shards' outputs.
 * Exit codes: 0 every series analysed, 1 some failed (each with its error in the summary) or the root is unusable,
 * 2 usage error.
 */
@Command(name = "batch", mixinStandardHelpOptions = true, subcommands = BatchCommand.Merge.class,
        description = {"Analyses every series under a folder (a folder of frames with its own board.json or a parent's) "
                + "and writes each one's outputs, summary.csv, summary.json and index.html.",
                "Exit code 0 when every series was analysed, 1 when some failed (see the error column), 2 for a usage error."})
public final class BatchCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", arity = "0..1", paramLabel = "<root>", description = "folder holding the series (at any depth)")
    Path root;

    @Option(names = "--out", paramLabel = "<dir>", description = "output folder (default: risetrace-out/batch-<root name>)")
    Path out;

    @Option(names = "--jobs", paramLabel = "N", description = "series analysed at once (default: all cores; each then uses one thread, one job uses them all)")
    Integer jobs;

    @Option(names = "--quiet", description = "no progress bar: one line per failed series and the totals")
    boolean quiet;

    @Option(names = "--force", description = "analyse every series again, also those whose inputs and parameters are unchanged")
    boolean force;

    @Option(names = "--shard", paramLabel = "i/n", description = "analyse only the i-th of n shares (series sorted by path, every n-th from the i-th); merge with 'batch merge'")
    String shard;

    @Option(names = "--profile", paramLabel = "<name|file>", description = "calibration profile (overrides each series.json)")
    String profile;

    @CommandLine.Mixin
    AnalyzeCommand.Tunables tunables = new AnalyzeCommand.Tunables();

    @Override
    public Integer call() {
        CommandLine cl = spec.commandLine();
        if (root == null) throw new CommandLine.ParameterException(cl, "name the folder holding the series: risetrace batch <root>");
        BatchRunner.Options options;
        try {
            options = new BatchRunner.Options(tunables.options(cl), profile,
                    jobs == null ? Runtime.getRuntime().availableProcessors() : jobs, tunables.threads, force,
                    shard == null ? Shard.ALL : Shard.parse(shard));
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(cl, e.getMessage());
        }
        Path dir = out != null ? out : Path.of("risetrace-out", "batch-" + root.toAbsolutePath().normalize().getFileName());
        PrintWriter err = cl.getErr();
        Progress progress = new Progress(err, quiet, System.console() != null && !quiet);
        BatchRunner.Outcome o;
        try {
            o = BatchRunner.run(root, dir, options, progress);
        } finally {
            progress.close();
        }
        BatchSummary s = o.summary();
        PrintWriter w = cl.getOut();
        w.printf(Locale.ROOT, "%d series%s: %d analysed, %d unchanged and skipped, %d failed%n", s.total(),
                s.shard() == null ? "" : " (shard " + s.shard() + ")", o.analysed(), o.skipped(), s.failed());
        w.println("summary: " + dir.resolve("summary.csv"));
        w.println("index: " + dir.resolve("index.html"));
        w.flush();
        err.flush();
        return s.failed() == 0 ? Main.EXIT_OK : Main.EXIT_INPUT_REJECTED;
    }

    /**
     * A progress bar (me.tongfei:progressbar) on stderr when there is a terminal: series done of total, failures
     * and frames per second, with its elapsed time and estimate of the time left; else one plain line per series
     * (with --quiet only the failures).
     */
    static final class Progress implements BatchRunner.Listener {
        private final PrintWriter err;
        private final boolean quiet;
        private final boolean bar;
        private ProgressBar progressBar;
        private long startNanos;

        Progress(PrintWriter err, boolean quiet, boolean bar) {
            this.err = err;
            this.quiet = quiet;
            this.bar = bar;
        }

        @Override public void started(int total) {
            startNanos = System.nanoTime();
            if (bar)
                progressBar = new ProgressBarBuilder().setTaskName("series").setInitialMax(total)
                        .setStyle(ProgressBarStyle.ASCII).setUpdateIntervalMillis(250)
                        .setEtaFunction(state -> java.util.Optional.ofNullable(eta(state.getCurrent(), state.getMax())))
                        .setConsumer(new ConsoleProgressBarConsumer(System.err)).build();
        }

        private Duration eta(long done, long total) {
            if (done <= 0) return null;
            double perSeries = (System.nanoTime() - startNanos) / (double) done;
            return Duration.ofNanos((long) (perSeries * (total - done)));
        }

        @Override public void seriesDone(SeriesSummary row, boolean skipped, Throwable internalError, int done,
                                         int total, int failed, long framesAnalysed) {
            if (internalError != null) internalError.printStackTrace(new PrintWriter(err, true));
            if (progressBar != null) {
                double s = (System.nanoTime() - startNanos) / 1e9;
                progressBar.setExtraMessage(String.format(Locale.ROOT, "%d failed, %.1f frames/s", failed,
                        s > 0 ? framesAnalysed / s : 0.0));
                progressBar.stepTo(done);
                return;
            }
            if (quiet && !row.failed()) return;
            String what = row.failed() ? "FAILED " + row.error()
                    : (skipped ? "unchanged, " : "") + row.status() + (row.designator() == null ? "" : " " + row.designator());
            err.printf(Locale.ROOT, "risetrace: [%d/%d] %s: %s%n", done, total, row.series(), what);
            err.flush();
        }

        void close() {
            if (progressBar != null) progressBar.close();
            progressBar = null;
        }
    }

    /** {@code risetrace batch merge}: one summary and index over the output folders of shards. */
    @Command(name = "merge", mixinStandardHelpOptions = true,
            description = "Merges the output folders of 'risetrace batch --shard' runs into one folder with one summary and index.")
    static final class Merge implements Callable<Integer> {
        @CommandLine.Spec
        CommandLine.Model.CommandSpec spec;

        @Parameters(arity = "1..*", paramLabel = "<shard-out>", description = "output folders of the shards")
        List<Path> shardOuts;

        @Option(names = "--out", required = true, paramLabel = "<dir>", description = "merged output folder")
        Path out;

        @Override
        public Integer call() {
            BatchSummary s = BatchRunner.merge(shardOuts, out);
            PrintWriter w = spec.commandLine().getOut();
            w.printf(Locale.ROOT, "%d series from %d shard folders, %d failed%n", s.total(), shardOuts.size(), s.failed());
            w.println("summary: " + out.resolve("summary.csv"));
            w.println("index: " + out.resolve("index.html"));
            w.flush();
            return s.failed() == 0 ? Main.EXIT_OK : Main.EXIT_INPUT_REJECTED;
        }
    }
}
