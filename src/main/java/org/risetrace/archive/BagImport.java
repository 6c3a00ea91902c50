package org.risetrace.archive;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.apache.commons.compress.archivers.zip.ZipArchiveEntry;
import org.apache.commons.compress.archivers.zip.ZipFile;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.nio.file.attribute.BasicFileAttributes;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.sql.PreparedStatement;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

/**
 * Imports a case from a bag (a folder, or a zip holding one) made by {@link BagExport}. The bag is checked whole
 * before anything is stored: every path stays inside the bag (no '..', no absolute path, no link, the same for zip
 * entries), no name appears twice, the entry count and unpacked size stay under the limits (counted while
 * unpacking, not taken from the zip's headers), every manifest line's checksum holds, no payload file is missing
 * or unlisted, and case.json agrees with the manifest. A zip is unpacked only into a temporary folder inside the
 * archive. On any error the import is refused whole: no record is written.
 */
public final class BagImport {
    /** Limits against a hostile or broken bag. */
    public record Limits(int maxEntries, long maxTotalBytes) {
        public static Limits defaults() {
            return new Limits(200_000, 64L << 30);
        }
    }

    /** What was imported. */
    public record Result(String caseNumber, int series, int analyses, int files, long bytes) { }

    private static final ObjectMapper JSON = new ObjectMapper();
    private static final Pattern MANIFEST_NAME = Pattern.compile("(tag)?manifest-([a-z0-9]+)\\.txt");
    private static final Pattern LINE = Pattern.compile("([0-9A-Fa-f]+)[ \\t]+(.+)");

    private BagImport() { }

    public static Result importBag(Archive a, Path bag, Limits limits) {
        if (!Files.exists(bag, LinkOption.NOFOLLOW_LINKS)) throw new ArchiveException(bag, "not found");
        if (Files.isSymbolicLink(bag)) throw new ArchiveException(bag, "is a symbolic link", "name the bag itself");
        Path work = null;
        try {
            Path dir = bag;
            if (Files.isRegularFile(bag, LinkOption.NOFOLLOW_LINKS)) {
                work = a.store.temporaryFolder();
                dir = unzip(bag, work.resolve("bag"), limits);
            } else if (!Files.isDirectory(bag, LinkOption.NOFOLLOW_LINKS)) {
                throw new ArchiveException(bag, "neither a folder nor a zip file");
            }
            Checked checked = check(bag, dir, limits);
            return store(a, bag, dir, checked);
        } catch (IOException e) {
            throw new ArchiveException(bag, "cannot read the bag: " + e.getMessage(), null, e);
        } finally {
            if (work != null) try {
                ContentStore.deleteTree(work);
            } catch (IOException ignored) {
                // the next open sweeps it
            }
        }
    }

    /** Unpacks a zip into {@code into} with every entry checked first; returns the bag's folder. */
    static Path unzip(Path zip, Path into, Limits limits) throws IOException {
        try (ZipFile z = ZipFile.builder().setPath(zip).get()) {
            List<ZipArchiveEntry> entries = Collections.list(z.getEntries());
            if (entries.size() > limits.maxEntries())
                throw new ArchiveException(zip, entries.size() + " entries, more than the limit of " + limits.maxEntries());
            Set<String> seen = new HashSet<>();
            String top = null;
            boolean rootBag = false;
            for (ZipArchiveEntry e : entries) {
                String name = e.getName();
                String why = BagFormat.unsafe(name);
                if (why != null) throw new ArchiveException(zip, "entry '" + name + "' is " + why);
                if (e.isUnixSymlink()) throw new ArchiveException(zip, "entry '" + name + "' is a symbolic link");
                String key = (name.endsWith("/") ? name.substring(0, name.length() - 1) : name).toLowerCase(Locale.ROOT);
                if (!seen.add(key)) throw new ArchiveException(zip, "entry '" + name + "' appears twice");
                if (name.equals(BagFormat.BAGIT_TXT)) rootBag = true;
                if (name.endsWith("/" + BagFormat.BAGIT_TXT) && name.indexOf('/') == name.length() - BagFormat.BAGIT_TXT.length() - 1)
                    top = name.substring(0, name.indexOf('/'));
            }
            if (!rootBag && top == null) throw new ArchiveException(zip, "no bagit.txt at the top of the zip", "is it a bag?");
            if (!rootBag)
                for (ZipArchiveEntry e : entries)
                    if (!e.getName().startsWith(top + "/") && !e.getName().equals(top + "/"))
                        throw new ArchiveException(zip, "entry '" + e.getName() + "' lies outside the bag folder '" + top + "'");
            long total = 0;
            Files.createDirectories(into);
            for (ZipArchiveEntry e : entries) {
                Path t = into.resolve(e.getName()).normalize();
                if (!t.startsWith(into)) throw new ArchiveException(zip, "entry '" + e.getName() + "' leaves the bag");
                if (e.isDirectory()) {
                    Files.createDirectories(t);
                    continue;
                }
                Files.createDirectories(t.getParent());
                try (InputStream in = z.getInputStream(e);
                     OutputStream out = Files.newOutputStream(t, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE,
                             LinkOption.NOFOLLOW_LINKS)) {
                    byte[] buf = new byte[Hashes.BUFFER];
                    for (int n; (n = in.read(buf)) > 0; ) {
                        total += n;
                        if (total > limits.maxTotalBytes())
                            throw new ArchiveException(zip, "unpacks to more than " + limits.maxTotalBytes()
                                    + " bytes, the limit (entry '" + e.getName() + "')");
                        out.write(buf, 0, n);
                    }
                }
            }
            return rootBag ? into : into.resolve(top);
        } catch (java.util.zip.ZipException e) {
            throw new ArchiveException(zip, "not a readable zip file: " + e.getMessage(), null, e);
        }
    }

    /** A checked bag: the payload paths with their SHA-256, and the parsed case record. */
    record Checked(Map<String, String> sha256ByPath, JsonNode record, String manifestSha256) { }

    static Checked check(Path label, Path dir, Limits limits) throws IOException {
        // 1. the tree: regular files and folders only, within the limits
        List<String> files = new ArrayList<>();
        long[] total = {0};
        try (Stream<Path> s = Files.walk(dir)) {
            for (Path p : (Iterable<Path>) s::iterator) {
                BasicFileAttributes at = Files.readAttributes(p, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
                String rel = dir.relativize(p).toString().replace(java.io.File.separatorChar, '/');
                if (at.isSymbolicLink()) throw new ArchiveException(label, "'" + rel + "' is a symbolic link");
                if (at.isDirectory()) continue;
                if (!at.isRegularFile()) throw new ArchiveException(label, "'" + rel + "' is not a regular file");
                files.add(rel);
                total[0] += at.size();
                if (files.size() > limits.maxEntries())
                    throw new ArchiveException(label, "more files than the limit of " + limits.maxEntries());
                if (total[0] > limits.maxTotalBytes())
                    throw new ArchiveException(label, "more bytes than the limit of " + limits.maxTotalBytes());
            }
        }
        // 2. the declaration
        if (!files.contains(BagFormat.BAGIT_TXT)) throw new ArchiveException(label, "no bagit.txt", "is it a bag?");
        String decl = utf8(label, dir.resolve(BagFormat.BAGIT_TXT)).replace("\r\n", "\n").replace('\r', '\n');
        Map<String, String> declared = labels(label, decl, BagFormat.BAGIT_TXT);
        if (!"1.0".equals(declared.get("BagIt-Version")))
            throw new ArchiveException(label, "bagit.txt declares version " + declared.get("BagIt-Version") + ", not 1.0");
        if (!"UTF-8".equalsIgnoreCase(declared.get("Tag-File-Character-Encoding")))
            throw new ArchiveException(label, "tag files are not declared UTF-8");
        // 3. the manifests: every line checked, every payload file listed in every payload manifest
        Set<String> payload = new HashSet<>();
        for (String f : files) if (f.startsWith(BagFormat.DATA)) payload.add(f);
        Map<String, String> sha256 = null;
        String manifestSha = null;
        boolean any = false;
        for (String f : files) {
            Matcher m = MANIFEST_NAME.matcher(f);
            if (!m.matches()) continue;
            boolean tag = m.group(1) != null;
            String alg = m.group(2);
            Map<String, String> listed = manifest(label, dir, f, alg, tag);
            if (!tag) {
                any = true;
                Set<String> missing = new HashSet<>(listed.keySet());
                missing.removeAll(payload);
                if (!missing.isEmpty()) throw new ArchiveException(label, f + " lists '" + missing.iterator().next()
                        + "', which is not in the bag");
                Set<String> extra = new HashSet<>(payload);
                extra.removeAll(listed.keySet());
                if (!extra.isEmpty()) throw new ArchiveException(label, "payload file '" + extra.iterator().next()
                        + "' is not in " + f);
                if (alg.equals("sha256")) {
                    sha256 = listed;
                    manifestSha = Hashes.of(dir.resolve(f));
                }
            } else {
                for (String p : listed.keySet())
                    if (p.startsWith(BagFormat.DATA)) throw new ArchiveException(label, f + " lists payload file '" + p + "'");
            }
        }
        if (!any || sha256 == null) throw new ArchiveException(label, "no manifest-sha256.txt", "risetrace bags carry SHA-256");
        // 4. the payload's count and size, when bag-info.txt gives them
        if (files.contains(BagFormat.BAG_INFO)) {
            String info = utf8(label, dir.resolve(BagFormat.BAG_INFO));
            Map<String, String> infoLabels = labels(label, info, BagFormat.BAG_INFO);
            String oxum = infoLabels.get("Payload-Oxum");
            if (oxum != null) {
                long octets = 0;
                for (String p : payload) octets += Files.size(dir.resolve(p));
                if (!oxum.equals(octets + "." + payload.size()))
                    throw new ArchiveException(label, "Payload-Oxum says " + oxum + ", the payload is " + octets + "." + payload.size());
            }
        }
        // 5. the case record against the manifest
        String caseJson = BagFormat.DATA + BagFormat.CASE_JSON;
        if (!sha256.containsKey(caseJson)) throw new ArchiveException(label, "no data/case.json", "not a risetrace case bag");
        JsonNode record;
        try {
            record = JSON.readTree(Files.readAllBytes(dir.resolve(caseJson)));
        } catch (IOException e) {
            throw new ArchiveException(label, "data/case.json cannot be read: " + e.getMessage());
        }
        if (!"risetrace-case".equals(record.path("format").asText()) || record.path("format_version").asInt() != 1)
            throw new ArchiveException(label, "data/case.json is not a risetrace case record of format 1");
        Set<String> referenced = new HashSet<>();
        referenced.add(caseJson);
        for (JsonNode f : fileNodes(record)) {
            String path = BagFormat.DATA + f.path("path").asText();
            String want = sha256.get(path);
            if (want == null) throw new ArchiveException(label, "data/case.json names '" + path + "', which the manifest does not list");
            if (!want.equals(f.path("sha256").asText()))
                throw new ArchiveException(label, "data/case.json and the manifest give '" + path + "' different SHA-256s");
            if (Files.size(dir.resolve(path)) != f.path("sizeBytes").asLong())
                throw new ArchiveException(label, "data/case.json gives '" + path + "' another size");
            referenced.add(path);
        }
        for (String p : sha256.keySet())
            if (!referenced.contains(p)) throw new ArchiveException(label, "payload file '" + p + "' belongs to no record of the case");
        return new Checked(sha256, record, manifestSha);
    }

    static List<JsonNode> fileNodes(JsonNode record) {
        List<JsonNode> out = new ArrayList<>();
        for (JsonNode s : record.path("series")) for (JsonNode f : s.path("files")) out.add(f);
        for (JsonNode an : record.path("analyses")) for (JsonNode o : an.path("outputs")) out.add(o);
        for (JsonNode o : record.path("documents")) out.add(o);
        return out;
    }

    /** One manifest: path -> checksum, each path safe and listed once, each checksum recomputed and compared. */
    private static Map<String, String> manifest(Path label, Path dir, String name, String alg, boolean tag) throws IOException {
        String algorithm = switch (alg) {
            case "sha256" -> "SHA-256";
            case "sha512" -> "SHA-512";
            case "sha1" -> "SHA-1";
            case "md5" -> "MD5";
            default -> throw new ArchiveException(label, name + ": checksum algorithm '" + alg + "' is not supported");
        };
        Map<String, String> out = new LinkedHashMap<>();
        String text = utf8(label, dir.resolve(name));
        int lineNo = 0;
        for (String line : text.split("\r\n|\n|\r")) {
            lineNo++;
            if (line.isEmpty()) continue;
            Matcher m = LINE.matcher(line);
            if (!m.matches()) throw new ArchiveException(label, name + " line " + lineNo + ": not 'checksum path'");
            String path = BagFormat.decodePath(m.group(2));
            String why = BagFormat.unsafe(path);
            if (why != null) throw new ArchiveException(label, name + " line " + lineNo + ": " + why + " ('" + path + "')");
            if (!tag && !path.startsWith(BagFormat.DATA))
                throw new ArchiveException(label, name + " line " + lineNo + ": '" + path + "' is not under data/");
            if (out.put(path, m.group(1).toLowerCase(Locale.ROOT)) != null)
                throw new ArchiveException(label, name + " lists '" + path + "' twice");
            Path file = dir.resolve(path);
            if (!Files.isRegularFile(file, LinkOption.NOFOLLOW_LINKS))
                throw new ArchiveException(label, name + " lists '" + path + "', which is not in the bag");
            String actual = digest(file, algorithm);
            if (!actual.equals(m.group(1).toLowerCase(Locale.ROOT)))
                throw new ArchiveException(label, "'" + path + "' does not match its checksum in " + name);
        }
        return out;
    }

    private static String digest(Path file, String algorithm) throws IOException {
        MessageDigest md;
        try {
            md = MessageDigest.getInstance(algorithm);
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
        try (InputStream in = Files.newInputStream(file, LinkOption.NOFOLLOW_LINKS)) {
            byte[] buf = new byte[Hashes.BUFFER];
            for (int n; (n = in.read(buf)) > 0; ) md.update(buf, 0, n);
        }
        return Hashes.hex(md.digest());
    }

    private static String utf8(Path label, Path file) throws IOException {
        if (Files.size(file) > 64L << 20) throw new ArchiveException(label, file.getFileName() + " is larger than 64 MB");
        try {
            return StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .decode(java.nio.ByteBuffer.wrap(Files.readAllBytes(file))).toString();
        } catch (CharacterCodingException e) {
            throw new ArchiveException(label, file.getFileName() + " is not UTF-8 text");
        }
    }

    /** Label: value lines (RFC 8493 section 2.2.2), a continuation line starting with white space. */
    private static Map<String, String> labels(Path label, String text, String name) {
        Map<String, String> out = new HashMap<>();
        String last = null;
        for (String line : text.split("\r\n|\n|\r")) {
            if (line.isEmpty()) continue;
            if ((line.startsWith(" ") || line.startsWith("\t")) && last != null) {
                out.put(last, out.get(last) + " " + line.strip());
                continue;
            }
            int colon = line.indexOf(':');
            if (colon <= 0) throw new ArchiveException(label, name + ": a line without 'Label: value'");
            last = line.substring(0, colon).strip();
            out.put(last, line.substring(colon + 1).strip());
        }
        return out;
    }

    /** Stores the checked files, then writes every record and its custody entry in one transaction. */
    private static Result store(Archive a, Path bag, Path dir, Checked ck) throws IOException {
        JsonNode r = ck.record();
        JsonNode c = r.path("case");
        String caseNumber = c.path("caseNumber").asText(null);
        if (caseNumber == null || !Archive.CASE_NUMBER.matcher(caseNumber).matches())
            throw new ArchiveException(bag, "data/case.json: the case number is missing or not usable");
        for (JsonNode s : r.path("series"))
            if (!Archive.SERIES_NAME.matcher(s.path("name").asText("")).matches())
                throw new ArchiveException(bag, "data/case.json: series name '" + s.path("name").asText() + "' is not usable");
        for (JsonNode f : fileNodes(r)) {
            String name = f.has("fileName") ? f.path("fileName").asText() : f.path("name").asText();
            if (!Archive.plainName(name))
                throw new ArchiveException(bag, "data/case.json: file name '" + name + "' is not a plain file name");
        }
        // the dates kept as they were: each must be a time as the archive writes them, so listings sort it as time
        List<JsonNode> dated = new ArrayList<>(List.of(c));
        r.path("series").forEach(dated::add);
        r.path("documents").forEach(dated::add);
        for (JsonNode an : r.path("analyses")) {
            dated.add(an);
            an.path("outputs").forEach(dated::add);
        }
        for (JsonNode n : dated)
            for (String field : new String[]{"openedAt", "closedAt", "addedAt", "analysedAt", "madeAt"}) {
                String t = text(n, field);
                if (t != null && !isTime(t))
                    throw new ArchiveException(bag, "data/case.json: " + field + " '" + t + "' is not a time",
                            "an ISO-8601 UTC time such as 2026-12-03T07:17:49.415Z");
            }
        if (a.index.read(conn -> Archive.caseRow(conn, caseNumber)) != null)
            throw new ArchiveException(bag, "case " + caseNumber + " is in this archive already",
                    "'risetrace case verify " + caseNumber + "' checks the one there");
        long bytes = 0;
        for (Map.Entry<String, String> e : ck.sha256ByPath().entrySet()) {
            ContentStore.Stored st = a.store.put(dir.resolve(e.getKey()), e.getValue());
            bytes += st.sizeBytes();
        }
        ContentStore.Stored record = a.store.put(dir.resolve(BagFormat.DATA + BagFormat.CASE_JSON),
                ck.sha256ByPath().get(BagFormat.DATA + BagFormat.CASE_JSON));
        long totalBytes = bytes;
        return a.index.write(conn -> {
            if (Archive.caseRow(conn, caseNumber) != null)
                throw new ArchiveException(bag, "case " + caseNumber + " is in this archive already");
            String status = c.path("status").asText("open");
            try (PreparedStatement ps = conn.prepareStatement("INSERT INTO cases (case_number, customer_ref, device, "
                    + "serial_number, fault, technician, status, opened_at, closed_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)")) {
                ps.setString(1, caseNumber);
                ps.setString(2, text(c, "customerRef"));
                ps.setString(3, text(c, "device"));
                ps.setString(4, text(c, "serialNumber"));
                ps.setString(5, text(c, "fault"));
                ps.setString(6, text(c, "technician"));
                ps.setString(7, Archive.STATUSES.contains(status) ? status : "open");
                ps.setString(8, c.path("openedAt").asText(Index.now()));
                ps.setString(9, text(c, "closedAt"));
                ps.executeUpdate();
            }
            String detail = "from bag " + bag.getFileName();
            Custody.append(conn, a.who, "import-case", caseNumber, Digests.caseSubject(caseNumber), ck.manifestSha256(),
                    Digests.of(conn, Digests.caseSubject(caseNumber)), detail);
            int files = 0;
            for (JsonNode s : r.path("series")) {
                List<Archive.StoredFile> sf = new ArrayList<>();
                for (JsonNode f : s.path("files"))
                    sf.add(new Archive.StoredFile(f.path("index").asInt(), f.path("role").asText(), f.path("fileName").asText(),
                            f.path("sha256").asText(), f.path("sizeBytes").asLong(), text(f, "modifiedAt")));
                files += sf.size();
                String name = s.path("name").asText();
                Archive.insertSeries(conn, new Archive.SeriesRecord(caseNumber, name, s.path("addedAt").asText(Index.now()),
                        s.path("addedBy").asText(a.who), text(s, "source"), text(s, "injection"), text(s, "notes"), sf.size(), sf));
                String subject = Digests.seriesSubject(caseNumber, name);
                Custody.append(conn, a.who, "import-series", caseNumber, subject, null, Digests.of(conn, subject), detail);
            }
            int analyses = 0;
            for (JsonNode an : r.path("analyses")) {
                long id = Index.next(conn, "analyses", "id");
                try (PreparedStatement ps = conn.prepareStatement("INSERT INTO analyses (id, case_number, series_name, "
                        + "analysed_at, analysed_by, tool_version, mode, parameters, verdict_status, verdict_ref, headline, "
                        + "reason) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)")) {
                    ps.setLong(1, id);
                    ps.setString(2, caseNumber);
                    ps.setString(3, an.path("seriesName").asText());
                    ps.setString(4, an.path("analysedAt").asText());
                    ps.setString(5, an.path("analysedBy").asText());
                    ps.setString(6, an.path("toolVersion").asText());
                    ps.setString(7, an.path("mode").asText());
                    ps.setString(8, an.path("parameters").asText("{}"));
                    ps.setString(9, text(an, "verdictStatus"));
                    ps.setString(10, text(an, "verdictRef"));
                    ps.setString(11, text(an, "headline"));
                    ps.setString(12, text(an, "reason"));
                    ps.executeUpdate();
                }
                for (JsonNode o : an.path("outputs")) {
                    a.recordOutput(conn, caseNumber, id, o.path("kind").asText("analysis-output"), o.path("name").asText(),
                            new ContentStore.Stored(o.path("sha256").asText(), o.path("sizeBytes").asLong(), false),
                            text(o, "madeAt"), null, null);
                    files++;
                }
                String subject = Digests.analysisSubject(id);
                Custody.append(conn, a.who, "import-analysis", caseNumber, subject, null, Digests.of(conn, subject),
                        detail + " (analysis " + an.path("id").asText() + " there)");
                analyses++;
            }
            for (JsonNode o : r.path("documents")) {
                // the document keeps the date it was made and is logged as imported (README: an imported case keeps
                // its records as they were), not as a customer report made at the moment of import
                a.recordOutput(conn, caseNumber, null, o.path("kind").asText("document"), o.path("name").asText(),
                        new ContentStore.Stored(o.path("sha256").asText(), o.path("sizeBytes").asLong(), false),
                        text(o, "madeAt"), "import-document", detail + " (" + o.path("kind").asText("document") + " "
                                + o.path("name").asText() + ", document " + o.path("id").asText() + " there)");
                files++;
            }
            a.recordOutput(conn, caseNumber, null, "imported-case-record", "case.json from " + bag.getFileName(), record, true);
            return new Result(caseNumber, r.path("series").size(), analyses, files, totalBytes);
        });
    }

    private static boolean isTime(String t) {
        try {
            java.time.Instant.parse(t);
            return t.length() <= 40;
        } catch (java.time.format.DateTimeParseException e) {
            return false;
        }
    }

    private static String text(JsonNode n, String field) {
        JsonNode v = n.get(field);
        return v == null || v.isNull() ? null : v.asText();
    }
}
