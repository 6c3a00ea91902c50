package org.risetrace.report;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.RiseCurve;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** parts.csv against RFC 4180 ("Common Format and MIME Type for Comma-Separated Values (CSV) Files"). */
class PartsCsvTest {

    /** A strict reader of RFC 4180 section 2 (CRLF records, optional quotes, "" inside quotes). */
    static List<List<String>> parse(String text) {
        List<List<String>> rows = new ArrayList<>();
        List<String> row = new ArrayList<>();
        StringBuilder field = new StringBuilder();
        int i = 0;
        boolean quoted = false, wasQuoted = false;
        while (i < text.length()) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"' && i + 1 < text.length() && text.charAt(i + 1) == '"') { field.append('"'); i += 2; continue; }
                if (c == '"') { quoted = false; i++; continue; }
                field.append(c);
                i++;
                continue;
            }
            if (c == '"' && field.length() == 0 && !wasQuoted) { quoted = true; wasQuoted = true; i++; continue; }
            if (c == ',') { row.add(field.toString()); field.setLength(0); wasQuoted = false; i++; continue; }
            if (c == '\r') {
                if (i + 1 >= text.length() || text.charAt(i + 1) != '\n') throw new AssertionError("CR without LF at " + i);
                row.add(field.toString()); field.setLength(0); wasQuoted = false;
                rows.add(row); row = new ArrayList<>();
                i += 2;
                continue;
            }
            if (c == '\n') throw new AssertionError("bare LF at " + i + " (RFC 4180 2.1 wants CRLF)");
            if (c == '"') throw new AssertionError("quote inside an unquoted field at " + i + " (RFC 4180 2.5)");
            field.append(c);
            i++;
        }
        if (field.length() > 0 || !row.isEmpty()) { row.add(field.toString()); rows.add(row); }
        return rows;
    }

    @Test
    void oneRowPerFrameWithPartsInRankOrder(@TempDir Path dir) throws Exception {
        Analysis a = DemoAnalysis.build();
        Path file = dir.resolve("parts.csv");
        PartsCsv.write(a, file);
        String text = Files.readString(file, StandardCharsets.UTF_8);
        List<List<String>> rows = parse(text);
        // header row (RFC 4180 2.3) plus one record per frame
        assertEquals(DemoAnalysis.FRAMES + 1, rows.size());
        List<String> header = rows.get(0);
        assertEquals("t_s", header.get(0));
        List<String> expected = new ArrayList<>();
        a.result().parts().stream().sorted((p, q) -> Integer.compare(p.rank(), q.rank())).forEach(p -> expected.add(p.ref()));
        assertEquals(expected, header.subList(1, header.size()));
        for (int r = 1; r < rows.size(); r++) {
            // RFC 4180 2.4: each record has the same number of fields as the header
            assertEquals(header.size(), rows.get(r).size());
            assertEquals(DemoAnalysis.INTERVAL_S * (r - 1), Double.parseDouble(rows.get(r).get(0)), 1e-9);
        }
        // values round to 0.1 mK; compare with the curves they came from
        RiseCurve q3 = a.curves().get(0);
        for (int i = 0; i < q3.tS().length; i++)
            assertEquals(q3.riseK()[i], Double.parseDouble(rows.get(i + 1).get(1)), 0.5e-4);
    }

    @Test
    void decimalPointIsADotInAnyLocale() {
        Locale before = Locale.getDefault();
        try {
            Locale.setDefault(Locale.GERMANY);  // decimal comma there
            String csv = PartsCsv.toCsv(List.of(new RiseCurve("Q1", new double[]{0.5, 1.5}, new double[]{1.25, -0.0625},
                    null, null, null)));
            assertEquals("t_s,Q1\r\n0.5,1.25\r\n1.5,-0.0625\r\n", csv);
        } finally {
            Locale.setDefault(before);
        }
    }

    @Test
    void missingValuesAreEmptyCells() {
        RiseCurve a = new RiseCurve("U1", new double[]{0, 1, 2}, new double[]{0.1, Double.NaN, 0.3}, null, null, null);
        RiseCurve b = new RiseCurve("U2", new double[]{0, 2}, new double[]{0.2, 0.4}, null, null, null);
        List<List<String>> rows = parse(PartsCsv.toCsv(List.of(a, b)));
        assertEquals(List.of("t_s", "U1", "U2"), rows.get(0));
        assertEquals(List.of("0", "0.1", "0.2"), rows.get(1));
        assertEquals(List.of("1", "", ""), rows.get(2));
        assertEquals(List.of("2", "0.3", "0.4"), rows.get(3));
    }

    @Test
    void designatorsAreQuotedPerRfc4180() {
        RiseCurve comma = new RiseCurve("R1,R2", new double[]{0}, new double[]{1}, null, null, null);
        RiseCurve quote = new RiseCurve("Q\"7", new double[]{0}, new double[]{2}, null, null, null);
        RiseCurve plain = new RiseCurve("C3", new double[]{0}, new double[]{3}, null, null, null);
        String csv = PartsCsv.toCsv(List.of(comma, quote, plain));
        // RFC 4180 2.6: fields containing commas or double quotes are enclosed in double quotes;
        // 2.7: a double quote inside is escaped by preceding it with another double quote
        assertTrue(csv.startsWith("t_s,\"R1,R2\",\"Q\"\"7\",C3\r\n"), csv);
        assertEquals(List.of("t_s", "R1,R2", "Q\"7", "C3"), parse(csv).get(0));
    }

    @Test
    void designatorsCannotRunAsSpreadsheetFormulas() {
        // OWASP "CSV Injection": cells starting with = + - @ are prefixed with a single quote
        RiseCurve evil = new RiseCurve("=1+2", new double[]{0}, new double[]{1}, null, null, null);
        List<List<String>> rows = parse(PartsCsv.toCsv(List.of(evil)));
        assertEquals("'=1+2", rows.get(0).get(1));
        // and the other formula starts (OWASP lists = + - @), also behind a rise column
        for (String start : new String[]{"+", "-", "@"}) {
            RiseCurve c = new RiseCurve(start + "A1", new double[]{0}, new double[]{1}, null, null, null);
            assertEquals("'" + start + "A1", parse(PartsCsv.toCsv(List.of(c))).get(0).get(1), start);
        }
    }

    @Test
    void numbersAreWrittenWithoutExponent() {
        assertEquals("0.0001", PartsCsv.number(1e-4, 4));
        assertEquals("0", PartsCsv.number(-1e-9, 4));
        assertEquals("12345.5", PartsCsv.number(12345.5, 3));
    }
}
