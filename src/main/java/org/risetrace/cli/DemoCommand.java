package org.risetrace.cli;

import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Hotspot;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInAnalyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.VerdictStatus;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.report.Reports;
import org.risetrace.sim.Truth;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

/**
 * {@code risetrace demo}: analyses every bundled sample series under {@code sample-frames/} (a series of two frames
 * as a before/after comparison), writes each report to {@code <out>/<series>/} and prints each verdict in one line.
 * Where the series carries the simulator's {@code truth.json}, the line is followed by a self-check; the analysis
 * itself never reads that file.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Analyses every bundled sample series and writes their reports.")
public final class DemoCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--out", paramLabel = "<dir>", description = "output folder (default: ${DEFAULT-VALUE})")
    Path out = Path.of("demo-out");

    @Option(names = "--samples", paramLabel = "<dir>", description = "folder of sample series (default: ${DEFAULT-VALUE})")
    Path samples = Path.of("sample-frames");

    @Override
    public Integer call() {
        PrintWriter o = spec.commandLine().getOut(), err = spec.commandLine().getErr();
        if (!Files.isDirectory(samples))
            throw new InputRejected(samples, "no bundled sample series here",
                    "run demo from the risetrace checkout, the folder that holds sample-frames/");
        List<Path> series = new ArrayList<>();
        try (Stream<Path> s = Files.list(samples)) {
            s.filter(p -> Files.isRegularFile(p.resolve("board.json"))).sorted().forEach(series::add);
        } catch (IOException e) {
            throw new InputRejected(samples, "cannot list the sample series: " + e.getMessage());
        }
        if (series.isEmpty())
            throw new InputRejected(samples, "holds no sample series (folders with board.json and frames)");
        int mismatches = 0;
        for (Path dir : series) {
            String name = dir.getFileName().toString();
            Series s = Series.open(dir);
            Board board = BoardFile.read(dir.resolve("board.json"), Materials.load().names());
            AnalysisOptions options = AnalysisOptions.defaults();
            if (LockInAnalyzer.periodic(s)) {
                mismatches += lockIn(s, board, dir, name, options, o, err) ? 0 : 1;
                continue;
            }
            Analysis a = s.size() == 2
                    ? SeriesAnalyzer.compare(s.read(0), s.read(1), board, dir.resolve("board.json"), options,
                    s.sidecar(), s.profile())
                    : SeriesAnalyzer.analyze(s, board, dir.resolve("board.json"), dir.toString(), options,
                    SeriesAnalyzer.emissivity(s.profile()), SeriesAnalyzer.defaultThreads(),
                    AnalyzeCommand.progress(err));
            Path target = out.resolve(name);
            // the demo's folders are its own scratch space: a second demo run replaces them (each as one set)
            AnalyzeCommand.writeOutputs(a, target, s.sidecar() == null ? null : s.sidecar().notes(), true);
            o.println(AnalyzeCommand.line(name, a.result().verdict()));
            Path truthFile = dir.resolve("truth.json");
            if (Files.isRegularFile(truthFile)) {
                String check = check(a, Truth.read(truthFile), s.size() == 2);
                if (check == null) o.println("  matches the simulation's truth");
                else {
                    o.println("  does not match the simulation's truth: " + check);
                    mismatches++;
                }
            }
            o.println("  report: " + target.resolve(Reports.HTML_FILE));
            o.flush();
        }
        if (mismatches > 0) err.println("risetrace: " + mismatches + " sample series did not match their truth");
        return Main.EXIT_OK;
    }

    /** A periodic series: lock-in analysis; false when it does not match the simulation's truth. */
    private boolean lockIn(Series s, Board board, Path dir, String name, AnalysisOptions options, PrintWriter o,
                           PrintWriter err) {
        LockIn li = LockInAnalyzer.analyze(s, board, dir.resolve("board.json"), dir.toString(), options,
                SeriesAnalyzer.emissivity(s.profile()), SeriesAnalyzer.defaultThreads(), AnalyzeCommand.progress(err));
        Path target = out.resolve(name);
        AnalyzeCommand.writeLockIn(li, target, s.sidecar() == null ? null : s.sidecar().notes(), true);
        o.println(AnalyzeCommand.line(name, li.result().verdict()));
        o.println("  " + AnalyzeCommand.modeLine(li));
        boolean ok = true;
        Path truthFile = dir.resolve("truth.json");
        if (Files.isRegularFile(truthFile)) {
            String source = Truth.read(truthFile).primarySource();
            ok = li.result().verdict().status() == VerdictStatus.IDENTIFIED && source.equals(li.result().verdict().ref());
            o.println(ok ? "  matches the simulation's truth"
                    : "  does not match the simulation's truth: expected " + source + " identified by lock-in");
        }
        o.println("  report: " + target.resolve(Reports.HTML_FILE));
        o.flush();
        return ok;
    }

    /** Null when the result agrees with the simulated truth, else what differs. */
    static String check(Analysis a, Truth truth, boolean pair) {
        String source = truth.primarySource();
        Truth.UnmarkedPart unmarked = null;
        if (truth.unmarked() != null)
            for (Truth.UnmarkedPart u : truth.unmarked()) if (u.ref().equals(source)) unmarked = u;
        if (unmarked != null) {
            List<Hotspot> hs = a.result().hotspots();
            if (hs.isEmpty()) return "no hot spot found; the source is the unmarked " + source;
            Hotspot top = hs.get(0);
            double d = Math.hypot(top.xMm() - unmarked.xMm(), top.yMm() - unmarked.yMm());
            if (top.ref() != null || d > 1.5)
                return String.format(java.util.Locale.ROOT, "expected the hottest spot on no marked part near %.1f, %.1f mm (%s)",
                        unmarked.xMm(), unmarked.yMm(), source);
            String reason = a.result().verdict().reason();
            return reason != null && reason.contains("no marked part") ? null : "the verdict does not point at the unmarked spot";
        }
        if (pair) {
            String top = a.result().parts().isEmpty() ? null : a.result().parts().get(0).ref();
            return source.equals(top) ? null : "expected " + source + " to rise most, got " + top;
        }
        if (a.result().verdict().status() != VerdictStatus.IDENTIFIED) return "expected " + source + " identified";
        return source.equals(a.result().verdict().ref()) ? null : "expected " + source + ", got " + a.result().verdict().ref();
    }
}
