package org.risetrace.archive;

import java.util.Locale;

/**
 * The pieces of RFC 8493 (The BagIt File Packaging Format, version 1.0) that writer and reader share: file names
 * of the tag files, the percent-encoding of paths in manifests (section 2.1.3: only CR, LF and '%' are encoded), and
 * the one check every path of a bag passes before it is used.
 */
final class BagFormat {
    static final String BAGIT_TXT = "bagit.txt";
    static final String BAG_INFO = "bag-info.txt";
    static final String MANIFEST = "manifest-sha256.txt";
    static final String TAG_MANIFEST = "tagmanifest-sha256.txt";
    static final String DATA = "data/";
    static final String CASE_JSON = "case.json";
    static final String DECLARATION = "BagIt-Version: 1.0\nTag-File-Character-Encoding: UTF-8\n";

    private BagFormat() { }

    /** RFC 8493 section 2.1.3: CR, LF and '%' in a file path are written as %0D, %0A and %25. */
    static String encodePath(String path) {
        return path.replace("%", "%25").replace("\r", "%0D").replace("\n", "%0A");
    }

    static String decodePath(String path) {
        StringBuilder sb = new StringBuilder(path.length());
        for (int i = 0; i < path.length(); i++) {
            char c = path.charAt(i);
            if (c == '%' && i + 2 < path.length()) {
                String code = path.substring(i + 1, i + 3).toUpperCase(Locale.ROOT);
                switch (code) {
                    case "25" -> { sb.append('%'); i += 2; continue; }
                    case "0D" -> { sb.append('\r'); i += 2; continue; }
                    case "0A" -> { sb.append('\n'); i += 2; continue; }
                    default -> { }
                }
            }
            sb.append(c);
        }
        return sb.toString();
    }

    /**
     * Null when {@code path} (relative, '/'-separated) is safe to use under a bag's folder; else why not: empty,
     * absolute, a drive letter, a backslash, a control character, or a segment that is empty, '.' or '..'.
     */
    static String unsafe(String path) {
        if (path.isEmpty()) return "an empty path";
        if (path.startsWith("/")) return "an absolute path";
        if (path.length() >= 2 && path.charAt(1) == ':') return "a path with a drive letter";
        if (path.indexOf('\\') >= 0) return "a path with a backslash";
        for (int i = 0; i < path.length(); i++)
            if (Character.isISOControl(path.charAt(i))) return "a path with a control character";
        String trimmed = path.endsWith("/") ? path.substring(0, path.length() - 1) : path;
        for (String seg : trimmed.split("/", -1)) {
            if (seg.isEmpty()) return "a path with an empty segment";
            if (seg.equals("..")) return "a path that climbs out of the bag ('..')";
            if (seg.equals(".")) return "a path with a '.' segment";
        }
        return null;
    }

    /** A value of bag-info.txt on one line: line breaks become spaces (the case record keeps the exact text). */
    static String infoValue(String v) {
        return v.replaceAll("[\\r\\n\\t]+", " ").strip();
    }
}
