package org.risetrace.board;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Builds a board's parts list from a placement (centroid) CSV as board-design tools export it: a header line with
 * designator, X, Y, rotation and side columns, possibly after title or comment lines; fields may be quoted; values
 * may carry a unit suffix (mm, mil). Placement coordinates are the CAD's (x right, y up by default); board
 * coordinates are ours (origin at the board's top-left corner, y down), so {@code origin} is the CAD coordinate of
 * the board's top-left corner. The outline is left for the user to mark on a reference frame.
 */
public final class PlacementImport {
    /** 1 mil = 0.0254 mm (a thousandth of an inch, exact by definition). */
    public static final double MM_PER_MIL = 0.0254;

    /** Footprint sizes by designator prefix when the CSV gives none, mm (0603 chips, small ICs: common practice). */
    public static final Map<String, double[]> DEFAULT_FOOTPRINTS = Map.of(
            "C", new double[]{1.6, 0.8}, "R", new double[]{1.6, 0.8}, "L", new double[]{4.0, 4.0},
            "D", new double[]{2.0, 1.2}, "Q", new double[]{3.0, 3.0}, "U", new double[]{5.0, 5.0});
    public static final double[] FALLBACK_FOOTPRINT = {2.0, 2.0};

    /** Kinds named after the designator letter (IEEE 315 / common practice). */
    private static final Map<String, String> KINDS = Map.of("C", "capacitor", "R", "resistor", "L", "inductor",
            "D", "diode", "Q", "transistor", "U", "ic", "FB", "ferrite", "F", "fuse", "Y", "crystal", "J", "connector");

    static final String[] DESIGNATOR_NAMES = {"designator", "ref", "refdes", "reference", "designators", "part"};
    static final String[] X_NAMES = {"x", "midx", "posx", "centerx", "centrex", "locationx", "refx", "xmm"};
    static final String[] Y_NAMES = {"y", "midy", "posy", "centery", "centrey", "locationy", "refy", "ymm"};
    static final String[] ROTATION_NAMES = {"rotation", "rot", "angle", "orientation"};
    static final String[] SIDE_NAMES = {"side", "layer", "tb", "mountside"};

    /**
     * @param designatorColumn column name, or null for the usual names (Designator, Ref, RefDes ...)
     * @param units            "mm" or "mil": unit of values without a suffix
     * @param originX          CAD x of the board's top-left corner, in {@code units}; null: 0
     * @param originY          CAD y of the board's top-left corner, in {@code units}; null: 0 with y down, the board
     *                         height with y up (CAD origin at the bottom-left corner)
     * @param yUp              CAD y grows upwards (usual for board design)
     * @param side             "top", "bottom" or "all"
     * @param footprints       size in mm by designator prefix (longest prefix wins), over the defaults
     * @param sizeMm           board size; null: from the parts' extent (a guess the user should check)
     */
    public record Options(String designatorColumn, String xColumn, String yColumn, String rotationColumn,
                          String sideColumn, String units, Double originX, Double originY, boolean yUp, String side,
                          Map<String, double[]> footprints, double[] sizeMm, String name) {
        public static Options defaults() {
            return new Options(null, null, null, null, null, "mm", null, null, true, "top", Map.of(), null, null);
        }
    }

    /** The imported board (no outline) and notes for the user. */
    public record Result(Board board, List<String> notes) {
    }

    private PlacementImport() {
    }

    private record Row(int line, String ref, double x, double y, double rot) {
    }

    /** Most lines a placement list may have, and the longest line (characters). */
    static final int MAX_LINES = 100_000, MAX_LINE_CHARS = 1 << 16;

    /** The file's lines: UTF-8, else ISO-8859-1 (older exporters); bounded in size, line count and line length. */
    private static List<String> lines(Path csv) {
        byte[] bytes = org.risetrace.frame.InputFiles.readDocument(csv, "placement file");
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(bytes)).toString();
        } catch (java.nio.charset.CharacterCodingException e) {
            text = new String(bytes, StandardCharsets.ISO_8859_1);
        }
        List<String> lines = new java.util.ArrayList<>();
        int start = 0;
        while (start < text.length()) {
            int end = text.indexOf('\n', start);
            if (end < 0) end = text.length();
            if (lines.size() >= MAX_LINES)
                throw new InputRejected(csv, "more than " + MAX_LINES + " lines", "is it a placement list?");
            if (end - start > MAX_LINE_CHARS)
                throw new InputRejected(csv, "line " + (lines.size() + 1) + " is longer than " + MAX_LINE_CHARS
                        + " characters", "is it a placement list?");
            String line = text.substring(start, end);
            lines.add(line.endsWith("\r") ? line.substring(0, line.length() - 1) : line);
            start = end + 1;
        }
        return lines;
    }

    public static Result read(Path csv, Options o) {
        List<String> lines = lines(csv);
        double unit = switch (o.units() == null ? "mm" : o.units().toLowerCase(Locale.ROOT)) {
            case "mm" -> 1.0;
            case "mil" -> MM_PER_MIL;
            default -> throw new InputRejected(csv, "units must be mm or mil, got " + o.units());
        };
        String side = o.side() == null ? "top" : o.side().toLowerCase(Locale.ROOT);
        if (!side.equals("top") && !side.equals("bottom") && !side.equals("all"))
            throw new InputRejected(csv, "side must be top, bottom or all, got " + o.side());

        // find the header: the first non-comment line naming designator, x and y columns
        int headerLine = -1;
        char delimiter = ',';
        int[] cols = null;
        for (int i = 0; i < lines.size() && headerLine < 0; i++) {
            String l = stripBom(lines.get(i)).trim();
            if (l.isEmpty() || isComment(l)) continue;
            char d = delimiterOf(l);
            List<String> fields = parseLine(l, d);
            int[] c = columns(fields, o);
            if (c[0] >= 0 && c[1] >= 0 && c[2] >= 0) { headerLine = i; delimiter = d; cols = c; }
        }
        if (headerLine < 0)
            throw new InputRejected(csv, "no header line with designator, X and Y columns",
                    "name them with --designator-col, --x-col, --y-col");
        List<String> notes = new ArrayList<>();
        if (o.sideColumn() == null && cols[4] < 0 && !side.equals("all"))
            notes.add("no side column: every part taken as " + side);

        List<Row> rows = new ArrayList<>();
        Map<String, Integer> seen = new HashMap<>();
        int skippedSide = 0;
        for (int i = headerLine + 1; i < lines.size(); i++) {
            String l = lines.get(i).trim();
            if (l.isEmpty() || isComment(l)) continue;
            List<String> f = parseLine(l, delimiter);
            int lineNo = i + 1;
            String ref = field(f, cols[0]);
            if (ref == null || ref.isBlank()) continue;
            if (BoardFile.hasControl(ref))
                throw new InputRejected(csv, "line " + lineNo + ": the designator holds a control character",
                        "designators are printed on terminals: letters, digits and punctuation only");
            if (cols[4] >= 0 && !side.equals("all")) {
                String s = field(f, cols[4]);
                String partSide = sideOf(s);
                if (partSide == null)
                    throw new InputRejected(csv, "line " + lineNo + ": side '" + s + "' of " + ref
                            + " is neither top nor bottom");
                if (!partSide.equals(side)) { skippedSide++; continue; }
            }
            double x = number(field(f, cols[1]), unit, delimiter, csv, lineNo, "X of " + ref);
            double y = number(field(f, cols[2]), unit, delimiter, csv, lineNo, "Y of " + ref);
            double rot = cols[3] >= 0 && field(f, cols[3]) != null && !field(f, cols[3]).isBlank()
                    ? angle(field(f, cols[3]), delimiter, csv, lineNo, ref) : 0.0;
            Integer before = seen.put(ref, lineNo);
            if (before != null)
                throw new InputRejected(csv, "line " + lineNo + ": designator " + ref + " repeats line " + before,
                        "every part needs its own designator");
            rows.add(new Row(lineNo, ref, x, y, rot));
        }
        if (skippedSide > 0) notes.add(skippedSide + " parts on the other side left out (--side all keeps them)");
        if (rows.isEmpty()) throw new InputRejected(csv, "no parts after the header line " + (headerLine + 1));

        Map<String, double[]> fp = new LinkedHashMap<>(DEFAULT_FOOTPRINTS);
        if (o.footprints() != null) fp.putAll(o.footprints());
        double[] size = o.sizeMm();
        double ox = o.originX() == null ? 0 : o.originX() * unit;
        List<double[]> extents = new ArrayList<>();
        for (Row r : rows) {
            double[] wh = footprint(r.ref(), fp);
            double a = Math.toRadians(r.rot());
            extents.add(new double[]{Math.abs(wh[0] / 2 * Math.cos(a)) + Math.abs(wh[1] / 2 * Math.sin(a)),
                    Math.abs(wh[0] / 2 * Math.sin(a)) + Math.abs(wh[1] / 2 * Math.cos(a)), wh[0], wh[1]});
        }
        if (size == null) {
            // a guess from the parts' extent from the CAD origin plus 1 mm: the user should give --size-mm
            double w = 0, h = 0;
            for (int i = 0; i < rows.size(); i++) {
                w = Math.max(w, rows.get(i).x() - ox + extents.get(i)[0]);
                double yy = o.yUp() ? rows.get(i).y() : rows.get(i).y() - (o.originY() == null ? 0 : o.originY() * unit);
                h = Math.max(h, yy + extents.get(i)[1]);
            }
            size = new double[]{Math.ceil(w + 1), Math.ceil(h + 1)};
            notes.add(String.format(Locale.ROOT, "board size guessed from the parts as %.0f x %.0f mm: give --size-mm",
                    size[0], size[1]));
        }
        double oy = o.originY() != null ? o.originY() * unit : (o.yUp() ? size[1] : 0);
        List<Part> parts = new ArrayList<>();
        for (int i = 0; i < rows.size(); i++) {
            Row r = rows.get(i);
            double bx = r.x() - ox, by = o.yUp() ? oy - r.y() : r.y() - oy;
            double[] e = extents.get(i);
            parts.add(new Part(r.ref(), kindOf(r.ref()), null, round(bx), round(by), e[2], e[3],
                    r.rot() == 0 ? null : r.rot()));
        }
        Board board = new Board(o.name() != null ? o.name() : stem(csv), size, null, parts, null);
        BoardFile.validate(board, csv, null, false);
        notes.add("outline not set: mark the board's four corners on a reference frame (README, board file)");
        return new Result(board, notes);
    }

    private static double round(double v) {
        return Math.round(v * 1e6) / 1e6;
    }

    private static String stem(Path p) {
        String n = p.getFileName().toString();
        int dot = n.lastIndexOf('.');
        return dot > 0 ? n.substring(0, dot) : n;
    }

    private static String stripBom(String s) {
        return s.startsWith("\uFEFF") ? s.substring(1) : s;
    }

    private static boolean isComment(String l) {
        return l.startsWith("#") || l.startsWith("//") || l.startsWith(";") || l.startsWith("--") || l.startsWith("==");
    }

    /** The most frequent of comma, semicolon and tab outside quotes. */
    static char delimiterOf(String l) {
        int comma = 0, semi = 0, tab = 0;
        boolean q = false;
        for (char c : l.toCharArray()) {
            if (c == '"') q = !q;
            else if (!q && c == ',') comma++;
            else if (!q && c == ';') semi++;
            else if (!q && c == '\t') tab++;
        }
        if (tab > comma && tab > semi) return '\t';
        if (semi > comma) return ';';
        return ',';
    }

    static List<String> parseLine(String line, char delimiter) {
        CSVFormat fmt = CSVFormat.DEFAULT.builder().setDelimiter(delimiter).setTrim(true)
                .setIgnoreSurroundingSpaces(true).build();
        try (CSVParser p = CSVParser.parse(line, fmt)) {
            List<CSVRecord> rs = p.getRecords();
            return rs.isEmpty() ? List.of() : rs.get(0).toList();
        } catch (IOException | java.io.UncheckedIOException | IllegalStateException e) {
            return List.of();
        }
    }

    private static String field(List<String> f, int i) {
        return i >= 0 && i < f.size() ? f.get(i) : null;
    }

    /** Header names compared without case, spaces, punctuation or a parenthesised unit: "Mid X (mm)" = "midx". */
    static String canon(String s) {
        return s.toLowerCase(Locale.ROOT).replaceAll("\\(.*?\\)|\\[.*?]", "").replaceAll("[^a-z0-9]", "");
    }

    private static int[] columns(List<String> header, Options o) {
        return new int[]{find(header, o.designatorColumn(), DESIGNATOR_NAMES), find(header, o.xColumn(), X_NAMES),
                find(header, o.yColumn(), Y_NAMES), find(header, o.rotationColumn(), ROTATION_NAMES),
                find(header, o.sideColumn(), SIDE_NAMES)};
    }

    private static int find(List<String> header, String given, String[] usual) {
        if (given != null) {
            for (int i = 0; i < header.size(); i++) if (header.get(i).equalsIgnoreCase(given.trim())) return i;
            for (int i = 0; i < header.size(); i++) if (canon(header.get(i)).equals(canon(given))) return i;
            return -1;
        }
        for (String u : usual)
            for (int i = 0; i < header.size(); i++) if (canon(header.get(i)).equals(u)) return i;
        return -1;
    }

    private static final Pattern NUMBER = Pattern.compile("^([-+]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][-+]?\\d+)?)\\s*(mm|mil|mils)?$");

    private static double number(String s, double unit, char delimiter, Path csv, int line, String what) {
        if (s == null || s.isBlank()) throw new InputRejected(csv, "line " + line + ": " + what + " is empty");
        String t = s.trim().toLowerCase(Locale.ROOT);
        if (delimiter == ';' && t.indexOf(',') >= 0 && t.indexOf('.') < 0) t = t.replace(',', '.');
        Matcher m = NUMBER.matcher(t);
        if (!m.matches()) throw new InputRejected(csv, "line " + line + ": " + what + " '" + s + "' is not a number");
        double v = Double.parseDouble(m.group(1));
        String u = m.group(2);
        if (u == null) return v * unit;
        return u.equals("mm") ? v : v * MM_PER_MIL;
    }

    private static double angle(String s, char delimiter, Path csv, int line, String ref) {
        String t = s.trim().replace("°", "").replaceAll("(?i)deg$", "").trim();
        if (delimiter == ';' && t.indexOf(',') >= 0 && t.indexOf('.') < 0) t = t.replace(',', '.');
        try {
            double a = Double.parseDouble(t);
            if (!Double.isFinite(a)) throw new NumberFormatException();
            return a;
        } catch (NumberFormatException e) {
            throw new InputRejected(csv, "line " + line + ": rotation '" + s + "' of " + ref + " is not a number");
        }
    }

    private static String sideOf(String s) {
        if (s == null) return null;
        String t = canon(s);
        if (t.startsWith("t") || t.startsWith("front") || t.equals("f")) return "top";
        if (t.startsWith("b") || t.equals("back")) return "bottom";
        return null;
    }

    private static String letters(String ref) {
        int i = 0;
        while (i < ref.length() && Character.isLetter(ref.charAt(i))) i++;
        return ref.substring(0, i).toUpperCase(Locale.ROOT);
    }

    private static double[] footprint(String ref, Map<String, double[]> fp) {
        String up = ref.toUpperCase(Locale.ROOT);
        String best = null;
        for (String k : fp.keySet())
            if (up.startsWith(k.toUpperCase(Locale.ROOT)) && (best == null || k.length() > best.length())) best = k;
        return best == null ? FALLBACK_FOOTPRINT : fp.get(best);
    }

    private static String kindOf(String ref) {
        return KINDS.get(letters(ref));
    }

    /** Parses "C=1.6x0.8" (prefix = width x height in mm). */
    public static Map.Entry<String, double[]> parseFootprint(String spec) {
        Matcher m = Pattern.compile("^\\s*([A-Za-z]+)\\s*=\\s*([0-9.]+)\\s*[xX*]\\s*([0-9.]+)\\s*$").matcher(spec);
        if (!m.matches()) throw new IllegalArgumentException("footprint must be PREFIX=WxH in mm, e.g. C=1.6x0.8: " + spec);
        double w = Double.parseDouble(m.group(2)), h = Double.parseDouble(m.group(3));
        if (!(w > 0 && h > 0)) throw new IllegalArgumentException("footprint sizes must be positive: " + spec);
        return Map.entry(m.group(1), new double[]{w, h});
    }
}
