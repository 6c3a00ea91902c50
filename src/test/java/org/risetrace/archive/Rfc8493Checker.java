package org.risetrace.archive;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HexFormat;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;

/**
 * An independent checker of a bag folder, written from RFC 8493 (The BagIt File Packaging Format, version 1.0)
 * alone and sharing no code with the archive: section 2.1.1 (bagit.txt: exactly two lines, version then encoding),
 * 2.1.2 (the data folder), 2.1.3 (payload manifests: "checksum whitespace path", paths relative to the bag, under
 * data/, CR/LF/% percent-encoded), 2.2.1 (tag manifests list tag files only), 2.2.2 (bag-info.txt "Label: value";
 * Payload-Oxum "octets.count"), and section 3 (complete: every payload file in every payload manifest and every
 * listed file present; valid: every checksum matches). Returns the violations found, empty for a valid bag.
 */
final class Rfc8493Checker {
    private Rfc8493Checker() { }

    static List<String> check(Path bag) throws IOException {
        List<String> errors = new ArrayList<>();
        Path bagit = bag.resolve("bagit.txt");
        if (!Files.isRegularFile(bagit)) {
            errors.add("2.1.1: no bagit.txt");
            return errors;
        }
        List<String> decl = lines(Files.readString(bagit, StandardCharsets.UTF_8));
        if (decl.size() != 2) errors.add("2.1.1: bagit.txt has " + decl.size() + " lines, not 2");
        else {
            if (!decl.get(0).matches("BagIt-Version: [0-9]+\\.[0-9]+")) errors.add("2.1.1: first line " + decl.get(0));
            if (!decl.get(1).startsWith("Tag-File-Character-Encoding: ")) errors.add("2.1.1: second line " + decl.get(1));
        }
        if (!Files.isDirectory(bag.resolve("data"), LinkOption.NOFOLLOW_LINKS)) errors.add("2.1.2: no data folder");
        Set<String> payload = new HashSet<>(), tagFiles = new HashSet<>();
        try (Stream<Path> s = Files.walk(bag)) {
            for (Path p : s.toList()) {
                if (Files.isSymbolicLink(p)) errors.add("a symbolic link: " + p);
                if (!Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS)) continue;
                String rel = bag.relativize(p).toString().replace('\\', '/');
                if (rel.startsWith("data/")) payload.add(rel);
                else tagFiles.add(rel);
            }
        }
        int payloadManifests = 0;
        for (String tag : tagFiles) {
            boolean isTagManifest = tag.matches("tagmanifest-[a-z0-9]+\\.txt");
            boolean isManifest = tag.matches("manifest-[a-z0-9]+\\.txt");
            if (!isTagManifest && !isManifest) continue;
            String alg = tag.substring(tag.indexOf('-') + 1, tag.length() - 4);
            Map<String, String> listed = new HashMap<>();
            for (String line : lines(Files.readString(bag.resolve(tag), StandardCharsets.UTF_8))) {
                int ws = indexOfWhitespace(line);
                if (ws <= 0) {
                    errors.add("2.1.3: " + tag + " line without a path: " + line);
                    continue;
                }
                String sum = line.substring(0, ws);
                String path = unescape(line.substring(ws).replaceFirst("^[ \\t]+", ""));
                if (path.startsWith("/") || ("/" + path + "/").contains("/../"))
                    errors.add("2.1.3: " + tag + " path outside the bag: " + path);
                if (listed.put(path, sum.toLowerCase()) != null) errors.add(tag + ": " + path + " listed twice");
            }
            if (isManifest) {
                payloadManifests++;
                for (String p : listed.keySet()) if (!p.startsWith("data/")) errors.add("2.1.3: " + tag + " lists " + p + " outside data/");
                for (String p : payload) if (!listed.containsKey(p)) errors.add("3: " + p + " is not in " + tag);
            } else {
                for (String p : listed.keySet()) if (p.startsWith("data/")) errors.add("2.2.1: " + tag + " lists payload " + p);
            }
            for (Map.Entry<String, String> e : listed.entrySet()) {
                Path f = bag.resolve(e.getKey());
                if (!Files.isRegularFile(f, LinkOption.NOFOLLOW_LINKS)) {
                    errors.add("3: " + tag + " lists missing " + e.getKey());
                    continue;
                }
                String actual = digest(f, alg);
                if (actual == null) errors.add(tag + ": unknown algorithm " + alg);
                else if (!actual.equals(e.getValue())) errors.add("3: checksum of " + e.getKey() + " differs in " + tag);
            }
        }
        if (payloadManifests == 0) errors.add("2.1.3: no payload manifest");
        Path info = bag.resolve("bag-info.txt");
        if (Files.isRegularFile(info)) {
            for (String line : lines(Files.readString(info, StandardCharsets.UTF_8))) {
                if (line.startsWith(" ") || line.startsWith("\t")) continue;
                int colon = line.indexOf(':');
                if (colon <= 0) errors.add("2.2.2: bag-info.txt line without a label: " + line);
                else if (line.substring(0, colon).equals("Payload-Oxum")) {
                    long octets = 0;
                    for (String p : payload) octets += Files.size(bag.resolve(p));
                    if (!line.substring(colon + 1).strip().equals(octets + "." + payload.size()))
                        errors.add("2.2.2: Payload-Oxum " + line + " but the payload is " + octets + "." + payload.size());
                }
            }
        }
        return errors;
    }

    private static int indexOfWhitespace(String s) {
        for (int i = 0; i < s.length(); i++) if (s.charAt(i) == ' ' || s.charAt(i) == '\t') return i;
        return -1;
    }

    private static String unescape(String p) {
        return p.replace("%0A", "\n").replace("%0a", "\n").replace("%0D", "\r").replace("%0d", "\r").replace("%25", "%");
    }

    private static List<String> lines(String text) {
        List<String> out = new ArrayList<>();
        for (String l : text.split("\r\n|\n")) if (!l.isEmpty()) out.add(l);
        return out;
    }

    private static String digest(Path f, String alg) throws IOException {
        String name = switch (alg) {
            case "md5" -> "MD5";
            case "sha1" -> "SHA-1";
            case "sha256" -> "SHA-256";
            case "sha512" -> "SHA-512";
            default -> null;
        };
        if (name == null) return null;
        try (InputStream in = Files.newInputStream(f)) {
            MessageDigest md = MessageDigest.getInstance(name);
            byte[] buf = new byte[8192];
            for (int n; (n = in.read(buf)) > 0; ) md.update(buf, 0, n);
            return HexFormat.of().formatHex(md.digest());
        } catch (java.security.NoSuchAlgorithmException e) {
            return null;
        }
    }
}
