package org.risetrace.archive;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.regex.Pattern;

/** SHA-256 (FIPS 180-4) as lowercase hex, the form BagIt manifests and {@code sha256sum} print. */
public final class Hashes {
    private static final Pattern HEX64 = Pattern.compile("[0-9a-f]{64}");
    static final int BUFFER = 1 << 20;

    private Hashes() { }

    public static MessageDigest sha256() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every Java runtime has SHA-256", e);
        }
    }

    public static String hex(byte[] digest) {
        return HexFormat.of().formatHex(digest);
    }

    public static String of(String text) {
        return hex(sha256().digest(text.getBytes(StandardCharsets.UTF_8)));
    }

    public static String of(byte[] bytes) {
        return hex(sha256().digest(bytes));
    }

    /** The file's SHA-256, read without following a symbolic link. */
    public static String of(Path file) throws IOException {
        MessageDigest md = sha256();
        try (InputStream in = Files.newInputStream(file, StandardOpenOption.READ, LinkOption.NOFOLLOW_LINKS)) {
            byte[] buf = new byte[BUFFER];
            for (int n; (n = in.read(buf)) > 0; ) md.update(buf, 0, n);
        }
        return hex(md.digest());
    }

    public static boolean isHex(String s) {
        return s != null && HEX64.matcher(s).matches();
    }
}
