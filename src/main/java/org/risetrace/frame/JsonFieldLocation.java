package org.risetrace.frame;

import java.nio.charset.StandardCharsets;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Where a field name stands in a JSON text, for error messages about user files (profiles, sidecars). Jackson
 * reports an unknown field of a record where the record's object ends, so the message looks the name up instead.
 */
public final class JsonFieldLocation {
    private JsonFieldLocation() {
    }

    /** " at line L, column C" of the first {@code "field":} in the text, or "" when it does not occur. */
    public static String of(byte[] json, String field) {
        String text = new String(json, StandardCharsets.UTF_8);
        Matcher m = Pattern.compile("\"" + Pattern.quote(field) + "\"\\s*:").matcher(text);
        if (!m.find()) return "";
        int line = 1, col = 1;
        for (int i = 0; i < m.start(); i++) {
            if (text.charAt(i) == '\n') {
                line++;
                col = 1;
            } else {
                col++;
            }
        }
        return " at line " + line + ", column " + col;
    }
}
