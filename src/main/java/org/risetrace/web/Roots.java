package org.risetrace.web;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * The folders the workbench may read series from and write board files to. A request names a place as a root
 * index and a path relative to that root, with '/' between names. Refused: absolute paths, '..' and '.' names,
 * empty names, backslashes, drive letters, control characters and any '%' left after the one URL decoding (an
 * encoded escape such as %252e%252e), and, once the path exists, anything whose real path (symbolic links
 * resolved) lies outside the root's real path.
 */
final class Roots {
    private final List<Path> roots;

    Roots(List<Path> folders) {
        if (folders.isEmpty()) throw new IllegalArgumentException("no roots");
        List<Path> real = new ArrayList<>();
        for (Path f : folders) {
            try {
                if (!Files.isDirectory(f)) throw new IllegalArgumentException(f + ": not a folder");
                real.add(f.toRealPath());
            } catch (IOException e) {
                throw new IllegalArgumentException(f + ": " + e.getMessage(), e);
            }
        }
        this.roots = List.copyOf(real);
    }

    List<Path> all() { return roots; }

    Path root(int index) {
        if (index < 0 || index >= roots.size()) throw WebError.badRequest("no root number " + index);
        return roots.get(index);
    }

    /** Parses the root index of a request ("0" when absent). */
    static int index(String value) {
        if (value == null || value.isEmpty()) return 0;
        if (!value.matches("[0-9]{1,3}")) throw WebError.badRequest("root must be a small whole number");
        return Integer.parseInt(value);
    }

    /**
     * The place a request names, confined to the root.
     *
     * @param mustExist refuse a path that does not exist (404)
     */
    Path resolve(int rootIndex, String relative, boolean mustExist) {
        Path root = root(rootIndex);
        String rel = relative == null ? "" : relative;
        check(rel);
        Path p = rel.isEmpty() ? root : root.resolve(rel).normalize();
        if (!p.startsWith(root)) throw WebError.forbidden("path leaves the root");
        if (Files.exists(p, LinkOption.NOFOLLOW_LINKS)) {
            Path real;
            try {
                real = p.toRealPath();
            } catch (IOException e) {
                throw WebError.notFound("cannot open '" + rel + "': " + e.getClass().getSimpleName());
            }
            if (!real.startsWith(root)) throw WebError.forbidden("'" + rel + "' leads outside the root (a symbolic link)");
            return real;
        }
        if (mustExist) throw WebError.notFound("'" + rel + "' does not exist under root " + rootIndex);
        // a new file: its folder must exist and be confined
        Path parent = p.getParent();
        if (parent == null || !Files.isDirectory(parent)) throw WebError.notFound("the folder of '" + rel + "' does not exist");
        try {
            Path realParent = parent.toRealPath();
            if (!realParent.startsWith(root)) throw WebError.forbidden("'" + rel + "' leads outside the root (a symbolic link)");
            return realParent.resolve(p.getFileName());
        } catch (IOException e) {
            throw WebError.notFound("cannot open the folder of '" + rel + "'");
        }
    }

    /** The checks on the text of a relative path, before it touches the file system. */
    static void check(String rel) {
        if (rel.length() > 1024) throw WebError.badRequest("path longer than 1024 characters");
        if (rel.isEmpty()) return;
        for (int i = 0; i < rel.length(); i++) {
            char c = rel.charAt(i);
            if (c < 0x20 || (c >= 0x7F && c < 0xA0)) throw WebError.badRequest("path holds a control character");
            if (c == '\\') throw WebError.badRequest("path holds a backslash; separate names with '/'");
            if (c == '%') throw WebError.badRequest("path holds an encoded escape ('%' after decoding)");
            if (c == ':') throw WebError.badRequest("path holds ':' (a drive letter or stream name)");
        }
        if (rel.startsWith("/") || rel.startsWith("~")) throw WebError.forbidden("absolute paths are refused; give a path relative to the root");
        for (String name : rel.split("/", -1)) {
            if (name.isEmpty()) throw WebError.badRequest("path holds an empty name ('//' or a trailing '/')");
            if (name.equals("..") || name.equals(".")) throw WebError.forbidden("path holds '" + name + "'; give a path inside the root");
        }
    }

    /** The path relative to its root, '/' separated (for messages and replies: no server path leaves). */
    String relative(int rootIndex, Path p) {
        Path root = root(rootIndex);
        String r = root.relativize(p).toString().replace(java.io.File.separatorChar, '/');
        return r;
    }

    /** A message with every root's real path replaced by its index, so replies never show server paths. */
    String redact(String message) {
        if (message == null) return null;
        String m = message;
        for (int i = 0; i < roots.size(); i++) {
            String r = roots.get(i).toString();
            m = m.replace(r + java.io.File.separator, "[root " + i + "]/").replace(r, "[root " + i + "]");
        }
        return m;
    }
}
