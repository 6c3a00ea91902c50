package org.risetrace.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.risetrace.io.FrameSummary;
import org.risetrace.io.Inspection;
import org.risetrace.io.ReadContext;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;

/** {@code risetrace inspect}: what each frame holds. Parses, calls {@link Inspection#inspect}, prints. */
@Command(name = "inspect", mixinStandardHelpOptions = true,
        description = "Prints what each frame holds: container, size, bit depth, profile, temperatures, time.",
        exitCodeListHeading = "%nExit codes:%n",
        exitCodeList = {"0:all frames read", "1:an input was rejected (one line on stderr names it)",
                "2:usage error"})
public final class InspectCommand implements Callable<Integer> {
    @Parameters(arity = "1..*", paramLabel = "FILE_OR_FOLDER",
            description = "Frame files, or folders holding a series (with an optional series.json).")
    List<Path> inputs;

    @Option(names = "--profile", paramLabel = "NAME|PATH",
            description = "Calibration profile by name (u16-centikelvin, u16-decikelvin, f32-celsius, f32-kelvin, "
                    + "u8-span, matrix-celsius, or ./calibration/NAME.json) or by path to a .json file.")
    String profile;

    @Option(names = "--json", description = "Print one JSON document on stdout; messages go to stderr.")
    boolean json;

    @Option(names = "--max-pixels", paramLabel = "N", defaultValue = "" + ReadContext.DEFAULT_MAX_PIXELS,
            description = "Refuse frames whose header claims more pixels than this (default: ${DEFAULT-VALUE}).")
    long maxPixels;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        if (maxPixels <= 0)
            throw new CommandLine.ParameterException(spec.commandLine(), "--max-pixels must be a positive number");
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        List<FrameSummary> frames = new ArrayList<>();
        int[] rows = {0};
        List<String> warnings = Inspection.inspect(inputs, profile, maxPixels, s -> {
            if (json) {
                frames.add(s);
            } else {
                if (rows[0]++ == 0)
                    out.printf(Locale.ROOT, "%-5s %11s %4s %-16s %9s %9s %9s %10s  %s%n", "type", "size",
                            "bits", "profile", "min_c", "mean_c", "max_c", "t_s", "file");
                out.printf(Locale.ROOT, "%-5s %11s %4d %-16s %9s %9s %9s %10.3f  %s%n", s.container(),
                        s.width() + "x" + s.height(), s.bitDepth(), s.profile(), num(s.minC()), num(s.meanC()),
                        num(s.maxC()), s.tS(), s.file());
                out.flush();
            }
        });
        for (String w : warnings) err.println("risetrace: warning: " + w);
        err.flush();
        if (json) {
            Map<String, Object> doc = new LinkedHashMap<>();
            doc.put("frames", frames);
            doc.put("warnings", warnings);
            out.println(new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(doc));
        }
        out.flush();
        return Main.EXIT_OK;
    }

    private static String num(Double v) {
        return v == null ? "-" : String.format(Locale.ROOT, "%.2f", v);
    }
}
