package org.risetrace.batch;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;

import java.io.IOException;
import java.io.StringWriter;
import java.util.List;

/**
 * summary.csv: one record per series, RFC 4180 (Commons CSV's {@link CSVFormat#RFC4180}: comma, CRLF, quotes
 * where needed), numbers in full precision with a '.' decimal point, warnings joined by "; ", empty cells for
 * absent values.
 */
public final class SummaryCsv {
    public static final String FILE_NAME = "summary.csv";
    public static final String[] HEADER = {"series", "frames", "duration_s", "mode", "status", "designator",
            "rate_k_per_s", "separation_sigma", "warnings", "error", "report"};

    private SummaryCsv() {
    }

    public static String toCsv(List<SeriesSummary> rows) {
        StringWriter w = new StringWriter();
        try (CSVPrinter p = new CSVPrinter(w, CSVFormat.RFC4180.builder().setHeader(HEADER).build())) {
            for (SeriesSummary r : rows)
                p.printRecord(r.series(), text(r.frames()), text(r.durationS()), r.mode(), r.status(), r.designator(),
                        text(r.rateKPerS()), text(r.separationSigma()), String.join("; ", r.warnings()), r.error(),
                        r.report());
        } catch (IOException e) {
            throw new IllegalStateException(e); // a StringWriter does not fail
        }
        return w.toString();
    }

    private static String text(Number n) {
        if (n == null) return "";
        if (n instanceof Double d && !Double.isFinite(d)) return "";
        return String.valueOf(n);
    }
}
