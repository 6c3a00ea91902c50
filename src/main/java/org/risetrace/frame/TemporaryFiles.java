package org.risetrace.frame;

import java.io.IOException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.concurrent.ThreadLocalRandom;

/**
 * Temporary files written beside a user's file and then moved over it. {@link Files#createTempFile} makes them 0600,
 * and a series.json, board.json or profile replaced that way became unreadable to everyone else on a shared bench;
 * these are made without permissions of their own (what any new file gets under the umask, 0644 under 0022) and,
 * when they replace a file, given that file's.
 */
public final class TemporaryFiles {
    private TemporaryFiles() { }

    /** A new, empty hidden file {@code .<prefix>-<random>.tmp} in {@code dir}. */
    public static Path beside(Path dir, String prefix) throws IOException {
        for (int attempt = 0; ; attempt++) {
            Path p = dir.resolve("." + prefix + "-"
                    + Long.toUnsignedString(ThreadLocalRandom.current().nextLong(), 36) + ".tmp");
            try {
                return Files.createFile(p);
            } catch (FileAlreadyExistsException e) {
                if (attempt >= 100) throw e;
            }
        }
    }

    /** Gives {@code tmp} the POSIX permissions of {@code replaced} when that is a file (nothing elsewhere). */
    public static void keepPermissions(Path replaced, Path tmp) throws IOException {
        if (Files.isRegularFile(replaced, LinkOption.NOFOLLOW_LINKS)
                && replaced.getFileSystem().supportedFileAttributeViews().contains("posix"))
            Files.setPosixFilePermissions(tmp, Files.getPosixFilePermissions(replaced, LinkOption.NOFOLLOW_LINKS));
    }
}
