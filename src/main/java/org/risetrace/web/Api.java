package org.risetrace.web;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.BoardMap;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInAnalyzer;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.board.PlacementImport;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.FrameReaders;
import org.risetrace.io.ReadContext;
import org.risetrace.io.Series;
import org.risetrace.io.Sidecars;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.Homographies;
import org.risetrace.registration.Rectifier;
import org.risetrace.report.AnalysisJson;
import org.risetrace.report.ColourMaps;
import org.risetrace.report.LockInReport;
import org.risetrace.report.ReportHtml;
import org.risetrace.report.Reports;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.time.ZoneOffset;
import java.time.ZonedDateTime;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * The JSON endpoints (README, "Workbench", lists them). Each one checks its inputs, names its place through
 * {@link Roots}, and calls the same core entry points as the CLI commands: {@link Series} (inspect, frame-view),
 * {@link BoardFile} (board check), {@link SeriesAnalyzer}/{@link LockInAnalyzer} with {@link Reports}/{@link
 * LockInReport} (analyze), {@link SeriesAnalyzer#compare} (compare) and {@link PlacementImport} (board
 * import-placement).
 */
final class Api {
    /** Board file name beside a series, as the CLI's analyze expects it. */
    static final String BOARD_FILE = "board.json";
    /** Where results go: under the root, the series' own relative path below this folder. */
    static final String OUTPUT_FOLDER = "risetrace-out";
    /** Largest rectified board the preview makes, pixels (the analysis chooses its own resolution). */
    static final long MAX_PREVIEW_PIXELS = 1_000_000;

    private static final Pattern UPLOAD_NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,127}");
    private static final DateTimeFormatter STAMP = DateTimeFormatter.ofPattern("yyyyMMdd'T'HHmmss'Z'", Locale.ROOT);
    private static final ObjectMapper STRICT = org.risetrace.frame.StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES).build();

    private final Roots roots;
    private final Jobs jobs;
    private final long maxUploadBytes;
    private final Materials materials = Materials.load();
    private final Path scratch;
    private final Map<Path, Listed> seriesCache = new LinkedHashMap<>(8, 0.75f, true) {
        @Override protected boolean removeEldestEntry(Map.Entry<Path, Listed> e) { return size() > 4; }
    };
    private final Map<Path, Long> seriesStamp = new java.util.HashMap<>();

    private final ArchiveApi archive;

    Api(Roots roots, Jobs jobs, long maxUploadBytes, ArchiveApi archive) throws IOException {
        this.archive = archive;
        this.roots = roots;
        this.jobs = jobs;
        this.maxUploadBytes = maxUploadBytes;
        this.scratch = Files.createTempDirectory("risetrace-web-");
        scratch.toFile().deleteOnExit();
    }

    /** What the page needs once: roots, materials, the colour table, the safety notes. */
    Map<String, Object> session() {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("version", SeriesAnalyzer.version());
        List<Map<String, Object>> rs = new ArrayList<>();
        for (int i = 0; i < roots.all().size(); i++)
            rs.add(Map.of("index", i, "name", String.valueOf(roots.all().get(i).getFileName())));
        m.put("roots", rs);
        m.put("materials", new java.util.TreeSet<>(materials.names()));
        m.put("palette", ColourMaps.EMBER.table());
        m.put("safety", ReportHtml.SAFETY_TEXT);
        m.put("max_upload_bytes", maxUploadBytes);
        m.put("archive", archive != null);
        return m;
    }

    void handle(WorkbenchServer.Request r, String method, String path) throws IOException {
        var ex = r.ex;
        boolean get = method.equals("GET") || method.equals("HEAD");
        if (path.startsWith("/api/archive/")) {
            if (archive == null) throw WebError.notFound("no archive: start the workbench with --archive");
            archive.handle(r, get, path);
            return;
        }
        switch (path) {
            case "/api/browse" -> { if (get) { WorkbenchServer.sendJson(ex, 200, browse(r)); return; } }
            case "/api/series" -> { if (get) { WorkbenchServer.sendJson(ex, 200, series(r)); return; } }
            case "/api/frame" -> { if (get) { frame(r); return; } }
            case "/api/job" -> { if (get) { WorkbenchServer.sendJson(ex, 200, job(r)); return; } }
            case "/api/job/map" -> { if (get) { jobMap(r); return; } }
            case "/api/job/report" -> { if (get) { jobReport(r); return; } }
            case "/api/rectify" -> { if (!get) { rectify(r); return; } }
            case "/api/board" -> { if (!get) { WorkbenchServer.sendJson(ex, 200, saveBoard(r)); return; } }
            case "/api/analyse" -> { if (!get) { WorkbenchServer.sendJson(ex, 202, analyse(r)); return; } }
            case "/api/compare" -> { if (!get) { WorkbenchServer.sendJson(ex, 200, compare(r)); return; } }
            case "/api/placement" -> { if (!get) { WorkbenchServer.sendJson(ex, 200, placement(r)); return; } }
            case "/api/upload" -> { if (!get) { WorkbenchServer.sendJson(ex, 201, upload(r)); return; } }
            default -> throw WebError.notFound("no endpoint " + path.replaceAll("[^\\x20-\\x7e]", "?"));
        }
        throw new WebError(405, path + " does not take " + method);
    }

    // ------------------------------------------------------------------------------------------ open a series

    private Map<String, Object> browse(WorkbenchServer.Request r) throws IOException {
        int root = Roots.index(r.param("root"));
        String rel = r.param("path") == null ? "" : r.param("path");
        Path dir = roots.resolve(root, rel, true);
        if (!Files.isDirectory(dir)) throw WebError.badRequest("'" + rel + "' is not a folder");
        List<Map<String, Object>> folders = new ArrayList<>();
        int frames = 0;
        boolean board = false;
        List<Path> entries = new ArrayList<>();
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir)) {
            for (Path p : ds) {
                entries.add(p);
                if (entries.size() > 10_000) break;
            }
        }
        entries.sort((a, b) -> org.risetrace.io.NaturalOrder.INSTANCE.compare(a.getFileName().toString(),
                b.getFileName().toString()));
        for (Path p : entries) {
            String name = p.getFileName().toString();
            if (name.startsWith(".")) continue;
            if (Files.isDirectory(p)) {
                Path real;
                try {
                    real = p.toRealPath();
                } catch (IOException e) {
                    continue;
                }
                if (!real.startsWith(roots.root(root))) continue; // a link out is not offered
                folders.add(Map.of("name", name, "path", roots.relative(root, real), "frames", countFrames(real),
                        "board", RootFiles.isRegular(real.resolve(BOARD_FILE))));
            } else if (isFrameFile(p)) frames++;
            else if (name.equals(BOARD_FILE) && RootFiles.isRegular(p)) board = true;
        }
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("root", root);
        m.put("path", roots.relative(root, dir));
        m.put("folders", folders);
        m.put("frames", frames);
        m.put("board", board);
        return m;
    }

    private static int countFrames(Path dir) {
        int n = 0;
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir)) {
            for (Path p : ds) {
                if (!p.getFileName().toString().startsWith(".") && isFrameFile(p)) n++;
                if (n >= 100_000) break;
            }
        } catch (IOException e) {
            return 0;
        }
        return n;
    }

    /** A file the series listing reads as a frame (a symbolic link is not one: see {@link #readSeries}). */
    private static boolean isFrameFile(Path p) {
        return FrameReaders.isImageFile(p) && !p.getFileName().toString().equalsIgnoreCase(Series.BENCH_READINGS_FILE)
                && RootFiles.isRegular(p);
    }

    /** A series as the workbench reads it, and the symbolic links it skipped (warnings in the core's words). */
    record Listed(Series series, List<String> skipped) { }

    /** A series folder, opened once and kept while its folder is unchanged. */
    private Listed openSeries(Path dir) {
        long stamp;
        try {
            stamp = Files.getLastModifiedTime(dir).toMillis();
            Path sc = dir.resolve(Sidecars.FILE_NAME);
            if (RootFiles.exists(sc))
                stamp = 31 * stamp + Files.getLastModifiedTime(sc, LinkOption.NOFOLLOW_LINKS).toMillis();
        } catch (IOException e) {
            throw WebError.notFound("cannot read the folder");
        }
        synchronized (seriesCache) {
            Listed s = seriesCache.get(dir);
            if (s != null && Long.valueOf(stamp).equals(seriesStamp.get(dir))) return s;
        }
        Listed s = readSeries(dir);
        synchronized (seriesCache) {
            seriesCache.put(dir, s);
            seriesStamp.put(dir, stamp);
        }
        return s;
    }

    /**
     * The series in a folder as {@code Series.open} reads it, except that a symbolic link to a file is never
     * followed (its target may lie outside the root): a linked frame (or other file) is skipped with a warning, as
     * the core skips a FIFO, and a linked series.json is refused, as the core refuses a series.json that is not a
     * regular file. Links to folders are left out, as the core leaves out folders. A folder without such links is
     * read by the core itself.
     */
    private static Listed readSeries(Path dir) {
        List<Path> kept = new ArrayList<>();
        List<String> skipped = new ArrayList<>();
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir)) {
            for (Path p : ds) {
                String name = p.getFileName().toString();
                if (name.startsWith(".")) continue;
                if (Files.isSymbolicLink(p)) {
                    if (Files.isDirectory(p)) continue;
                    if (name.equalsIgnoreCase(Sidecars.FILE_NAME))
                        throw new InputRejected(p, RootFiles.notRegular(p) + ", not a sidecar file", "copy the file itself in");
                    skipped.add("skipped " + name + ": " + RootFiles.notRegular(p));
                } else if (!Files.isDirectory(p, LinkOption.NOFOLLOW_LINKS)) {
                    kept.add(p);
                }
            }
        } catch (IOException e) {
            throw WebError.notFound("cannot read the folder");
        }
        if (skipped.isEmpty()) return new Listed(Series.open(dir, null, ReadContext.DEFAULT_MAX_PIXELS), List.of());
        skipped.sort(org.risetrace.io.NaturalOrder.INSTANCE);
        if (kept.isEmpty())
            throw new InputRejected(dir, "no frame files", "the folder holds only symbolic links, which the workbench does not follow");
        return new Listed(Series.open(kept, null, null, ReadContext.DEFAULT_MAX_PIXELS), List.copyOf(skipped));
    }

    /**
     * board.json beside a series for reading: a regular file, or 422 (missing: save one first; a symbolic link, a
     * FIFO or a folder: named, never followed or waited on).
     */
    private static Path savedBoard(Path dir) {
        Path f = dir.resolve(BOARD_FILE);
        if (RootFiles.isRegular(f)) return f;
        if (!RootFiles.exists(f))
            throw new WebError(422, "no " + BOARD_FILE + " beside the series yet: mark the outline and parts, then save");
        throw new WebError(422, BOARD_FILE + ": " + RootFiles.notRegular(f) + "; replace it with the file itself");
    }

    private Path seriesFolder(WorkbenchServer.Request r) {
        int root = Roots.index(r.param("root"));
        Path dir = roots.resolve(root, r.required("path"), true);
        if (!Files.isDirectory(dir)) throw WebError.badRequest("not a folder");
        return dir;
    }

    private Map<String, Object> series(WorkbenchServer.Request r) {
        int root = Roots.index(r.param("root"));
        Path dir = seriesFolder(r);
        Listed listed = openSeries(dir);
        Series s = listed.series();
        List<Map<String, Object>> frames = new ArrayList<>();
        for (int i = 0; i < s.size(); i++) frames.add(Map.of("i", i, "name", s.fileName(i), "t_s", s.tSeconds(i)));
        Frame first = s.read(0);
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("root", root);
        m.put("path", roots.relative(root, dir));
        m.put("name", dir.getFileName().toString());
        m.put("width", first.width());
        m.put("height", first.height());
        m.put("frames", frames);
        m.put("profile", s.profile() == null ? null : s.profile().name());
        m.put("time_source", s.timeSource());
        List<String> warnings = new ArrayList<>();
        for (String w : s.warnings()) warnings.add(roots.redact(w));
        warnings.addAll(listed.skipped());
        m.put("warnings", warnings);
        Path boardFile = dir.resolve(BOARD_FILE);
        if (RootFiles.exists(boardFile) && !RootFiles.isRegular(boardFile)) {
            m.put("board_error", BOARD_FILE + ": " + RootFiles.notRegular(boardFile));
        } else if (RootFiles.isRegular(boardFile)) {
            try {
                Board b = BoardFile.readWithoutOutline(boardFile, materials.names());
                m.put("board", JSON_TREE.valueToTree(b));
            } catch (InputRejected e) {
                m.put("board_error", BOARD_FILE + ": " + e.reason() + (e.hint() == null ? "" : " (" + e.hint() + ")"));
            }
        }
        m.put("periodic", LockInAnalyzer.periodic(s));
        return m;
    }

    private static final ObjectMapper JSON_TREE = new ObjectMapper();

    /** A frame's temperatures as little-endian float32, row by row; size and range in headers. */
    private void frame(WorkbenchServer.Request r) throws IOException {
        Path dir = seriesFolder(r);
        Series s = openSeries(dir).series();
        int i = r.intParam("i", 0, s.size() - 1);
        Frame f = s.read(i);
        sendRaster(r, f.width(), f.height(), f.celsius(), null, Map.of("X-Frame-Name", asciiHeader(s.fileName(i))));
    }

    private static String asciiHeader(String s) {
        return s.replaceAll("[^\\x20-\\x7e]", "?");
    }

    private static void sendRaster(WorkbenchServer.Request r, int w, int h, float[] values, boolean[] valid,
                                   Map<String, String> extra) throws IOException {
        ByteBuffer b = ByteBuffer.allocate(values.length * 4).order(ByteOrder.LITTLE_ENDIAN);
        float min = Float.POSITIVE_INFINITY, max = Float.NEGATIVE_INFINITY;
        for (int k = 0; k < values.length; k++) {
            float v = valid == null || valid[k] ? values[k] : Float.NaN;
            b.putFloat(v);
            if (Float.isFinite(v)) {
                min = Math.min(min, v);
                max = Math.max(max, v);
            }
        }
        var hd = r.ex.getResponseHeaders();
        hd.set("X-Width", Integer.toString(w));
        hd.set("X-Height", Integer.toString(h));
        hd.set("X-Min", Float.isFinite(min) ? Float.toString(min) : "NaN");
        hd.set("X-Max", Float.isFinite(max) ? Float.toString(max) : "NaN");
        extra.forEach(hd::set);
        WorkbenchServer.send(r.ex, 200, "application/octet-stream", b.array());
    }

    // ------------------------------------------------------------------------------------------ board

    /**
     * A board document from the page, checked by the CLI's own rules: the bytes go to a private scratch file and
     * through {@link BoardFile#read}, so unknown fields, missing fields, duplicate keys, wrong types, outline
     * order and parts off the board are refused exactly as {@code risetrace board check} refuses them.
     */
    private Board checkedBoard(byte[] json) throws IOException {
        Path tmp = Files.createTempFile(scratch, "board", ".json");
        try {
            Files.write(tmp, json);
            return BoardFile.read(tmp, materials.names());
        } catch (InputRejected e) {
            throw new WebError(422, BOARD_FILE + ": " + e.reason() + (e.hint() == null ? "" : " (" + e.hint() + ")"));
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    private static int frameIndex(Series s, Board b) {
        String name = b.outline().frame();
        for (int i = 0; i < s.size(); i++) if (s.fileName(i).equals(name)) return i;
        throw new WebError(422, BOARD_FILE + ": the outline is marked on frame '" + name + "', which is not in this series");
    }

    /** The reference frame rectified into board space by the marked outline (the registration stage's Rectifier). */
    private void rectify(WorkbenchServer.Request r) throws IOException {
        Path dir = seriesFolder(r);
        Board b = checkedBoard(r.body(WorkbenchServer.MAX_DOCUMENT_BYTES));
        Series s = openSeries(dir).series();
        Frame f = s.read(frameIndex(s, b));
        double px = Rectifier.defaultPxPerMm(b);
        double area = b.widthMm() * b.heightMm();
        if (area * px * px > MAX_PREVIEW_PIXELS) px = Math.sqrt(MAX_PREVIEW_PIXELS / area);
        Rectifier rect = new Rectifier(b, px);
        BoardRaster raster = rect.rectify(f, Homographies.boardToFrame(b, b.outline().cornersPx()));
        sendRaster(r, raster.width(), raster.height(), raster.celsius(), raster.valid(),
                Map.of("X-Px-Per-Mm", Double.toString(raster.pxPerMm())));
    }

    /**
     * Saves board.json beside the series: checked first; an existing board.json must be a regular file (a FIFO
     * would block the backup's read forever, a folder cannot be replaced, a symbolic link may lead out of the
     * root: 409, nothing written); it is copied to board.bak-&lt;UTC time&gt;.json (the series reader skips .json
     * files), then the new file is written to a hidden temporary file in the same folder, given the old file's
     * permissions (a new file keeps what any new file gets here) and moved over board.json in one step.
     */
    private Map<String, Object> saveBoard(WorkbenchServer.Request r) throws IOException {
        int root = Roots.index(r.param("root"));
        Path dir = seriesFolder(r);
        Board b = checkedBoard(r.body(WorkbenchServer.MAX_DOCUMENT_BYTES));
        frameIndex(openSeries(dir).series(), b);
        Path file = dir.resolve(BOARD_FILE);
        boolean replacing = RootFiles.exists(file);
        if (replacing && !RootFiles.isRegular(file))
            throw new WebError(409, BOARD_FILE + " in '" + roots.relative(root, dir) + "' is " + RootFiles.notRegular(file)
                    + "; nothing was saved: remove it or replace it with the file itself");
        String backup = null;
        if (replacing) {
            String stamp = ZonedDateTime.now(ZoneOffset.UTC).format(STAMP);
            Path bak = dir.resolve("board.bak-" + stamp + ".json");
            for (int n = 2; RootFiles.exists(bak); n++) bak = dir.resolve("board.bak-" + stamp + "-" + n + ".json");
            Files.copy(file, bak, StandardCopyOption.COPY_ATTRIBUTES, LinkOption.NOFOLLOW_LINKS);
            backup = bak.getFileName().toString();
        }
        Path tmp = org.risetrace.frame.TemporaryFiles.beside(dir, "board");
        try {
            Files.writeString(tmp, BoardFile.toJson(b) + "\n", StandardCharsets.UTF_8);
            org.risetrace.frame.TemporaryFiles.keepPermissions(file, tmp);
            try {
                Files.move(tmp, file, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (java.nio.file.AtomicMoveNotSupportedException e) {
                Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            Files.deleteIfExists(tmp);
        }
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("saved", roots.relative(root, file));
        m.put("backup", backup);
        m.put("parts", b.partsOrEmpty().size());
        return m;
    }

    /** A placement list (CSV text) through the CLI's placement import; the page adds the parts it returns. */
    private Map<String, Object> placement(WorkbenchServer.Request r) throws IOException {
        String units = r.param("units") == null ? "mm" : r.param("units");
        String side = r.param("side") == null ? "top" : r.param("side");
        if (!Set.of("mm", "mil").contains(units)) throw WebError.badRequest("units must be mm or mil");
        if (!Set.of("top", "bottom", "all").contains(side)) throw WebError.badRequest("side must be top, bottom or all");
        // the board size the page already has: the CAD origin is then its bottom-left corner (y up), as with the
        // CLI's --size-mm; without it the core guesses the size from the parts' extent
        double[] size = null;
        if (r.param("w_mm") != null || r.param("h_mm") != null)
            size = new double[]{sizeParam(r, "w_mm"), sizeParam(r, "h_mm")};
        byte[] csv = r.body(WorkbenchServer.MAX_DOCUMENT_BYTES);
        Path tmp = Files.createTempFile(scratch, "placement", ".csv");
        try {
            Files.write(tmp, csv);
            PlacementImport.Options d = PlacementImport.Options.defaults();
            PlacementImport.Options o = new PlacementImport.Options(null, null, null, null, null, units, null, null,
                    d.yUp(), side, Map.of(), size, null);
            PlacementImport.Result res = PlacementImport.read(tmp, o);
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("size_mm", res.board().sizeMm());
            m.put("parts", JSON_TREE.valueToTree(res.board().partsOrEmpty()));
            List<String> notes = new ArrayList<>();
            for (String n : res.notes()) notes.add(n.replace(tmp.toString(), "placement file"));
            m.put("notes", notes);
            return m;
        } catch (InputRejected e) {
            throw new WebError(422, "placement file: " + e.reason() + (e.hint() == null ? "" : " (" + e.hint() + ")"));
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    private static double sizeParam(WorkbenchServer.Request r, String name) {
        String v = r.required(name);
        double d;
        try {
            d = Double.parseDouble(v);
        } catch (NumberFormatException e) {
            throw WebError.badRequest("'" + name + "' must be a number of millimetres");
        }
        if (!(Double.isFinite(d) && d > 0 && d <= BoardFile.MAX_SIZE_MM))
            throw WebError.badRequest("'" + name + "' must be more than 0 and at most " + (int) BoardFile.MAX_SIZE_MM + " mm");
        return d;
    }

    // ------------------------------------------------------------------------------------------ analyse

    /** What a finished analysis leaves for the page. */
    record Finished(int root, String seriesPath, Analysis analysis, String analysisJson, Path outDir) { }

    private Map<String, Object> analyse(WorkbenchServer.Request r) throws IOException {
        int root = Roots.index(r.param("root"));
        Path dir = seriesFolder(r);
        Path boardFile = savedBoard(dir);
        Series s = readSeries(dir).series();
        Board b;
        try {
            b = BoardFile.read(boardFile, materials.names());
        } catch (InputRejected e) {
            throw new WebError(422, BOARD_FILE + ": " + e.reason() + (e.hint() == null ? "" : " (" + e.hint() + ")"));
        }
        frameIndex(s, b);
        String rel = roots.relative(root, dir);
        Path out = roots.root(root).resolve(OUTPUT_FOLDER).resolve(rel.isEmpty() ? "series" : rel);
        Path outReal = out.normalize();
        if (!outReal.startsWith(roots.root(root))) throw WebError.forbidden("output folder leaves the root");
        // the part of it that exists already (risetrace-out, say) must not lead out through a symbolic link
        for (Path p = outReal; p.startsWith(roots.root(root)); p = p.getParent()) {
            if (!RootFiles.exists(p)) continue;
            if (!p.toRealPath().startsWith(roots.root(root)))
                throw WebError.forbidden("'" + roots.relative(root, p) + "' leads outside the root (a symbolic link)");
            break;
        }
        String notes = s.sidecar() == null ? null : s.sidecar().notes();
        Jobs.Job job = jobs.submit(rel, j -> {
            Analyzer.Progress progress = (done, total) -> {
                j.done = done;
                j.total = total;
            };
            String label = rel.isEmpty() ? dir.getFileName().toString() : rel;
            AnalysisOptions options = AnalysisOptions.defaults();
            if (LockInAnalyzer.periodic(s)) {
                LockIn li = LockInAnalyzer.analyze(s, b, boardFile, label, options,
                        SeriesAnalyzer.emissivity(s.profile()), SeriesAnalyzer.defaultThreads(), progress);
                LockInReport.writeAll(li, out, notes, true);
                return new Finished(root, rel, li.steady(), LockInReport.toJson(li), out);
            }
            Analysis a = SeriesAnalyzer.analyzeOrCompare(s, b, boardFile, label, options,
                    SeriesAnalyzer.defaultThreads(), progress);
            Reports.writeAll(a, out, notes, true);
            return new Finished(root, rel, a, AnalysisJson.toJson(a.result()), out);
        }, this::errorLine);
        return Map.of("job", job.id);
    }

    private String errorLine(Throwable t) {
        Throwable c = t;
        while (c != null && !(c instanceof InputRejected) && !(c instanceof WebError)) c = c.getCause();
        if (c != null) return roots.redact(c.getMessage());
        System.err.println("risetrace serve: analysis failed");
        t.printStackTrace();
        return "the analysis failed (details on the server's console)";
    }

    private Map<String, Object> job(WorkbenchServer.Request r) throws IOException {
        Jobs.Job j = jobs.get(r.required("id"));
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("id", j.id);
        m.put("series", j.label);
        m.put("state", j.state.name());
        m.put("done", j.done);
        m.put("total", j.total);
        if (j.error != null) m.put("error", j.error);
        if (j.state == Jobs.State.done && j.value instanceof Finished f) {
            JsonNode doc = JSON_TREE.readTree(f.analysisJson());
            m.put("analysis", doc);
            m.put("output", roots.relative(f.root(), f.outDir().toRealPath()));
            m.put("curves", curves(f.analysis()));
            BoardMap rise = f.analysis().riseMap();
            if (rise != null) m.put("rise_map", Map.of("width", rise.width(), "height", rise.height(),
                    "px_per_mm", rise.pxPerMm(), "unit", String.valueOf(rise.unit())));
            m.put("board", JSON_TREE.valueToTree(f.analysis().board()));
        }
        return m;
    }

    /** Each part's measured rise and its fitted model at the same times (null where there is none). */
    private static List<Map<String, Object>> curves(Analysis a) {
        List<Map<String, Object>> out = new ArrayList<>();
        if (a.curves() == null) return out;
        for (RiseCurve c : a.curves()) {
            List<Double> rise = new ArrayList<>(), fit = new ArrayList<>();
            for (int k = 0; k < c.tS().length; k++) {
                rise.add(Double.isFinite(c.riseK()[k]) ? c.riseK()[k] : null);
                double v = c.fitAt(c.tS()[k]);
                fit.add(Double.isFinite(v) ? v : null);
            }
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("ref", c.ref());
            m.put("t_s", c.tS());
            m.put("rise_k", rise);
            m.put("fit_k", fit);
            m.put("onset_s", c.onsetS());
            out.add(m);
        }
        return out;
    }

    private Finished finished(WorkbenchServer.Request r) {
        Jobs.Job j = jobs.get(r.required("id"));
        if (j.state != Jobs.State.done || !(j.value instanceof Finished f))
            throw new WebError(409, "the job has not finished");
        return f;
    }

    private void jobMap(WorkbenchServer.Request r) throws IOException {
        BoardMap m = finished(r).analysis().riseMap();
        if (m == null) throw WebError.notFound("this analysis has no rise map");
        sendRaster(r, m.width(), m.height(), m.values(), null, Map.of("X-Px-Per-Mm", Double.toString(m.pxPerMm())));
    }

    /** report.html as the report package wrote it (self-contained: styles inline, plots as data URIs, no script). */
    private void jobReport(WorkbenchServer.Request r) throws IOException {
        Finished f = finished(r);
        byte[] html = Files.readAllBytes(f.outDir().resolve(Reports.HTML_FILE));
        r.ex.getResponseHeaders().set("Content-Security-Policy",
                "default-src 'none'; img-src data:; style-src 'unsafe-inline'; frame-ancestors 'none'");
        WorkbenchServer.send(r.ex, 200, "text/html; charset=utf-8", html);
    }

    // ------------------------------------------------------------------------------------------ compare

    record CompareRequest(@JsonProperty("before") Integer before, @JsonProperty("after") Integer after) { }

    private Map<String, Object> compare(WorkbenchServer.Request r) throws IOException {
        Path dir = seriesFolder(r);
        CompareRequest q;
        try {
            q = STRICT.readValue(r.body(WorkbenchServer.MAX_DOCUMENT_BYTES), CompareRequest.class);
        } catch (com.fasterxml.jackson.core.JacksonException e) {
            throw WebError.badRequest("body must be {\"before\": frame index, \"after\": frame index}");
        }
        if (q == null || q.before() == null || q.after() == null)
            throw WebError.badRequest("body must be {\"before\": frame index, \"after\": frame index}");
        Series s = openSeries(dir).series();
        for (int i : new int[]{q.before(), q.after()})
            if (i < 0 || i >= s.size()) throw WebError.badRequest("frame index " + i + " is not in the series (0 to " + (s.size() - 1) + ")");
        if (q.before().equals(q.after())) throw WebError.badRequest("pick two different frames");
        String swapped = s.orderProblem(q.before(), q.after());
        if (swapped != null) throw WebError.badRequest(swapped + ": pick the earlier frame as before");
        Path boardFile = savedBoard(dir);
        Board b;
        try {
            b = BoardFile.read(boardFile, materials.names());
        } catch (InputRejected e) {
            throw new WebError(422, BOARD_FILE + ": " + e.reason() + (e.hint() == null ? "" : " (" + e.hint() + ")"));
        }
        Frame fb = s.read(q.before()), fa = s.read(q.after());
        Analysis a = SeriesAnalyzer.compare(fb, fa, b, boardFile, AnalysisOptions.defaults(), s.sidecar(), s.profile());
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("before", s.fileName(q.before()));
        m.put("after", s.fileName(q.after()));
        m.put("analysis", JSON_TREE.readTree(AnalysisJson.toJson(a.result())));
        return m;
    }

    // ------------------------------------------------------------------------------------------ upload

    /**
     * One frame file (or series.json) into a folder under a root; never over an existing file. A series.json is
     * first read by the core's sidecar reader (a broken one stored would refuse the series and, never replaced,
     * keep the folder stuck). The new folder and file get what any new folder and file get here.
     */
    private Map<String, Object> upload(WorkbenchServer.Request r) throws IOException {
        int root = Roots.index(r.param("root"));
        String folderRel = r.required("path");
        String name = r.required("name");
        if (!UPLOAD_NAME.matcher(name).matches())
            throw WebError.badRequest("file name must be letters, digits, '.', '_' or '-' (at most 128), got '"
                    + asciiHeader(name) + "'");
        if (!(FrameReaders.isImageFile(Path.of(name)) || name.equals("series.json")))
            throw WebError.badRequest("'" + name + "' is not a frame file (" + String.join(", ",
                    new java.util.TreeSet<>(FrameReaders.FRAME_EXTENSIONS)) + ") or series.json");
        byte[] body = r.body(maxUploadBytes);
        if (body.length == 0) throw WebError.badRequest("empty file");
        if (name.equals(Sidecars.FILE_NAME)) checkedSidecar(body);
        Path folder = roots.resolve(root, folderRel, false);
        if (!Files.exists(folder)) Files.createDirectory(folder);
        else if (!Files.isDirectory(folder)) throw WebError.badRequest("'" + folderRel + "' is not a folder");
        Path target = folder.resolve(name);
        if (Files.exists(target, java.nio.file.LinkOption.NOFOLLOW_LINKS))
            throw new WebError(409, "'" + name + "' already exists in '" + folderRel + "'; nothing was replaced");
        Path tmp = org.risetrace.frame.TemporaryFiles.beside(folder, "upload");
        try {
            Files.write(tmp, body);
            try {
                Files.move(tmp, target); // no REPLACE_EXISTING: a file that appeared meanwhile is kept
            } catch (java.nio.file.FileAlreadyExistsException e) {
                throw new WebError(409, "'" + name + "' already exists in '" + folderRel + "'; nothing was replaced");
            }
        } finally {
            Files.deleteIfExists(tmp);
        }
        return Map.of("saved", roots.relative(root, target), "bytes", body.length);
    }

    /** A series.json through the core's sidecar reader (via a private scratch file, as board files are checked). */
    private void checkedSidecar(byte[] json) throws IOException {
        Path tmp = Files.createTempFile(scratch, "series", ".json");
        try {
            Files.write(tmp, json);
            Sidecars.load(tmp);
        } catch (InputRejected e) {
            throw new WebError(422, Sidecars.FILE_NAME + ": " + e.reason() + (e.hint() == null ? "" : " (" + e.hint() + ")"));
        } finally {
            Files.deleteIfExists(tmp);
        }
    }
}
