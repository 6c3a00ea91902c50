package org.risetrace.report;

import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.RiseCurve;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.math.BigDecimal;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;

/**
 * parts.csv: one row per used frame, {@code t_s} then each part's rise above ambient in kelvin, parts in rank order,
 * designators in the header row. RFC 4180: CRLF line ends, fields holding a comma, double quote or line break are
 * quoted with inner quotes doubled. Decimal point '.', whatever the machine's locale. A part without a value at a
 * frame time gets an empty cell. A designator starting with = + - @ is prefixed with ' so a spreadsheet does not run
 * it as a formula (OWASP, "CSV Injection").
 */
public final class PartsCsv {
    private PartsCsv() { }

    public static void write(Analysis analysis, Path file) {
        try {
            Files.writeString(file, toCsv(analysis), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }

    public static String toCsv(Analysis analysis) {
        List<PartResult> parts = analysis.result() == null || analysis.result().parts() == null
                ? List.of() : analysis.result().parts();
        return toCsv(inRankOrder(analysis.curves(), parts));
    }

    /** Curves sorted by the rank in {@code parts}; curves of parts not ranked keep their order after the ranked. */
    static List<RiseCurve> inRankOrder(List<RiseCurve> curves, List<PartResult> parts) {
        Map<String, Integer> rank = new HashMap<>();
        for (PartResult p : parts) rank.put(p.ref(), p.rank());
        List<RiseCurve> sorted = new ArrayList<>(curves == null ? List.of() : curves);
        sorted.sort(Comparator.comparingInt(c -> rank.getOrDefault(c.ref(), Integer.MAX_VALUE)));
        return sorted;
    }

    /** The CSV text of these curves in the given column order. */
    public static String toCsv(List<RiseCurve> curves) {
        TreeSet<Double> times = new TreeSet<>();
        List<Map<Double, Double>> byTime = new ArrayList<>();
        for (RiseCurve c : curves) {
            Map<Double, Double> m = new HashMap<>();
            int n = c.tS() == null || c.riseK() == null ? 0 : Math.min(c.tS().length, c.riseK().length);
            for (int i = 0; i < n; i++) {
                if (Double.isNaN(c.tS()[i])) continue;
                times.add(c.tS()[i]);
                m.put(c.tS()[i], c.riseK()[i]);
            }
            byTime.add(m);
        }
        StringBuilder sb = new StringBuilder();
        sb.append("t_s");
        for (RiseCurve c : curves) sb.append(',').append(field(c.ref()));
        sb.append("\r\n");
        for (double t : times) {
            sb.append(number(t, 3));
            for (Map<Double, Double> m : byTime) {
                sb.append(',');
                Double v = m.get(t);
                if (v != null && Double.isFinite(v)) sb.append(number(v, 4));
            }
            sb.append("\r\n");
        }
        return sb.toString();
    }

    /** Plain decimal with at most {@code decimals} places, no exponent, '.' as decimal point. */
    static String number(double v, int decimals) {
        BigDecimal d = BigDecimal.valueOf(v).setScale(decimals, RoundingMode.HALF_EVEN).stripTrailingZeros();
        if (d.signum() == 0) return "0";
        return d.toPlainString();
    }

    /** One text field, RFC 4180 section 2 rules 5-7, with the OWASP formula guard. */
    static String field(String s) {
        if (s == null) return "";
        if (!s.isEmpty() && "=+-@\t\r".indexOf(s.charAt(0)) >= 0) s = "'" + s;
        boolean quote = s.indexOf(',') >= 0 || s.indexOf('"') >= 0 || s.indexOf('\n') >= 0 || s.indexOf('\r') >= 0;
        return quote ? '"' + s.replace("\"", "\"\"") + '"' : s;
    }
}
