package org.risetrace.batch;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.UUID;

/**
 * Writes a file under a temporary name in the same folder and renames it, so a reader (or a run killed half-way)
 * sees the old file or the whole new one, never half of it.
 */
final class AtomicFiles {
    private AtomicFiles() {
    }

    static void writeString(Path file, String text) throws IOException {
        Files.createDirectories(file.toAbsolutePath().getParent());
        Path tmp = file.resolveSibling("." + file.getFileName() + ".tmp-" + UUID.randomUUID());
        try {
            Files.writeString(tmp, text, StandardCharsets.UTF_8);
            move(tmp, file);
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    /** Copies into a temporary name beside the target, then renames. */
    static void copy(Path from, Path to) throws IOException {
        Files.createDirectories(to.toAbsolutePath().getParent());
        Path tmp = to.resolveSibling("." + to.getFileName() + ".tmp-" + UUID.randomUUID());
        try {
            Files.copy(from, tmp);
            move(tmp, to);
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    /** A rename within one folder: atomic where the file system supports it (every local POSIX one does). */
    static void move(Path from, Path to) throws IOException {
        try {
            Files.move(from, to, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(from, to, StandardCopyOption.REPLACE_EXISTING);
        }
    }
}
