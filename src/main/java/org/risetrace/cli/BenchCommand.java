package org.risetrace.cli;

import org.risetrace.bench.Bench;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace bench}: the tool's own benchmark on series it generates. */
@Command(name = "bench", mixinStandardHelpOptions = true,
        description = "Generates synthetic series (640 x 512, 300 frames, 16-bit PNG and TIFF, hand-held and stand) "
                + "and measures, in one run: bare ImageIO decode, import, import + registration and full analysis "
                + "(as ratios to the bare decode), peak heap, batch throughput with one and two jobs, a cold "
                + "analyze in a new JVM and the heap for 300 and 3,000 frames. Takes several minutes.")
public final class BenchCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--quick", description = "tiny sizes (160 x 128, 12 and 120 frames): checks the command runs; the numbers mean nothing")
    boolean quick;

    @Option(names = "--json", description = "print the result as JSON on standard output (progress on standard error)")
    boolean json;

    @Option(names = "--work-dir", paramLabel = "<dir>", description = "where the generated series go (default: the system's temporary folder)")
    Path workDir;

    @Option(names = "--keep", description = "keep the generated series and outputs")
    boolean keep;

    @Override
    public Integer call() {
        PrintWriter err = spec.commandLine().getErr();
        Bench.Result r = Bench.run(new Bench.Options(quick, workDir, keep), line -> {
            err.println("risetrace bench: " + line);
            err.flush();
        });
        PrintWriter out = spec.commandLine().getOut();
        out.print(json ? Bench.json(r) + "\n" : Bench.table(r));
        out.flush();
        return Main.EXIT_OK;
    }
}
