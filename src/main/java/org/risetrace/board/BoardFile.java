package org.risetrace.board;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Reads and writes {@code board.json}, validating it once at the boundary: every error names the file and the
 * field (and for malformed JSON the line and column).
 */
public final class BoardFile {
    /** Largest board side, mm: 2 m, beyond any board a thermal camera images whole (and far from overflow). */
    public static final double MAX_SIZE_MM = 2000;
    /** Largest outline coordinate, frame pixels: far outside any frame the import takes. */
    public static final double MAX_CORNER_PX = 1e6;

    /** Tolerance for parts touching the board edge, mm. */
    private static final double EDGE_TOLERANCE_MM = 1e-6;

    private static final ObjectMapper MAPPER = org.risetrace.frame.StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
            .enable(SerializationFeature.INDENT_OUTPUT).build();

    private BoardFile() {
    }

    /** Builds the board file's JSON reader ahead of the first file (see {@code Sidecars.warmUp}). Never fails. */
    public static void warmUp() {
        try {
            MAPPER.readTree("{}");
            MAPPER.readValue("{}", Board.class);
        } catch (Exception | LinkageError ignored) {
            // only a head start: read() reads (and reports) on its own
        }
    }

    /**
     * Reads and validates a board file, outline included.
     *
     * @param knownMaterialsOrNull material names parts may use; null skips that check
     */
    public static Board read(Path file, Set<String> knownMaterialsOrNull) {
        Board board = parse(file);
        validate(board, file, knownMaterialsOrNull, true);
        return board;
    }

    /** Reads and validates a board file that may still lack its outline (e.g. straight from placement import). */
    public static Board readWithoutOutline(Path file, Set<String> knownMaterialsOrNull) {
        Board board = parse(file);
        validate(board, file, knownMaterialsOrNull, false);
        return board;
    }

    public static void write(Board board, Path file) {
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) Files.createDirectories(parent);
            Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
            MAPPER.writeValue(tmp.toFile(), board);
            Files.move(tmp, file, java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot write board file: " + e.getMessage(), null, e);
        }
    }

    /** JSON text of a board, as written to a file. */
    public static String toJson(Board board) {
        try {
            return MAPPER.writeValueAsString(board);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static Board parse(Path file) {
        if (!Files.exists(file)) throw new InputRejected(file, "board file not found", "give the path to board.json");
        byte[] bytes = org.risetrace.frame.InputFiles.readDocument(file, "board file");
        JsonNode tree;
        Board board;
        try {
            tree = MAPPER.readTree(bytes);
            if (tree == null || !tree.isObject())
                throw new InputRejected(file, "board file must hold one JSON object", "see README, board file");
            board = MAPPER.readValue(bytes, Board.class);
        } catch (UnrecognizedPropertyException e) {
            throw new InputRejected(file, "unknown field '" + pathOf(e) + "'" + at(e.getLocation()),
                    "known fields: " + e.getKnownPropertyIds(), e);
        } catch (JsonMappingException e) {
            throw new InputRejected(file, "field '" + pathOf(e) + "' has the wrong type" + at(e.getLocation())
                    + ": " + org.risetrace.frame.StrictJson.plainProblem(e), "see README, board file", e);
        } catch (JsonProcessingException e) {
            String dup = org.risetrace.frame.StrictJson.duplicateKey(e);
            if (dup != null) throw new InputRejected(file, dup, "give each field once");
            throw new InputRejected(file, "malformed JSON" + at(e.getLocation()) + ": "
                    + org.risetrace.frame.StrictJson.plainProblem(e), null, e);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read board file: " + e.getMessage(), null, e);
        }
        requirePresent(tree, file);
        return board;
    }

    private static String at(JsonLocation loc) {
        if (loc == null || loc.getLineNr() < 0) return "";
        return " at line " + loc.getLineNr() + ", column " + loc.getColumnNr();
    }

    private static String pathOf(JsonMappingException e) {
        StringBuilder sb = new StringBuilder();
        for (JsonMappingException.Reference r : e.getPath()) {
            if (r.getFieldName() != null) {
                if (sb.length() > 0) sb.append('.');
                sb.append(r.getFieldName());
            } else if (r.getIndex() >= 0) {
                sb.append('[').append(r.getIndex()).append(']');
            }
        }
        return sb.toString();
    }

    /** Records give 0 or null for a missing field; the tree tells which fields were really written. */
    private static void requirePresent(JsonNode tree, Path file) {
        need(tree, "size_mm", "", file);
        JsonNode parts = tree.get("parts");
        if (parts != null && parts.isArray()) {
            for (int i = 0; i < parts.size(); i++) {
                for (String f : new String[]{"ref", "x_mm", "y_mm", "w_mm", "h_mm"})
                    need(parts.get(i), f, "parts[" + i + "].", file);
            }
        }
        JsonNode ambient = tree.get("ambient");
        if (ambient != null && ambient.isArray()) {
            for (int i = 0; i < ambient.size(); i++)
                for (String f : new String[]{"x_mm", "y_mm", "w_mm", "h_mm"})
                    need(ambient.get(i), f, "ambient[" + i + "].", file);
        }
        JsonNode outline = tree.get("outline");
        if (outline != null && outline.isObject()) {
            need(outline, "frame", "outline.", file);
            need(outline, "corners_px", "outline.", file);
        }
    }

    private static void need(JsonNode node, String field, String prefix, Path file) {
        if (node == null || !node.isObject() || !node.hasNonNull(field))
            throw new InputRejected(file, "missing field '" + prefix + field + "'", "see README, board file");
    }

    static void validate(Board b, Path file, Set<String> materials, boolean needOutline) {
        double[] size = b.sizeMm();
        if (size == null || size.length != 2)
            throw new InputRejected(file, "field 'size_mm' must be [width, height] in mm");
        for (double v : size)
            if (!Double.isFinite(v) || v <= 0)
                throw new InputRejected(file, "field 'size_mm' must hold two positive sizes, got "
                        + java.util.Arrays.toString(size));
        for (double v : size)
            if (v > MAX_SIZE_MM)
                throw new InputRejected(file, "field 'size_mm' must be at most " + (int) MAX_SIZE_MM + " mm a side, got "
                        + java.util.Arrays.toString(size), "sizes are in millimetres");
        double w = size[0], h = size[1];
        Outline o = b.outline();
        if (o == null) {
            if (needOutline)
                throw new InputRejected(file, "missing field 'outline'",
                        "mark the board's four corners on a reference frame (README, board file)");
        } else {
            if (o.frame() == null || o.frame().isBlank())
                throw new InputRejected(file, "field 'outline.frame' must name the reference frame's file");
            checkCorners(o.cornersPx(), "outline.corners_px", file);
            if (o.frames() != null)
                for (Map.Entry<String, double[][]> e : o.frames().entrySet())
                    checkCorners(e.getValue(), "outline.frames." + e.getKey(), file);
        }
        Set<String> refs = new HashSet<>();
        List<Part> parts = b.partsOrEmpty();
        for (int i = 0; i < parts.size(); i++) {
            Part p = parts.get(i);
            String f = "parts[" + i + "]";
            if (p == null) throw new InputRejected(file, "field '" + f + "' is null");
            if (p.ref() == null || p.ref().isBlank())
                throw new InputRejected(file, "field '" + f + ".ref' is empty");
            if (hasControl(p.ref()))
                throw new InputRejected(file, "field '" + f + ".ref' holds a control character",
                        "designators are printed on terminals: letters, digits and punctuation only");
            f = "parts[" + i + "] (" + p.ref() + ")";
            if (!refs.add(p.ref()))
                throw new InputRejected(file, "duplicate designator '" + p.ref() + "' in " + f + ".ref",
                        "every part needs its own designator");
            finite(p.xMm(), f + ".x_mm", file);
            finite(p.yMm(), f + ".y_mm", file);
            positive(p.wMm(), f + ".w_mm", file);
            positive(p.hMm(), f + ".h_mm", file);
            if (p.rotationDeg() != null) finite(p.rotationDeg(), f + ".rotation_deg", file);
            if (p.material() != null && materials != null && !materials.contains(p.material()))
                throw new InputRejected(file, "unknown material '" + p.material() + "' in " + f + ".material",
                        "known materials: " + new java.util.TreeSet<>(materials));
            double a = Math.toRadians(p.rotationOrZero());
            double ex = Math.abs(p.wMm() / 2 * Math.cos(a)) + Math.abs(p.hMm() / 2 * Math.sin(a));
            double ey = Math.abs(p.wMm() / 2 * Math.sin(a)) + Math.abs(p.hMm() / 2 * Math.cos(a));
            if (p.xMm() - ex < -EDGE_TOLERANCE_MM || p.xMm() + ex > w + EDGE_TOLERANCE_MM
                    || p.yMm() - ey < -EDGE_TOLERANCE_MM || p.yMm() + ey > h + EDGE_TOLERANCE_MM)
                throw new InputRejected(file, "part " + p.ref() + " in " + f + " lies outside the board ("
                        + w + " x " + h + " mm)", "board coordinates start at the top-left corner, y down");
        }
        List<Area> ambient = b.ambientOrEmpty();
        for (int i = 0; i < ambient.size(); i++) {
            Area ar = ambient.get(i);
            String f = "ambient[" + i + "]";
            if (ar == null) throw new InputRejected(file, "field '" + f + "' is null");
            finite(ar.xMm(), f + ".x_mm", file);
            finite(ar.yMm(), f + ".y_mm", file);
            positive(ar.wMm(), f + ".w_mm", file);
            positive(ar.hMm(), f + ".h_mm", file);
            if (ar.xMm() - ar.wMm() / 2 < -EDGE_TOLERANCE_MM || ar.xMm() + ar.wMm() / 2 > w + EDGE_TOLERANCE_MM
                    || ar.yMm() - ar.hMm() / 2 < -EDGE_TOLERANCE_MM || ar.yMm() + ar.hMm() / 2 > h + EDGE_TOLERANCE_MM)
                throw new InputRejected(file, "ambient area " + f + " lies outside the board");
            String under = partUnder(ar, b.partsOrEmpty());
            if (under != null)
                throw new InputRejected(file, "ambient area " + f + " overlaps part " + under
                        + ": the background reading would heat with the part and cancel its rise",
                        "place ambient areas on bare board away from the parts");
        }
    }

    /**
     * The first part whose footprint covers any of a 40 x 40 lattice of points inside the area (cell centres), or
     * null. A lattice, not an exact rectangle intersection: parts may be rotated, and a sliver of overlap under a
     * fortieth of the area's side does not move a median of the background.
     */
    static String partUnder(Area ar, List<Part> parts) {
        int n = 40;
        for (Part p : parts) {
            if (p == null) continue;
            for (int j = 0; j < n; j++)
                for (int i = 0; i < n; i++) {
                    double x = ar.xMm() - ar.wMm() / 2 + (i + 0.5) * ar.wMm() / n;
                    double y = ar.yMm() - ar.hMm() / 2 + (j + 0.5) * ar.hMm() / n;
                    if (p.contains(x, y)) return p.ref();
                }
        }
        return null;
    }

    /** C0 and C1 control characters and DEL: a terminal acts on them (ESC sequences, BEL). */
    static boolean hasControl(String s) {
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c < 0x20 || (c >= 0x7F && c < 0xA0)) return true;
        }
        return false;
    }

    private static void finite(double v, String field, Path file) {
        if (!Double.isFinite(v)) throw new InputRejected(file, "field '" + field + "' must be a finite number");
    }

    private static void positive(double v, String field, Path file) {
        if (!Double.isFinite(v) || v <= 0)
            throw new InputRejected(file, "field '" + field + "' must be a positive size in mm, got " + v);
    }

    /**
     * Four corners, top-left, top-right, bottom-right, bottom-left, forming a convex quadrilateral that does not
     * cross itself. With y down that order turns clockwise on screen: every cross product of consecutive edges
     * is positive.
     */
    static void checkCorners(double[][] c, String field, Path file) {
        if (c == null || c.length != 4)
            throw new InputRejected(file, "field '" + field + "' must hold four corners [[x,y],...]",
                    "order: top-left, top-right, bottom-right, bottom-left");
        for (int i = 0; i < 4; i++) {
            if (c[i] == null || c[i].length != 2 || !Double.isFinite(c[i][0]) || !Double.isFinite(c[i][1]))
                throw new InputRejected(file, "field '" + field + "[" + i + "]' must be [x, y] in pixels");
            if (Math.abs(c[i][0]) > MAX_CORNER_PX || Math.abs(c[i][1]) > MAX_CORNER_PX)
                throw new InputRejected(file, "field '" + field + "[" + i + "]' lies more than " + (long) MAX_CORNER_PX
                        + " pixels from the frame", "corners are in frame pixels");
        }
        int positive = 0, negative = 0;
        for (int i = 0; i < 4; i++) {
            double[] a = c[i], p = c[(i + 1) % 4], q = c[(i + 2) % 4];
            double cross = (p[0] - a[0]) * (q[1] - p[1]) - (p[1] - a[1]) * (q[0] - p[0]);
            if (cross > 0) positive++;
            else if (cross < 0) negative++;
        }
        if (positive == 4) return;
        if (negative == 4)
            throw new InputRejected(file, "field '" + field + "' runs the wrong way round",
                    "order: top-left, top-right, bottom-right, bottom-left as seen in the frame");
        throw new InputRejected(file, "field '" + field + "' is not a convex outline (it is concave, "
                + "self-crossing or degenerate)", "order: top-left, top-right, bottom-right, bottom-left");
    }
}
