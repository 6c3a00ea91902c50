package org.risetrace.web;

import java.io.IOException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.nio.file.attribute.PosixFilePermission;
import java.util.Set;
import java.util.concurrent.ThreadLocalRandom;

/**
 * Files in the roots as the workbench reads and writes them. Reading: only regular files, never through a symbolic
 * link (its target may lie outside the roots) and never a FIFO or device (an open would wait forever). Writing: a
 * new file or folder gets the permissions any new one gets here (0644 and 0755 under the usual umask 0022, not the
 * 0600/0700 of {@link Files#createTempFile}); a replaced file keeps its own.
 */
final class RootFiles {
    private RootFiles() { }

    /** A regular file itself: not a symbolic link (whatever it leads to), folder, FIFO, device or socket. */
    static boolean isRegular(Path p) {
        return Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS);
    }

    static boolean exists(Path p) {
        return Files.exists(p, LinkOption.NOFOLLOW_LINKS);
    }

    /** What a present file that is not {@link #isRegular regular} is, for messages: "not a regular file (a ...)". */
    static String notRegular(Path p) {
        String what;
        try {
            BasicFileAttributes a = Files.readAttributes(p, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
            what = a.isSymbolicLink() ? "a symbolic link, which the workbench does not follow"
                    : a.isDirectory() ? "a folder" : "a FIFO, device or socket";
        } catch (IOException e) {
            what = "it cannot be read: " + e.getClass().getSimpleName();
        }
        return "not a regular file (" + what + ")";
    }

    /**
     * A new, empty hidden file in {@code dir} for writing a file that is then moved into place; made without
     * permissions of its own, so it has what any new file gets here.
     */
    static Path newTemporary(Path dir, String prefix) throws IOException {
        for (int attempt = 0; ; attempt++) {
            Path p = dir.resolve("." + prefix + "-" + Long.toUnsignedString(ThreadLocalRandom.current().nextLong(), 36) + ".tmp");
            try {
                return Files.createFile(p);
            } catch (FileAlreadyExistsException e) {
                if (attempt >= 100) throw e;
            }
        }
    }

    /** POSIX permissions of a file itself (not followed), or null where the platform has none. */
    static Set<PosixFilePermission> permissions(Path p) throws IOException {
        if (!posix(p)) return null;
        return Files.getPosixFilePermissions(p, LinkOption.NOFOLLOW_LINKS);
    }

    /** Gives {@code p} these permissions; nothing when null (no POSIX platform, nothing to keep). */
    static void setPermissions(Path p, Set<PosixFilePermission> permissions) throws IOException {
        if (permissions != null && posix(p)) Files.setPosixFilePermissions(p, permissions);
    }

    /**
     * The permissions a folder made without any gets here (the umask applied to 0777), measured once in a fresh
     * folder under {@code scratch}; null where the platform has no POSIX permissions.
     */
    static Set<PosixFilePermission> newFolderPermissions(Path scratch) throws IOException {
        if (!posix(scratch)) return null;
        Path probe = Files.createDirectory(scratch.resolve("permissions-probe"));
        try {
            return Set.copyOf(Files.getPosixFilePermissions(probe));
        } finally {
            Files.delete(probe);
        }
    }

    private static boolean posix(Path p) {
        return p.getFileSystem().supportedFileAttributeViews().contains("posix");
    }
}
