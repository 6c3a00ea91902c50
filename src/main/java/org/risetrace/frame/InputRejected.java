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
        return oneLine(sb.toString());
    }

    /**
     * The message as one line without control characters: parts of it (file names, values, parser messages) come
     * from the user's files, and a line feed or an ESC there would split the line or drive the terminal.
     */
    static String oneLine(String s) {
        StringBuilder out = null;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c < 0x20 || (c >= 0x7F && c < 0xA0)) {
                if (out == null) out = new StringBuilder(s.substring(0, i));
                out.append(c == '\t' ? ' ' : '\uFFFD');
            } else if (out != null) {
                out.append(c);
            }
        }
        return out == null ? s : out.toString();
    }

    public Path file() { return file; }
    public String reason() { return reason; }
    public String hint() { return hint; }
}
