package org.risetrace.archive;

import org.risetrace.frame.InputRejected;

import java.nio.file.Path;

/** A request the archive refuses (unknown case, a damaged bag, a database it cannot use): one line for the user. */
public final class ArchiveException extends InputRejected {
    public ArchiveException(Path file, String reason) {
        super(file, reason);
    }

    public ArchiveException(Path file, String reason, String hint) {
        super(file, reason, hint);
    }

    public ArchiveException(Path file, String reason, String hint, Throwable cause) {
        super(file, reason, hint, cause);
    }
}
