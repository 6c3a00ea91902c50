package org.risetrace.frame;

import java.nio.file.Path;

/**
 * A user-facing failure: an input file (frame, sidecar, board file, profile, scenario) that cannot be used.
 * The CLI prints {@link #getMessage()} as one line and exits with code 1; the web API turns it into a JSON error.
 * Never thrown for programming errors.
 */
public class InputRejected extends RuntimeException {
    private final transient Path file;
    private final String reason;
    private final String hint;

    public InputRejected(Path file, String reason) {
        this(file, reason, null, null);
    }

    public InputRejected(Path file, String reason, String hint) {
        this(file, reason, hint, null);
    }

    public InputRejected(Path file, String reason, String hint, Throwable cause) {
        super(format(file, reason, hint), cause);
        this.file = file;
        this.reason = reason;
        this.hint = hint;
    }

    private static String format(Path file, String reason, String hint) {
        StringBuilder sb = new StringBuilder();
        if (file != null) sb.append(file).append(": ");
        sb.append(reason);
        if (hint != null && !hint.isBlank()) sb.append(" (").append(hint).append(')');
        return sb.toString();
    }

    public Path file() { return file; }
    public String reason() { return reason; }
    public String hint() { return hint; }
}
