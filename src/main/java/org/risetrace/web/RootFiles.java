package org.risetrace.web;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;

/**
 * Files in the roots as the workbench reads and writes them. Reading: only regular files, never through a symbolic
 * link (its target may lie outside the roots) and never a FIFO or device (an open would wait forever). Writing: a
 * new file gets the permissions any new one gets here ({@link org.risetrace.frame.TemporaryFiles}); a replaced file
 * keeps its own.
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
}
