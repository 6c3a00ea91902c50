package org.risetrace.frame;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * A file written beside a user's file and moved over it gets what any new file gets under the umask, or the replaced
 * file's permissions (common practice on a shared bench: a series.json or profile others could read stays readable;
 * Files.createTempFile's 0600 made it private).
 */
class TemporaryFilesTest {
    @Test
    void newFilesGetTheUmasksPermissionsAndReplacementsKeepTheirs(@TempDir Path dir) throws IOException {
        assumeTrue(dir.getFileSystem().supportedFileAttributeViews().contains("posix"));
        var usual = Files.getPosixFilePermissions(Files.createFile(dir.resolve("probe")));
        Path tmp = TemporaryFiles.beside(dir, "series.json");
        assertEquals(usual, Files.getPosixFilePermissions(tmp));
        assertNotEquals(tmp, TemporaryFiles.beside(dir, "series.json"), "a new name each time");
        assertEquals('.', tmp.getFileName().toString().charAt(0), "hidden: the series reader skips it");

        Path replaced = Files.writeString(dir.resolve("series.json"), "{}");
        var chosen = PosixFilePermissions.fromString("rw-r-----");
        Files.setPosixFilePermissions(replaced, chosen);
        TemporaryFiles.keepPermissions(replaced, tmp);
        assertEquals(chosen, Files.getPosixFilePermissions(tmp));
    }
}
