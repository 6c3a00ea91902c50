package org.risetrace.planning;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.math.BigDecimal;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Reads bench meter readings from a CSV file (RFC 4180: comma-separated, double quotes around fields holding
 * commas; lines starting with # are comments). The first line names the columns, in any order:
 * {@code what, where, value, unit} (required) and {@code instrument, frequency_hz, inductance_uh, notes}
 * (optional). Every problem is refused naming the file, the line and the field.
 */
public final class ReadingsFile {
    /** The readings file in a series folder. */
    public static final String FILE_NAME = Series.BENCH_READINGS_FILE;
    static final List<String> REQUIRED = List.of("what", "where", "value", "unit");
    static final List<String> KNOWN = List.of("what", "where", "value", "unit", "instrument", "frequency_hz",
            "inductance_uh", "notes");
    /** A table typed at the bench is small; a bigger file is not a readings file. */
    static final long MAX_BYTES = 1 << 20;

    private ReadingsFile() {
    }

    /** The readings of a series folder's readings.csv, or null when the folder has none. */
    public static List<BenchReading> readIfPresent(Path seriesFolder) {
        Path f = seriesFolder.resolve(FILE_NAME);
        return Files.isRegularFile(f) ? read(f) : null;
    }

    public static List<BenchReading> read(Path file) {
        String text;
        try {
            if (Files.size(file) > MAX_BYTES)
                throw new InputRejected(file, "larger than 1 MiB: not a table of bench readings");
            byte[] bytes = Files.readAllBytes(file);
            text = StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(bytes)).toString();
        } catch (NoSuchFileException e) {
            throw new InputRejected(file, "readings file not found");
        } catch (CharacterCodingException e) {
            throw new InputRejected(file, "not UTF-8 text", "save the table as CSV in UTF-8");
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read: " + e.getMessage(), null, e);
        }
        if (text.startsWith("\uFEFF")) text = text.substring(1);
        return parse(text, file);
    }

    static List<BenchReading> parse(String text, Path file) {
        text = withoutComments(text);
        int[] lineStarts = lineStarts(text);
        CSVFormat fmt = CSVFormat.DEFAULT.builder().setTrim(true).setIgnoreEmptyLines(true).build();
        List<CSVRecord> records;
        try (CSVParser p = CSVParser.parse(text, fmt)) {
            records = p.getRecords();
        } catch (IOException | UncheckedIOException | IllegalStateException e) {
            throw new InputRejected(file, "not a CSV table: " + oneLine(e.getMessage()));
        }
        if (records.isEmpty()) throw new InputRejected(file, "empty: no header line", "first line: " + String.join(",", REQUIRED));
        CSVRecord header = records.get(0);
        int headerLine = lineOf(lineStarts, text, header.getCharacterPosition());
        Map<String, Integer> col = new HashMap<>();
        for (int i = 0; i < header.size(); i++) {
            String name = header.get(i).toLowerCase(Locale.ROOT);
            if (!KNOWN.contains(name))
                throw new InputRejected(file, "line " + headerLine + ": unknown column '" + header.get(i) + "'",
                        "known columns: " + String.join(", ", KNOWN));
            if (col.put(name, i) != null)
                throw new InputRejected(file, "line " + headerLine + ": column '" + name + "' appears twice");
        }
        for (String r : REQUIRED)
            if (!col.containsKey(r))
                throw new InputRejected(file, "line " + headerLine + ": no column '" + r + "'",
                        "the header needs " + String.join(", ", REQUIRED));
        List<BenchReading> out = new ArrayList<>();
        for (CSVRecord rec : records.subList(1, records.size())) {
            if (rec.stream().allMatch(String::isBlank)) continue; // a line of blanks
            int line = lineOf(lineStarts, text, rec.getCharacterPosition());
            if (rec.size() > header.size())
                throw new InputRejected(file, "line " + line + ": " + rec.size() + " fields, the header has " + header.size());
            String what = required(rec, col, "what", file, line);
            String where = required(rec, col, "where", file, line);
            String valueText = required(rec, col, "value", file, line);
            double value = number(valueText, file, line, "value");
            String unit = required(rec, col, "unit", file, line);
            String instrument = optional(rec, col, "instrument");
            String f = optional(rec, col, "frequency_hz");
            Double frequencyHz = f == null ? null : positive(f, file, line, "frequency_hz");
            String l = optional(rec, col, "inductance_uh");
            Double inductanceUh = l == null ? null : positive(l, file, line, "inductance_uh");
            if (inductanceUh != null && frequencyHz == null && Units.of(unit).base().equals("ohm"))
                throw new InputRejected(file, "line " + line + ", field 'frequency_hz': an impedance reading with "
                        + "inductance_uh needs the meter's test frequency", "e.g. 100000 for a 100 kHz meter");
            out.add(new BenchReading(line, what, where, valueText, value, unit, instrument, frequencyHz, inductanceUh,
                    optional(rec, col, "notes")));
        }
        if (out.isEmpty()) throw new InputRejected(file, "no readings after the header (line " + headerLine + ")");
        return out;
    }

    private static String required(CSVRecord rec, Map<String, Integer> col, String name, Path file, int line) {
        String v = optional(rec, col, name);
        if (v == null) throw new InputRejected(file, "line " + line + ", field '" + name + "': empty");
        return v;
    }

    private static String optional(CSVRecord rec, Map<String, Integer> col, String name) {
        Integer i = col.get(name);
        if (i == null || i >= rec.size()) return null;
        String v = rec.get(i).strip();
        return v.isEmpty() ? null : v;
    }

    private static double number(String s, Path file, int line, String field) {
        try {
            double v = new BigDecimal(s).doubleValue();
            if (Double.isFinite(v)) return v;
        } catch (NumberFormatException ignored) {
            // refused below
        }
        throw new InputRejected(file, "line " + line + ", field '" + field + "': '" + s + "' is not a number",
                s.contains(",") ? "use a point for decimals" : null);
    }

    private static double positive(String s, Path file, int line, String field) {
        double v = number(s, file, line, field);
        if (!(v > 0)) throw new InputRejected(file, "line " + line + ", field '" + field + "': must be above 0, got " + s);
        return v;
    }

    /**
     * Comment lines (first non-blank character #) emptied, keeping every line break: commons-csv's own comment
     * handling shifts the record positions we count lines from.
     */
    static String withoutComments(String text) {
        String[] lines = text.split("\n", -1);
        for (int i = 0; i < lines.length; i++) if (lines[i].strip().startsWith("#")) lines[i] = "";
        return String.join("\n", lines);
    }

    private static int[] lineStarts(String text) {
        List<Integer> starts = new ArrayList<>();
        starts.add(0);
        for (int i = 0; i < text.length(); i++) if (text.charAt(i) == '\n') starts.add(i + 1);
        return starts.stream().mapToInt(Integer::intValue).toArray();
    }

    /** The line a record starts on; commons-csv gives the position before the empty lines it skipped. */
    private static int lineOf(int[] starts, String text, long position) {
        int pos = (int) position;
        while (pos < text.length() && Character.isWhitespace(text.charAt(pos))) pos++;
        int k = Arrays.binarySearch(starts, pos);
        return (k >= 0 ? k : -k - 2) + 1;
    }

    private static String oneLine(String s) {
        return s == null ? "" : s.replaceAll("\\s+", " ").strip();
    }
}
