package org.risetrace.cli;

import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.report.ComparisonReport;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code risetrace compare}: a before and an after frame, part by part. */
@Command(name = "compare", mixinStandardHelpOptions = true,
        description = "Compares a before and an after frame part by part.")
public final class CompareCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "<before>", description = "frame before injection")
    Path before;

    @Parameters(index = "1", paramLabel = "<after>", description = "frame during or after injection")
    Path after;

    @Option(names = "--board", paramLabel = "<board.json>", description = "board file (default: board.json beside <before>)")
    Path board;

    @CommandLine.Mixin
    OutputOptions output = new OutputOptions();

    /**
     * Only the settings a two-frame comparison uses: baseline frames, rate window, last frames and threads belong to
     * a series, so {@code compare --help} does not offer them.
     */
    static final class PairTunables {
        @Option(names = "--k-sigma", paramLabel = "K", description = "significance threshold in noise sigmas (default: ${DEFAULT-VALUE})")
        double kSigma = org.risetrace.analysis.AnalysisOptions.defaults().kSigma();

        @Option(names = "--separation", paramLabel = "S", description = "combined standard errors the leader must lead by (default: ${DEFAULT-VALUE})")
        double separation = org.risetrace.analysis.AnalysisOptions.defaults().separationSigma();

        @Option(names = "--px-per-mm", paramLabel = "P", description = "board-space resolution (default: the reference frame's own)")
        Double pxPerMm;

        @Option(names = "--still-camera", description = "the camera did not move between the two frames (on a stand): "
                + "a frame that cannot be aligned takes the outline as marked (README, \"Plain boards\")")
        boolean stillCamera;

        org.risetrace.analysis.AnalysisOptions options(CommandLine cl) {
            try {
                return org.risetrace.analysis.AnalysisOptions.defaults().withKSigma(kSigma)
                        .withSeparationSigma(separation).withPxPerMm(pxPerMm).withStillCamera(stillCamera);
            } catch (IllegalArgumentException e) {
                throw new CommandLine.ParameterException(cl, e.getMessage());
            }
        }
    }

    @CommandLine.Mixin
    PairTunables tunables = new PairTunables();

    @Override
    public Integer call() {
        PrintWriter err = spec.commandLine().getErr();
        Path dir = output.out != null ? output.out : Path.of("risetrace-out", "compare");
        org.risetrace.report.Reports.checkOutputFolder(dir, output.force); // before the work, not after it
        Analysis a = run(before, after, board, output.profile, tunables, spec.commandLine(), err);
        try {
            ComparisonReport.writeAll(a, dir, null, output.force);
        } catch (java.io.UncheckedIOException e) {
            throw new InputRejected(dir, "cannot write the results: " + e.getCause().getMessage());
        }
        if (output.json) spec.commandLine().getOut().println(AnalyzeCommand.toJson(a));
        else {
            spec.commandLine().getOut().println(AnalyzeCommand.line(before.getFileName() + " -> " + after.getFileName(),
                    a.result().verdict()));
            spec.commandLine().getOut().println("report: " + dir.resolve("report.html"));
        }
        spec.commandLine().getOut().flush();
        return Main.EXIT_OK;
    }

    static Analysis run(Path before, Path after, Path board, String profile, PairTunables tunables,
                        CommandLine cl, PrintWriter err) {
        for (Path p : List.of(before, after))
            if (!Files.isRegularFile(p)) throw new InputRejected(p, "frame file not found");
        Path folder = before.toAbsolutePath().getParent();
        Path sidecar = folder.resolve("series.json");
        // a series.json describes the frames of its own folder: applied to a frame from another one it asked for that
        // frame's t_s and hid what was wrong with it (a cut file named as a missing time)
        boolean oneFolder = folder.equals(after.toAbsolutePath().getParent());
        if (!oneFolder && Files.isRegularFile(sidecar))
            err.println("risetrace: the two frames are in different folders: " + sidecar + " is not used (name the"
                    + " calibration profile with --profile)");
        Series s = Series.open(List.of(before, after), oneFolder && Files.isRegularFile(sidecar) ? sidecar : null,
                profile);
        for (String w : s.warnings()) err.println("risetrace: " + w);
        int ib = s.fileName(0).equals(before.getFileName().toString()) ? 0 : 1;
        String swapped = s.orderProblem(ib, 1 - ib);
        if (swapped != null) throw new InputRejected(before, swapped, "give the earlier frame first: compare "
                + after.getFileName() + " " + before.getFileName());
        Frame fb = s.read(ib), fa = s.read(1 - ib);
        Path boardFile = board != null ? board : folder.resolve("board.json");
        if (!Files.isRegularFile(boardFile))
            throw new InputRejected(boardFile, "board file not found", "pass --board");
        Board b = BoardFile.read(boardFile, Materials.load().names());
        return SeriesAnalyzer.compare(fb, fa, b, boardFile, tunables.options(cl), s.sidecar(), s.profile());
    }
}
