package org.risetrace.report;

import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.DirectoryStream;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Consumer;
import java.util.stream.Stream;

/**
 * Puts a set of output files (analysis.json, parts.csv, report.html) into an output folder as one step, so that a
 * kill at any moment leaves the previous complete set or the new complete one, never a mix or a half-written file.
 *
 * <p>How: the new files are written into a fresh staging folder beside the output folder ({@code .NAME.new-*}, same
 * parent, so the same file system), each flushed to the disk ({@link FileChannel#force}), then the staging folder
 * itself is flushed. Then the folder is swapped in by renames, which POSIX makes atomic for one name
 * ({@code rename(2)}): with no earlier output, one rename of the staging folder to the output name; with an earlier
 * output (only with {@code replace}), first the old folder is renamed aside ({@code .NAME.old-*}), then the staging
 * folder to the output name, then the old one is deleted. Between those two renames the output name is absent for an
 * instant; a kill exactly there leaves both complete sets on disk, and the next write to that folder renames the old
 * one back before it starts ({@link #recover}). Staging folders left by a kill are deleted by the next write.
 *
 * <p>The output folder belongs to the tool: a folder that holds anything but these files is refused, so a wrong
 * {@code --out} never moves a user's own folder.
 */
public final class OutputFolder {
    private static final String NEW = ".new-", OLD = ".old-";

    /** Test hook: called with the name of each step ("file:NAME", "staged", "aside", "placed"); may throw. */
    static volatile Consumer<String> stepHook = s -> { };

    private OutputFolder() { }

    /**
     * Refuses an output folder that cannot take the outputs: not a folder, holding other files, or (without
     * {@code replace}) holding an earlier output. Commands call this before a long analysis, and {@link #write}
     * again.
     */
    public static void check(Path outDir, Set<String> names, boolean replace) {
        Path dir = outDir.toAbsolutePath().normalize();
        if (dir.getParent() == null) throw new InputRejected(outDir, "cannot write outputs into the file system root");
        recover(dir);
        if (!Files.exists(dir, LinkOption.NOFOLLOW_LINKS)) return;
        if (!Files.isDirectory(dir, LinkOption.NOFOLLOW_LINKS))
            throw new InputRejected(outDir, "not a folder", "name a new folder with --out");
        List<String> held = list(dir);
        for (String n : held)
            if (!names.contains(n))
                throw new InputRejected(outDir, "the output folder holds other files (" + n + ")",
                        "name a new or empty folder with --out");
        if (!held.isEmpty() && !replace)
            throw new InputRejected(outDir, "holds an earlier analysis", "use --force to replace it, or name another --out");
    }

    /** Writes {@code files} (name -> UTF-8 text) as the new content of {@code outDir}; see the class comment. */
    public static void write(Path outDir, Map<String, String> files, boolean replace) {
        Path dir = outDir.toAbsolutePath().normalize();
        check(outDir, files.keySet(), replace);
        Path parent = dir.getParent();
        String name = dir.getFileName().toString();
        Path staging;
        try {
            Files.createDirectories(parent);
            staging = newStaging(parent, name, dir);
        } catch (IOException e) {
            throw new InputRejected(outDir, "cannot create the output folder: " + message(e));
        }
        try {
            for (Map.Entry<String, String> f : files.entrySet()) {
                writeFlushed(staging.resolve(f.getKey()), f.getValue());
                stepHook.accept("file:" + f.getKey());
            }
            flushFolder(staging);
            stepHook.accept("staged");
            if (Files.exists(dir, LinkOption.NOFOLLOW_LINKS)) {
                if (list(dir).isEmpty()) {
                    Files.delete(dir);
                    Files.move(staging, dir, StandardCopyOption.ATOMIC_MOVE);
                } else {
                    Path aside = parent.resolve("." + name + OLD + staging.getFileName().toString()
                            .substring(name.length() + 1 + NEW.length()));
                    Files.move(dir, aside, StandardCopyOption.ATOMIC_MOVE);
                    stepHook.accept("aside");
                    Files.move(staging, dir, StandardCopyOption.ATOMIC_MOVE);
                    flushFolder(parent);
                    stepHook.accept("placed");
                    deleteTree(aside);
                }
            } else {
                Files.move(staging, dir, StandardCopyOption.ATOMIC_MOVE);
            }
            flushFolder(parent);
        } catch (FileAlreadyExistsException e) {
            deleteQuietly(staging);
            throw new InputRejected(outDir, "another run wrote the output folder at the same time", "run again");
        } catch (IOException e) {
            deleteQuietly(staging);
            throw new InputRejected(outDir, "cannot write the results: " + message(e));
        }
    }

    /**
     * After a kill: an old set renamed aside while the output name is absent goes back (it is complete; the new one
     * was not yet in place); staging folders and old sets beside a present output are deleted.
     */
    static void recover(Path dir) {
        Path parent = dir.getParent();
        String name = dir.getFileName().toString();
        if (parent == null || !Files.isDirectory(parent)) return;
        List<Path> old = new ArrayList<>(), staged = new ArrayList<>();
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(parent, "." + name + "*")) {
            for (Path p : ds) {
                String n = p.getFileName().toString();
                if (n.startsWith("." + name + OLD)) old.add(p);
                else if (n.startsWith("." + name + NEW)) staged.add(p);
            }
        } catch (IOException e) {
            return; // nothing to recover that can be read
        }
        try {
            if (!Files.exists(dir, LinkOption.NOFOLLOW_LINKS) && old.size() == 1) {
                Files.move(old.get(0), dir, StandardCopyOption.ATOMIC_MOVE);
                old.clear();
            }
        } catch (IOException e) {
            throw new InputRejected(dir, "an earlier run was interrupted and its previous results in " + old.get(0)
                    + " cannot be moved back: " + message(e));
        }
        if (Files.exists(dir, LinkOption.NOFOLLOW_LINKS)) for (Path p : old) deleteQuietly(p);
        for (Path p : staged) deleteQuietly(p);
    }

    /**
     * The staging folder, made without permissions of its own so that it has what any new folder gets here (0755
     * under the usual umask 0022; a temporary directory's 0700 left every output folder unreadable to the rest of a
     * shared bench), or, when it replaces a folder, that folder's permissions.
     */
    private static Path newStaging(Path parent, String name, Path replaced) throws IOException {
        Path staging;
        for (int attempt = 0; ; attempt++) {
            try {
                staging = Files.createDirectory(parent.resolve("." + name + NEW
                        + Long.toUnsignedString(java.util.concurrent.ThreadLocalRandom.current().nextLong(), 36)));
                break;
            } catch (FileAlreadyExistsException e) {
                if (attempt >= 100) throw e;
            }
        }
        if (Files.isDirectory(replaced, LinkOption.NOFOLLOW_LINKS)
                && parent.getFileSystem().supportedFileAttributeViews().contains("posix"))
            Files.setPosixFilePermissions(staging, Files.getPosixFilePermissions(replaced, LinkOption.NOFOLLOW_LINKS));
        return staging;
    }

    private static void writeFlushed(Path file, String text) throws IOException {
        ByteBuffer bytes = ByteBuffer.wrap(text.getBytes(java.nio.charset.StandardCharsets.UTF_8));
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE)) {
            while (bytes.hasRemaining()) ch.write(bytes);
            ch.force(true);
        }
    }

    /** Flushes a folder's entries (POSIX: fsync on the folder); not every platform allows it, which then is moot. */
    private static void flushFolder(Path dir) {
        try (FileChannel ch = FileChannel.open(dir, StandardOpenOption.READ)) {
            ch.force(true);
        } catch (IOException | UnsupportedOperationException ignored) {
            // Windows cannot open a folder as a channel; its renames are journaled by NTFS
        }
    }

    private static List<String> list(Path dir) {
        List<String> names = new ArrayList<>();
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir)) {
            for (Path p : ds) names.add(p.getFileName().toString());
        } catch (IOException e) {
            throw new InputRejected(dir, "cannot list the output folder: " + message(e));
        }
        return names;
    }

    private static void deleteTree(Path p) throws IOException {
        try (Stream<Path> s = Files.walk(p)) {
            for (Path q : s.sorted(Comparator.reverseOrder()).toList()) Files.deleteIfExists(q);
        }
    }

    private static void deleteQuietly(Path p) {
        try {
            deleteTree(p);
        } catch (IOException | UncheckedIOException ignored) {
            // a leftover staging folder is removed by the next write
        }
    }

    private static String message(IOException e) {
        String m = e.getMessage();
        return e.getClass().getSimpleName() + (m == null ? "" : " " + m);
    }

    /** The files of one output set in a fixed order. */
    static Map<String, String> set(String json, String csv, String html) {
        Map<String, String> m = new LinkedHashMap<>();
        m.put(Reports.JSON_FILE, json);
        m.put(Reports.CSV_FILE, csv);
        m.put(Reports.HTML_FILE, html);
        return m;
    }
}
