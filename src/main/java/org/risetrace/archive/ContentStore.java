package org.risetrace.archive;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.channels.Channels;
import java.nio.channels.FileChannel;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.nio.file.attribute.PosixFilePermissions;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;

/**
 * Stored files named by their SHA-256: {@code files/sha256/ab/abcdef...}. A file is written once: into a
 * temporary file in {@code tmp/} (same file system), forced to the disk, renamed atomically to its name, the folder
 * forced, then made read-only. The bytes are copied as they are, never re-encoded; the same bytes are stored once.
 * A kill at any moment leaves either no file under the name or the whole file; a temporary file left by a kill is
 * removed when the archive is next opened.
 */
public final class ContentStore {
    public static final String FILES = "files";
    public static final String TMP = "tmp";
    private final Path root;
    private final Path tmp;

    /** A stored file: its SHA-256 and size. */
    public record Stored(String sha256, long sizeBytes, boolean added) { }

    public ContentStore(Path archive) {
        this.root = archive.resolve(FILES).resolve("sha256");
        this.tmp = archive.resolve(TMP);
        try {
            Files.createDirectories(root);
            Files.createDirectories(tmp);
        } catch (IOException e) {
            throw new ArchiveException(archive, "cannot create the archive folders: " + e.getMessage());
        }
    }

    /** Removes temporary files older than an hour (left by a killed process; a running one renames its own soon). */
    public void sweepTemporaryFiles() {
        long cutoff = System.currentTimeMillis() - 3_600_000L;
        try (Stream<Path> s = Files.list(tmp)) {
            for (Path p : s.toList()) {
                try {
                    if (Files.getLastModifiedTime(p, LinkOption.NOFOLLOW_LINKS).toMillis() < cutoff) deleteTree(p);
                } catch (IOException ignored) {
                    // another process removed it first
                }
            }
        } catch (IOException ignored) {
            // nothing to sweep
        }
    }

    public Path path(String sha256) {
        if (!Hashes.isHex(sha256)) throw new IllegalArgumentException("not a SHA-256: " + sha256);
        return root.resolve(sha256.substring(0, 2)).resolve(sha256);
    }

    public boolean contains(String sha256) {
        return Files.isRegularFile(path(sha256), LinkOption.NOFOLLOW_LINKS);
    }

    public Path temporaryFolder() throws IOException {
        return Files.createTempDirectory(tmp, "work-");
    }

    /** Stores a file's bytes (read without following a link); {@code expectedSha256} may be null. */
    public Stored put(Path source, String expectedSha256) throws IOException {
        try (InputStream in = Files.newInputStream(source, StandardOpenOption.READ, LinkOption.NOFOLLOW_LINKS)) {
            return put(in, expectedSha256, source);
        }
    }

    /**
     * Stores a stream's bytes. With {@code expectedSha256}, bytes that hash otherwise are refused and nothing is
     * stored. A name already present is checked, not overwritten: a stored file that no longer has its hash is
     * reported, never silently replaced.
     */
    public Stored put(InputStream in, String expectedSha256, Path label) throws IOException {
        Path t = Files.createTempFile(tmp, "put-", ".part");
        try {
            MessageDigest md = Hashes.sha256();
            long size = 0;
            try (FileChannel ch = FileChannel.open(t, StandardOpenOption.WRITE);
                 OutputStream out = Channels.newOutputStream(ch)) {
                byte[] buf = new byte[Hashes.BUFFER];
                for (int n; (n = in.read(buf)) > 0; ) {
                    md.update(buf, 0, n);
                    out.write(buf, 0, n);
                    size += n;
                }
                out.flush();
                ch.force(true);
            }
            String sha = Hashes.hex(md.digest());
            if (expectedSha256 != null && !expectedSha256.equals(sha))
                throw new ArchiveException(label, "its SHA-256 is " + sha + ", not " + expectedSha256 + " as listed");
            Path target = path(sha);
            if (Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
                checkExisting(target, sha, size);
                return new Stored(sha, size, false);
            }
            Files.createDirectories(target.getParent());
            Files.setPosixFilePermissions(t, PosixFilePermissions.fromString("r--r--r--"));
            try {
                Files.move(t, target, StandardCopyOption.ATOMIC_MOVE);
            } catch (FileAlreadyExistsException raced) {
                checkExisting(target, sha, size);
                return new Stored(sha, size, false);
            } catch (AtomicMoveNotSupportedException e) {
                throw new ArchiveException(target, "the archive folder cannot rename files atomically", null, e);
            }
            forceFolder(target.getParent());
            return new Stored(sha, size, true);
        } finally {
            Files.deleteIfExists(t);
        }
    }

    private static void checkExisting(Path target, String sha, long size) throws IOException {
        if (Files.size(target) != size || !Hashes.of(target).equals(sha))
            throw new ArchiveException(target, "the stored file no longer has its SHA-256", "run 'risetrace case verify'");
    }

    /** Forces a folder's entries to the disk (the rename that made a file visible), where the platform allows. */
    static void forceFolder(Path dir) {
        try (FileChannel ch = FileChannel.open(dir, StandardOpenOption.READ)) {
            ch.force(true);
        } catch (IOException | UnsupportedOperationException ignored) {
            // not every file system lets a folder be opened; the rename itself is still atomic
        }
    }

    /** Every stored hash (for verify's count of files no record names). */
    public List<String> all() throws IOException {
        List<String> out = new ArrayList<>();
        try (Stream<Path> s = Files.walk(root, 2)) {
            for (Path p : s.toList()) {
                String n = p.getFileName().toString();
                if (Hashes.isHex(n)) out.add(n);
            }
        }
        return out;
    }

    static void deleteTree(Path p) throws IOException {
        if (!Files.exists(p, LinkOption.NOFOLLOW_LINKS)) return;
        if (Files.isDirectory(p, LinkOption.NOFOLLOW_LINKS)) {
            try (Stream<Path> s = Files.list(p)) {
                for (Path c : s.toList()) deleteTree(c);
            }
        }
        Files.deleteIfExists(p);
    }
}
