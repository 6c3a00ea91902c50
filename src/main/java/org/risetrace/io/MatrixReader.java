package org.risetrace.io;

import org.risetrace.frame.InputRejected;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Locale;

/**
 * A text matrix of temperatures, one image row per line ({@code .csv} or {@code .tsv}).
 *
 * <p>Separator: tab if the first data line has one, else semicolon if it has one, else comma, else runs of
 * spaces. Decimal mark: a point, or a comma when the separator is tab, semicolon or space. A comma-separated file
 * cannot also use decimal commas (a value "23,5" would be two cells), so with comma separators the comma is always
 * a separator; such files then fail with "line N has M values" unless every row splits the same way, which is
 * why exporters pair decimal commas with semicolons. Blank lines and lines starting with {@code #} are skipped, a
 * separator at the end of a line is ignored, values may be in double quotes, and {@code NaN} marks a pixel without
 * a reading. Units come from the profile (matrix-celsius by default).
 */
public final class MatrixReader implements FrameReader {
    /** Largest text matrix, bytes: 64 MiB holds 4 M values of 16 characters (a 2048 x 2048 frame). */
    public static final long MAX_BYTES = 64L << 20;
    /** Longest line, characters: 65,536 values of 15 characters. */
    static final int MAX_LINE_CHARS = 1 << 20;

    @Override
    public String container() {
        return "csv";
    }

    @Override
    public boolean accepts(Path file, byte[] head) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        if (!name.endsWith(".csv") && !name.endsWith(".tsv")) return false;
        for (int i = 0; i < Math.min(head.length, 512); i++) if (head[i] == 0) return false; // binary
        return true;
    }

    @Override
    public RawSamples decode(Path file, byte[] bytes, ReadContext context) {
        String text = new String(bytes, StandardCharsets.UTF_8);
        if (text.startsWith("\uFEFF")) text = text.substring(1);
        if (bytes.length > MAX_BYTES)
            throw new InputRejected(file, "text matrix of " + bytes.length + " bytes is larger than " + (MAX_BYTES >> 20)
                    + " MiB");
        char sep = 0;
        boolean decimalComma = false;
        int width = -1, firstLine = -1, rows = 0;
        float[] values = new float[1024];
        int n = 0;
        // line by line without splitting the whole text (a file of blank lines would otherwise make millions of
        // strings at once)
        int li = -1;
        for (int start = 0; start <= text.length(); ) {
            li++;
            int end = text.indexOf('\n', start);
            if (end < 0) end = text.length();
            if (end - start > MAX_LINE_CHARS)
                throw new InputRejected(file, "line " + (li + 1) + " is longer than " + MAX_LINE_CHARS + " characters",
                        "a text matrix holds one image row per line");
            String line = text.substring(start, end);
            start = end + 1;
            if (line.endsWith("\r")) line = line.substring(0, line.length() - 1);
            String trimmed = line.strip();
            if (trimmed.isEmpty() || trimmed.startsWith("#")) continue;
            if (sep == 0) {
                sep = trimmed.indexOf('\t') >= 0 ? '\t' : trimmed.indexOf(';') >= 0 ? ';'
                        : trimmed.indexOf(',') >= 0 ? ',' : ' ';
                decimalComma = sep != ',';
            }
            String[] cells = sep == ' ' ? trimmed.split(" +") : line.split(sep == '\t' ? "\t" : String.valueOf(sep), -1);
            int count = cells.length;
            if (count > 1 && cells[count - 1].isBlank()) count--; // trailing separator
            if (width < 0) {
                width = count;
                firstLine = li + 1;
            } else if (count != width) {
                throw new InputRejected(file, "line " + (li + 1) + " has " + count + " values, line " + firstLine
                        + " has " + width, "every image row must have the same number of values");
            }
            rows++;
            ImageIoDecoding.checkPixelsSoFar(file, width, rows, context.maxPixels());
            if (n + count > values.length) {
                float[] bigger = new float[Math.max(values.length * 2, n + count)];
                System.arraycopy(values, 0, bigger, 0, n);
                values = bigger;
            }
            for (int ci = 0; ci < count; ci++) values[n++] = parse(file, cells[ci], li + 1, ci + 1, decimalComma);
        }
        if (width <= 0) throw new InputRejected(file, "no numbers in the text matrix");
        float[] exact = n == values.length ? values : java.util.Arrays.copyOf(values, n);
        String sepName = switch (sep) {
            case '\t' -> "tab";
            case ';' -> "semicolon";
            case ',' -> "comma";
            default -> "space";
        };
        return RawSamples.text(width, rows, exact, sepName + "-separated" + (decimalComma ? ", decimal comma allowed" : ""));
    }

    private static float parse(Path file, String cell, int line, int column, boolean decimalComma) {
        String s = cell.strip();
        if (s.length() >= 2 && s.startsWith("\"") && s.endsWith("\"")) s = s.substring(1, s.length() - 1).strip();
        if (s.isEmpty()) throw new InputRejected(file, "empty value at line " + line + ", column " + column);
        if (decimalComma) s = s.replace(',', '.');
        if (s.equalsIgnoreCase("nan")) return Float.NaN;
        char c0 = s.charAt(0);
        if (!(c0 == '-' || c0 == '+' || c0 == '.' || (c0 >= '0' && c0 <= '9')))
            throw notNumber(file, cell, line, column);
        try {
            return (float) Double.parseDouble(s);
        } catch (NumberFormatException e) {
            throw notNumber(file, cell, line, column);
        }
    }

    private static InputRejected notNumber(Path file, String cell, int line, int column) {
        String shown = cell.strip();
        if (shown.length() > 20) shown = shown.substring(0, 20) + "...";
        return new InputRejected(file, "'" + shown + "' at line " + line + ", column " + column + " is not a number");
    }
}
