package org.risetrace.cli;

import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInAnalyzer;
import org.risetrace.analysis.LockInResult;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.Verdict;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.report.AnalysisJson;
import org.risetrace.report.LockInReport;
import org.risetrace.report.Reports;
import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code risetrace analyze}: one series folder against its board file. */
@Command(name = "analyze", mixinStandardHelpOptions = true,
        description = "Finds the part heating fastest above ambient in a series.")
public final class AnalyzeCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "<series-folder>", description = "folder of frames (with series.json)")
    Path series;

    @Option(names = "--board", paramLabel = "<board.json>", description = "board file (default: board.json in the series folder)")
    Path board;

    @CommandLine.Mixin
    OutputOptions output = new OutputOptions();

    /** Which analysis runs. */
    public enum Mode { auto, steady, lock_in }

    @Option(names = "--mode", paramLabel = "auto|steady|lock-in", converter = ModeConverter.class,
            description = "auto (default): lock-in when series.json gives injection.period_s, else steady; "
                    + "lock-in: also without a period (found from the spectrum of the board's mean temperature)")
    Mode mode = Mode.auto;

    static final class ModeConverter implements CommandLine.ITypeConverter<Mode> {
        @Override public Mode convert(String value) {
            return switch (value) {
                case "auto" -> Mode.auto;
                case "steady" -> Mode.steady;
                case "lock-in" -> Mode.lock_in;
                default -> throw new CommandLine.TypeConversionException("'" + value + "': use auto, steady or lock-in");
            };
        }
    }

    @CommandLine.Mixin
    Tunables tunables = new Tunables();

    /** The analysis options every analysing command shares. */
    public static final class Tunables {
        @Option(names = "--baseline-frames", paramLabel = "N",
                description = "baseline = the first N frames when series.json gives no injection start (default: the first frame)")
        Integer baselineFrames;

        @Option(names = "--k-sigma", paramLabel = "K", description = "onset and significance threshold in noise sigmas (default: ${DEFAULT-VALUE})")
        double kSigma = AnalysisOptions.defaults().kSigma();

        @Option(names = "--rate-window", paramLabel = "S", description = "early window for initial rates, seconds after the injection start (default: ${DEFAULT-VALUE})")
        double rateWindowS = AnalysisOptions.defaults().rateWindowS();

        @Option(names = "--separation", paramLabel = "S", description = "combined standard errors the leader must lead by (default: ${DEFAULT-VALUE})")
        double separation = AnalysisOptions.defaults().separationSigma();

        @Option(names = "--last-frames", paramLabel = "N", description = "frames averaged for the end rise and the rise map (default: ${DEFAULT-VALUE})")
        int lastFrames = AnalysisOptions.defaults().lastFrames();

        @Option(names = "--px-per-mm", paramLabel = "P", description = "board-space resolution (default: the reference frame's own)")
        Double pxPerMm;

        @Option(names = "--threads", paramLabel = "N", description = "worker threads (default: all cores, at least 2)")
        Integer threads;

        @Option(names = "--still-camera", description = "the camera did not move between frames (on a stand): a frame "
                + "that cannot be aligned takes the outline as marked instead of being left out; for boards whose "
                + "picture shows no texture (README, \"Plain boards\")")
        boolean stillCamera;

        AnalysisOptions options(CommandLine cl) {
            // ranges at the boundary: Infinity or NaN would pass the core's "> 0" tests and give no verdict at all
            if (!(Double.isFinite(kSigma) && kSigma > 0 && kSigma <= 100))
                throw new CommandLine.ParameterException(cl, "--k-sigma must be a number in (0, 100], got " + kSigma);
            if (!(Double.isFinite(separation) && separation >= 0 && separation <= 100))
                throw new CommandLine.ParameterException(cl, "--separation must be a number in [0, 100], got " + separation);
            if (!(Double.isFinite(rateWindowS) && rateWindowS > 0))
                throw new CommandLine.ParameterException(cl, "--rate-window must be a positive number of seconds, got "
                        + rateWindowS);
            if (pxPerMm != null && !(Double.isFinite(pxPerMm) && pxPerMm > 0))
                throw new CommandLine.ParameterException(cl, "--px-per-mm must be a positive number, got " + pxPerMm);
            if (lastFrames < 1) throw new CommandLine.ParameterException(cl, "--last-frames must be at least 1");
            if (baselineFrames != null && baselineFrames < 1)
                throw new CommandLine.ParameterException(cl, "--baseline-frames must be at least 1");
            if (threads != null && (threads < 1 || threads > 256))
                throw new CommandLine.ParameterException(cl, "--threads must be 1 to 256");
            try {
                return AnalysisOptions.defaults().withBaselineFrames(baselineFrames).withKSigma(kSigma)
                        .withRateWindowS(rateWindowS).withSeparationSigma(separation).withLastFrames(lastFrames)
                        .withPxPerMm(pxPerMm).withStillCamera(stillCamera);
            } catch (IllegalArgumentException e) {
                throw new CommandLine.ParameterException(cl, e.getMessage());
            }
        }

        int threads() {
            return threads == null ? SeriesAnalyzer.defaultThreads() : Math.max(1, threads);
        }
    }

    @Override
    public Integer call() {
        AnalysisOptions options = tunables.options(spec.commandLine());
        PrintWriter err = spec.commandLine().getErr();
        if (!Files.isDirectory(series)) throw new InputRejected(series, "not a folder", "name the folder of frames");
        Reports.warmUpInBackground(); // the report's code loads while the series opens (DEVELOPERS.md "Cold start")
        Series s = Series.open(series, output.profile, org.risetrace.io.ReadContext.DEFAULT_MAX_PIXELS);
        for (String w : s.warnings()) err.println("risetrace: " + w);
        Path dir = output.out != null ? output.out : Path.of("risetrace-out", series.toAbsolutePath().normalize().getFileName().toString());
        Reports.checkOutputFolder(dir, output.force); // before the work, not after it
        Path boardFile = board != null ? board : series.resolve("board.json");
        if (!Files.isRegularFile(boardFile))
            throw new InputRejected(boardFile, "board file not found", "mark the board with 'risetrace board' or pass --board");
        Board b = BoardFile.read(boardFile, Materials.load().names());
        if (b.outline() != null && b.outline().frames() != null)
            for (String name : b.outline().frames().keySet())
                if (!s.files().stream().anyMatch(f -> f.getFileName().toString().equals(name)))
                    err.println("risetrace: warning: " + boardFile + ": outline.frames names frame '" + name
                            + "', which is not in the series; its corners are not used");
        if (mode == Mode.lock_in || (mode == Mode.auto && LockInAnalyzer.periodic(s))) return lockIn(s, b, boardFile, options, err);
        long opened = System.nanoTime();
        Analysis a = SeriesAnalyzer.analyzeOrCompare(s, b, boardFile, series.toString(), options,
                tunables.threads(), progress(err));
        boolean pair = SeriesAnalyzer.isComparison(a);
        if (pair) err.println("risetrace: two frames: compared as before and after (" + s.fileName(0) + " -> "
                + s.fileName(1) + "), rises only; a rate needs at least three frames");
        long analysed = System.nanoTime();
        warnLeftOut(a, err);
        writeOutputs(a, dir, s.sidecar() == null ? null : s.sidecar().notes(), output.force);
        if (Boolean.getBoolean("risetrace.timing")) // where a cold run's time goes (DEVELOPERS.md "Cold start")
            err.printf(Locale.ROOT, "risetrace: timing: JVM start to open done %.2f s, analysis %.2f s, report %.2f s%n",
                    java.lang.management.ManagementFactory.getRuntimeMXBean().getUptime() / 1e3
                            - (System.nanoTime() - opened) / 1e9, (analysed - opened) / 1e9,
                    (System.nanoTime() - analysed) / 1e9);
        if (output.json) {
            PrintWriter o = spec.commandLine().getOut();
            o.println(toJson(a));
            o.flush();
        } else {
            spec.commandLine().getOut().println(line(series.getFileName().toString(), a.result().verdict()));
            spec.commandLine().getOut().println(pair ? "mode: compare" : "mode: steady");
            spec.commandLine().getOut().println("report: " + dir.resolve("report.html"));
        }
        err.flush();
        return Main.EXIT_OK;
    }

    /** The lock-in path: one pass feeds the lock-in and the steady analysis; the lock-in verdict is the answer. */
    private Integer lockIn(Series s, Board b, Path boardFile, AnalysisOptions options, PrintWriter err) {
        LockIn li = LockInAnalyzer.analyze(s, b, boardFile, series.toString(), options,
                SeriesAnalyzer.emissivity(s.profile()), tunables.threads(), progress(err));
        Path dir = output.out != null ? output.out : Path.of("risetrace-out", series.toAbsolutePath().normalize().getFileName().toString());
        writeLockIn(li, dir, s.sidecar() == null ? null : s.sidecar().notes(), output.force);
        PrintWriter o = spec.commandLine().getOut();
        if (output.json) {
            o.println(LockInReport.toJson(li).stripTrailing());
        } else {
            o.println(line(series.getFileName().toString(), li.result().verdict()));
            o.println(modeLine(li));
            o.println("report: " + dir.resolve("report.html"));
        }
        o.flush();
        err.flush();
        return Main.EXIT_OK;
    }

    /** "mode: lock-in, ..." with the timing, periods, sensitivity and the steady verdict of the same frames. */
    static String modeLine(LockIn li) {
        LockInResult r = li.result();
        Verdict sv = r.steadyVerdict();
        return String.format(Locale.ROOT, "mode: lock-in, period %.4g s (%s), %d whole periods, sensitivity %s; "
                        + "steady analysis of the same frames: %s%s", r.excitation().periodS(),
                r.excitation().source().startsWith("series.json") ? "from series.json" : "found from the spectrum",
                r.periods(), r.sensitivityK() == null ? "unknown" : String.format(Locale.ROOT, "%.2g K per pixel (3 sigma)",
                        r.sensitivityK()), sv == null ? "none" : sv.status().word(),
                sv == null || sv.ref() == null ? "" : " " + sv.ref());
    }

    static void writeLockIn(LockIn li, Path dir, String notes, boolean replace) {
        try {
            LockInReport.writeAll(li, dir, notes, replace);
        } catch (UncheckedIOException e) {
            throw new InputRejected(dir, "cannot write the results: " + e.getCause().getMessage());
        }
    }

    /** Frames that could not be read (damaged, another size) are left out; the user hears of each on stderr. */
    static void warnLeftOut(Analysis a, PrintWriter err) {
        if (a.result().frames() == null) return;
        for (org.risetrace.analysis.FrameRecord r : a.result().frames())
            if (!r.used() && r.registration() != null && r.registration().reason() != null
                    && r.registration().reason().startsWith("cannot read"))
                err.println("risetrace: warning: left out " + r.file() + ": " + r.registration().reason());
    }

    /** One line for a verdict. */
    static String line(String name, Verdict v) {
        return String.format(Locale.ROOT, "%s: %s%s - %s", name, v.status().word(),
                v.ref() == null ? "" : " " + v.ref(), v.reason());
    }

    /**
     * A progress bar (me.tongfei:progressbar) on stderr, only when there is a terminal to redraw it on: never in a
     * pipe, a log or a test, and never on stdout, which carries only the analysis.json document with --json.
     */
    static Analyzer.Progress progress(PrintWriter err) {
        if (System.console() == null) return Analyzer.Progress.NONE;
        return new Analyzer.Progress() {
            private ProgressBar bar;

            @Override public void update(int done, int total) {
                if (total < 20) return;
                if (bar == null)
                    bar = new ProgressBarBuilder().setTaskName("frames").setInitialMax(total)
                            .setStyle(ProgressBarStyle.ASCII).setUpdateIntervalMillis(200)
                            .setConsumer(new ConsoleProgressBarConsumer(System.err)).build();
                bar.stepTo(done);
                if (done == total) {
                    bar.close();
                    bar = null;
                }
            }
        };
    }

    static String toJson(Analysis a) {
        return AnalysisJson.toJson(a.result());
    }

    /** analysis.json, parts.csv and report.html into dir, as one set; an earlier set is replaced only with replace. */
    static void writeOutputs(Analysis a, Path dir, String notes, boolean replace) {
        try {
            Reports.writeAll(a, dir, notes, replace);
        } catch (UncheckedIOException e) {
            throw new InputRejected(dir, "cannot write the results: " + e.getCause().getMessage());
        }
    }
}
