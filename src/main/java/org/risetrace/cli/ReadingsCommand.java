package org.risetrace.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.risetrace.frame.InputRejected;
import org.risetrace.planning.BenchReadings;
import org.risetrace.planning.ReadingsFile;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code risetrace readings}: bench meter readings with outliers flagged. Parses, calls {@link BenchReadings#assess}, prints. */
@Command(name = "readings", mixinStandardHelpOptions = true,
        description = {"Checks bench meter readings (" + ReadingsFile.FILE_NAME + "): flags the reading that stands "
                + "out among like readings (modified z-score beyond 3.5) and compares inductor readings with the ideal "
                + "reactance 2 pi f L."},
        exitCodeListHeading = "%nExit codes:%n",
        exitCodeList = {"0:readings checked", "1:an input was rejected (one line on stderr names it)", "2:usage error"})
public final class ReadingsCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "FILE|SERIES-FOLDER",
            description = "a readings CSV, or a series folder holding " + ReadingsFile.FILE_NAME)
    Path input;

    @Option(names = "--json", description = "print the assessment as one JSON document on stdout")
    boolean json;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        Path file = input;
        if (Files.isDirectory(input)) {
            file = input.resolve(ReadingsFile.FILE_NAME);
            if (!Files.isRegularFile(file))
                throw new InputRejected(input, "no " + ReadingsFile.FILE_NAME + " in this folder",
                        "columns: what,where,value,unit,instrument,frequency_hz,inductance_uh,notes");
        }
        BenchReadings r = BenchReadings.assess(file.toString(), ReadingsFile.read(file));
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(r));
        } else {
            out.printf(Locale.ROOT, "%-4s %-18s %-8s %10s %-5s %8s %7s %9s %7s %9s %6s  %s%n", "line", "what", "where",
                    "value", "unit", "f_kHz", "L_uH", "median", "mod_z", "ideal", "ratio", "flag");
            for (BenchReadings.Row row : r.rows()) {
                out.printf(Locale.ROOT, "%-4d %-18s %-8s %10s %-5s %8s %7s %9s %7s %9s %6s  %s%n", row.line(),
                        cut(row.what(), 18), cut(row.where(), 8), java.math.BigDecimal.valueOf(row.value()).stripTrailingZeros().toPlainString(), row.unit(),
                        row.frequencyHz() == null ? "" : g(row.frequencyHz() / 1000), g(row.inductanceUh()),
                        g(row.groupMedian()), row.modifiedZ() == null ? "" : String.format(Locale.ROOT, "%.1f", row.modifiedZ()),
                        g(row.expected()), g(row.ratioToExpected()), row.outlier() ? "OUTLIER" : "");
            }
            out.println(r.findings().isEmpty() ? "Findings: none" : "Findings:");
            for (String f : r.findings()) out.println("  " + f);
        }
        out.flush();
        return Main.EXIT_OK;
    }

    private static String g(Double v) {
        if (v == null || !Double.isFinite(v)) return "";
        return new java.math.BigDecimal(v).round(new java.math.MathContext(3)).stripTrailingZeros().toPlainString();
    }

    private static String cut(String s, int n) {
        return s.length() <= n ? s : s.substring(0, n - 1) + "~";
    }
}
