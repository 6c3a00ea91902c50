package org.risetrace.batch;

import org.risetrace.frame.InputRejected;
import org.risetrace.report.Reports;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.List;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

/**
 * Where a batch (or a merge) may write: the checks made on {@code --out} before any work, and the marker that makes
 * the folder the batch's own. The batch writes only into a folder that is new, empty or its own (it holds
 * {@value #MARKER}, written before the first series; or, from before the marker, a batch summary.json), and that
 * holds nothing but the batch's files; a user's file of the same name as an output is never written over, as
 * {@code analyze} refuses a folder holding other files ({@code report.OutputFolder}). The output folder may not be a
 * series folder or lie inside one, where its files would sit among the captures and the series be left out.
 */
final class BatchOutput {
    /** Written into the output folder before the first series: the folder belongs to the batch from then on. */
    static final String MARKER = "batch-output.json";
    private static final String MARKER_TEXT = "{\n  \"schema\" : \"risetrace-batch-output/1\",\n"
            + "  \"note\" : \"written by risetrace batch; a later batch or merge writes into this folder again\"\n}\n";
    /** Files a batch writes beside a series' results (every folder of the output, the top one included). */
    private static final Set<String> SERIES_FILES = Set.of(Reports.JSON_FILE, Reports.CSV_FILE, Reports.HTML_FILE,
            Manifest.FILE_NAME);
    /** Files a batch writes at the top of the output folder only. */
    private static final Set<String> TOP_FILES = Set.of(BatchSummary.JSON_FILE, SummaryCsv.FILE_NAME,
            IndexHtml.FILE_NAME, MARKER);
    /** Written by file browsers into any folder they show; the batch never writes them, so they endanger nothing. */
    private static final Set<String> BROWSER_FILES = Set.of(".DS_Store", "Thumbs.db", "desktop.ini");
    private static final String UUID = "[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}";
    /** AtomicFiles' temporary names and BatchRunner's staging folders, left behind by a run that was killed. */
    private static final Pattern TEMPORARY_FILE = Pattern.compile("\\.(.+)\\.tmp-" + UUID);
    private static final Pattern STAGING_FOLDER = Pattern.compile(Pattern.quote(BatchRunner.STAGING_PREFIX) + UUID);

    private BatchOutput() {
    }

    /**
     * Refuses an output folder that is the root, a series folder under the root or inside one. Inside the root
     * elsewhere is fine (the default {@code risetrace-out/batch-NAME} when the batch runs from within the root), and
     * so is a root that is itself a series: the output is then a subfolder, which the series does not read.
     */
    static void checkPlacement(Path root, Path out) {
        if (!Files.isDirectory(root)) return; // discovery names the problem
        Path r = canonical(root), o = canonical(out);
        if (r.equals(o))
            throw new InputRejected(out, "the output folder is the root itself (its parts.csv would be read as frames next time)",
                    "name another --out folder");
        if (!o.startsWith(r)) return;
        Path folder = r;
        for (Path name : r.relativize(o)) {
            if (name.toString().startsWith(".")) return; // discovery does not enter hidden folders
            folder = folder.resolve(name);
            if (!Files.isDirectory(folder)) return;
            if (SeriesDiscovery.holdsSeries(folder))
                throw new InputRejected(out, "the output folder " + (folder.equals(o)
                        ? "is the series folder '" + SeriesDiscovery.relative(r, folder) + "' under the root (the series "
                                + "would be left out of the batch and its frames mixed with the outputs)"
                        : "is inside the series folder '" + SeriesDiscovery.relative(r, folder) + "' under the root (the "
                                + "outputs would be mixed with the captures)"),
                        "name an --out folder outside every series folder, or run from outside them for the default "
                                + "risetrace-out/batch-" + r.getFileName());
        }
    }

    /**
     * Refuses an output folder that holds anything the batch did not write: a folder without the marker (nor an
     * earlier batch's summary.json) that is not empty, or any entry that is not a batch output, a leftover of a
     * killed run or a nested batch output folder. Reads only; {@link #claim} marks the folder afterwards.
     */
    static void checkOwned(Path out) {
        if (!Files.exists(out)) return;
        if (!Files.isDirectory(out)) throw new InputRejected(out, "not a folder", "name a new folder with --out");
        List<Path> entries = list(out);
        entries.removeIf(p -> BROWSER_FILES.contains(p.getFileName().toString()));
        if (entries.isEmpty()) return;
        String foreign = isBatchOutput(out) ? firstForeign(out, out, true) : entries.get(0).getFileName().toString();
        if (foreign != null)
            throw new InputRejected(out, "the output folder holds files that risetrace batch did not write (" + foreign
                    + ")", "name a new or empty folder with --out, or the output folder of an earlier batch");
    }

    /** Creates the output folder and marks it as the batch's own, before the first output is written. */
    static void claim(Path out) {
        Path marker = out.resolve(MARKER);
        try {
            Files.createDirectories(out);
            if (!Files.isRegularFile(marker, LinkOption.NOFOLLOW_LINKS))
                Files.writeString(marker, MARKER_TEXT, StandardCharsets.UTF_8, StandardOpenOption.CREATE_NEW,
                        StandardOpenOption.WRITE);
        } catch (FileAlreadyExistsException e) {
            // another run marked it at the same moment
        } catch (IOException e) {
            throw new InputRejected(out, "cannot create the output folder: " + BatchSummary.oneLine(e.getMessage()));
        }
    }

    /** The marker, or (from before the marker) a batch summary.json. */
    static boolean isBatchOutput(Path folder) {
        if (Files.isRegularFile(folder.resolve(MARKER), LinkOption.NOFOLLOW_LINKS)) return true;
        if (!Files.isRegularFile(folder.resolve(BatchSummary.JSON_FILE), LinkOption.NOFOLLOW_LINKS)) return false;
        try {
            BatchSummary.read(folder.resolve(BatchSummary.JSON_FILE));
            return true;
        } catch (InputRejected e) {
            return false;
        }
    }

    /** The path (under base) of the first entry of dir that a batch does not write, or null. */
    private static String firstForeign(Path base, Path dir, boolean top) {
        for (Path p : list(dir)) {
            String name = p.getFileName().toString();
            BasicFileAttributes a;
            try {
                a = Files.readAttributes(p, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
            } catch (IOException e) {
                return SeriesDiscovery.relative(base, p);
            }
            boolean ours;
            if (a.isDirectory()) {
                if (STAGING_FOLDER.matcher(name).matches() || (!name.startsWith(".") && isBatchOutput(p))) continue;
                if (name.startsWith(".")) return SeriesDiscovery.relative(base, p);
                String inner = firstForeign(base, p, false);
                if (inner != null) return inner;
                continue;
            } else if (a.isRegularFile()) {
                Matcher tmp = TEMPORARY_FILE.matcher(name);
                String written = tmp.matches() ? tmp.group(1) : name;
                ours = SERIES_FILES.contains(written) || (top && TOP_FILES.contains(written))
                        || BROWSER_FILES.contains(name);
            } else {
                ours = false; // a link or a device: the batch makes neither
            }
            if (!ours) return SeriesDiscovery.relative(base, p);
        }
        return null;
    }

    private static List<Path> list(Path dir) {
        try (Stream<Path> s = Files.list(dir)) {
            return new ArrayList<>(s.sorted().toList());
        } catch (IOException e) {
            throw new InputRejected(dir, "cannot list the output folder: " + BatchSummary.oneLine(e.getMessage()));
        }
    }

    /** The absolute path with symbolic links resolved as far as it exists, so two names of one folder compare equal. */
    static Path canonical(Path p) {
        Path abs = p.toAbsolutePath().normalize();
        Deque<Path> missing = new ArrayDeque<>();
        Path existing = abs;
        while (existing != null && !Files.exists(existing)) {
            missing.push(existing.getFileName());
            existing = existing.getParent();
        }
        if (existing == null) return abs;
        try {
            Path real = existing.toRealPath();
            while (!missing.isEmpty()) real = real.resolve(missing.pop());
            return real;
        } catch (IOException e) {
            return abs;
        }
    }
}
