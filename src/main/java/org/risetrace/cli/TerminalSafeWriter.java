package org.risetrace.cli;

import java.io.FilterWriter;
import java.io.IOException;
import java.io.Writer;

/**
 * Replaces control characters on their way to the terminal with U+FFFD: designators, file names and messages come
 * from user files, and an ESC or BEL in them would otherwise drive the terminal (colours, titles, cursor moves).
 * Line feed, carriage return (the progress bar) and tab pass. JSON output is unaffected: its writer escapes every
 * control character in strings (RFC 8259 section 7).
 */
final class TerminalSafeWriter extends FilterWriter {
    static final char REPLACEMENT = '\uFFFD';

    TerminalSafeWriter(Writer out) {
        super(out);
    }

    static boolean unsafe(int c) {
        return (c < 0x20 && c != '\n' && c != '\r' && c != '\t') || (c >= 0x7F && c < 0xA0);
    }

    @Override
    public void write(int c) throws IOException {
        super.write(unsafe(c) ? REPLACEMENT : c);
    }

    @Override
    public void write(char[] buf, int off, int len) throws IOException {
        char[] copy = null;
        for (int i = 0; i < len; i++)
            if (unsafe(buf[off + i])) {
                if (copy == null) copy = java.util.Arrays.copyOfRange(buf, off, off + len);
                copy[i] = REPLACEMENT;
            }
        if (copy == null) super.write(buf, off, len);
        else super.write(copy, 0, len);
    }

    @Override
    public void write(String s, int off, int len) throws IOException {
        write(s.toCharArray(), off, len);
    }
}
