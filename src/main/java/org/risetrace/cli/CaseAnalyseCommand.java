package org.risetrace.cli;

import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.archive.Archive;
import org.risetrace.archive.CaseAnalysis;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.util.concurrent.Callable;

/** {@code risetrace case analyse}: analyses an archived series; the outputs are stored in the archive. */
@Command(name = "analyse", aliases = "analyze", mixinStandardHelpOptions = true,
        description = "Analyses an archived series as 'risetrace analyze' does and stores the outputs with the case.")
public final class CaseAnalyseCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<case>", description = "the case number")
    String number;
    @Parameters(index = "1", paramLabel = "<series>", description = "the series' name in the case")
    String series;

    @Option(names = "--mode", paramLabel = "auto|steady|lock-in", converter = AnalyzeCommand.ModeConverter.class,
            description = "as for 'risetrace analyze' (default: auto)")
    AnalyzeCommand.Mode mode = AnalyzeCommand.Mode.auto;

    @CommandLine.Mixin
    AnalyzeCommand.Tunables tunables = new AnalyzeCommand.Tunables();

    @Override
    public Integer call() {
        AnalysisOptions options = tunables.options(spec.commandLine());
        PrintWriter err = spec.commandLine().getErr();
        CaseAnalysis.Mode m = switch (mode) {
            case auto -> CaseAnalysis.Mode.AUTO;
            case steady -> CaseAnalysis.Mode.STEADY;
            case lock_in -> CaseAnalysis.Mode.LOCK_IN;
        };
        try (Archive a = archive.open()) {
            Archive.AnalysisRecord r = CaseAnalysis.analyse(a, number, series, options, m, tunables.threads(),
                    AnalyzeCommand.progress(err));
            PrintWriter o = spec.commandLine().getOut();
            o.println(number + "/" + series + ": " + (r.verdictStatus() == null ? "no verdict" : r.verdictStatus())
                    + " - " + r.headline());
            o.println("analysis " + r.id() + " stored (" + r.mode() + "; " + r.outputs().size() + " outputs)");
            o.flush();
        }
        return Main.EXIT_OK;
    }
}
