package org.risetrace.batch;

import org.risetrace.frame.InputRejected;
import org.risetrace.io.FrameReaders;
import org.risetrace.io.Series;
import org.risetrace.io.Sidecars;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

/**
 * Finds the series under a root: every folder (the root included) holding a file with a frame extension (what
 * {@link Series#open} reads) or a series.json, each with its own board.json or the nearest parent's up to the root.
 * A folder with a series.json but no frames is kept, so that its error ("no frame files") reaches the summary.
 * Hidden folders, the batch's own output folder and other batch output folders (batch-output.json, or summary.json
 * with index.html, and no frames) are not entered; parts.csv and summary.csv (our outputs) do not make a folder a series.
 */
public final class SeriesDiscovery {
    public static final String BOARD_FILE = "board.json";
    /** Files our commands write beside a series' results; never taken for frames when looking for series. */
    static final java.util.Set<String> OUR_OUTPUTS = java.util.Set.of("parts.csv", SummaryCsv.FILE_NAME);

    private SeriesDiscovery() {
    }

    /** The series under root, sorted by relative path. */
    public static List<SeriesTask> find(Path root, Path excludedOrNull) {
        if (!Files.exists(root)) throw new InputRejected(root, "folder not found");
        if (!Files.isDirectory(root)) throw new InputRejected(root, "not a folder", "name the folder that holds the series");
        Path excluded = excludedOrNull == null ? null : excludedOrNull.toAbsolutePath().normalize();
        List<SeriesTask> found = new ArrayList<>();
        visit(root, root, excluded, found);
        found.sort(Comparator.comparing(SeriesTask::relativePath));
        return found;
    }

    private static void visit(Path root, Path folder, Path excluded, List<SeriesTask> found) {
        List<Path> entries;
        try (Stream<Path> s = Files.list(folder)) {
            entries = s.sorted().toList();
        } catch (IOException e) {
            throw new InputRejected(folder, "cannot list the folder: " + e.getMessage());
        }
        boolean series = holdsSeries(entries);
        if (!series && !folder.equals(root) && (Files.isRegularFile(folder.resolve(BatchOutput.MARKER))
                || Files.isRegularFile(folder.resolve(BatchSummary.JSON_FILE)) && Files.isRegularFile(folder.resolve(IndexHtml.FILE_NAME))))
            return; // another batch's output folder (for example under risetrace-out/ in the root); one holding
                    // frames is a series that an earlier version let a batch write its summary into
        if (series) found.add(new SeriesTask(folder, relative(root, folder), boardFor(root, folder)));
        for (Path p : entries) {
            if (!Files.isDirectory(p) || p.getFileName().toString().startsWith(".")) continue;
            if (excluded != null && p.toAbsolutePath().normalize().equals(excluded)) continue;
            visit(root, p, excluded, found);
        }
    }

    /** True when the folder holds a frame file or a series.json: discovery takes it for a series. */
    static boolean holdsSeries(Path folder) {
        try (Stream<Path> s = Files.list(folder)) {
            return holdsSeries(s.toList());
        } catch (IOException e) {
            throw new InputRejected(folder, "cannot list the folder: " + e.getMessage());
        }
    }

    private static boolean holdsSeries(List<Path> entries) {
        for (Path p : entries) {
            if (!Files.isRegularFile(p)) continue;
            String name = p.getFileName().toString();
            String lower = name.toLowerCase(Locale.ROOT);
            if (name.startsWith(".") || lower.equals(Series.BENCH_READINGS_FILE)) continue;
            if (OUR_OUTPUTS.contains(name)) continue; // parts.csv of an earlier analyze run is not a frame
            if (lower.equals(Sidecars.FILE_NAME) || FrameReaders.isImageFile(p)) return true;
        }
        return false;
    }

    static String relative(Path root, Path folder) {
        Path rel = root.relativize(folder);
        if (rel.toString().isEmpty()) return ".";
        List<String> parts = new ArrayList<>();
        for (Path n : rel) parts.add(n.toString());
        return String.join("/", parts);
    }

    /** The folder's board.json, else the nearest parent's up to the root; null when none has one. */
    static Path boardFor(Path root, Path folder) {
        Path rootNorm = root.toAbsolutePath().normalize();
        for (Path f = folder; f != null; f = f.getParent()) {
            Path b = f.resolve(BOARD_FILE);
            if (Files.isRegularFile(b)) return b;
            if (f.toAbsolutePath().normalize().equals(rootNorm)) break;
        }
        return null;
    }
}
