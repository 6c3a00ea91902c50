package org.risetrace.archive;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.security.MessageDigest;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.zip.ZipEntry;
import java.util.zip.ZipOutputStream;

/**
 * Exports a case as a BagIt bag (RFC 8493, version 1.0), as a folder or a zip holding one:
 * <pre>
 * bagit.txt, bag-info.txt (the case fields), manifest-sha256.txt, tagmanifest-sha256.txt
 * data/case.json                       the records: case, series, files, analyses, documents, custody entries
 * data/series/NAME/FILE                the originals under their original names
 * data/analyses/ID-SERIES/FILE         each analysis' outputs
 * data/documents/ID-NAME               customer reports and other documents
 * </pre>
 * Every stored file is checked against its SHA-256 as it is copied, so a damaged original never leaves in a bag.
 * The bag is written under a temporary name beside the target and renamed into place when whole.
 */
public final class BagExport {
    static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    /** What was written. */
    public record Result(Path target, int payloadFiles, long payloadBytes, String manifestSha256) { }

    private BagExport() { }

    public static Result export(Archive a, String caseNumber, Path target, String softwareAgent) {
        boolean zip = target.getFileName().toString().toLowerCase(java.util.Locale.ROOT).endsWith(".zip");
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS))
            throw new ArchiveException(target, "exists already", "name a new folder or .zip file");
        Archive.CaseDetail d = a.show(caseNumber);
        // payload path -> stored sha256 (the case record is added as text)
        Map<String, String> payload = new LinkedHashMap<>();
        Map<String, Long> sizes = new LinkedHashMap<>();
        ObjectNode root = JSON.createObjectNode();
        root.put("format", "risetrace-case");
        root.put("format_version", 1);
        root.put("exported_at", Index.now());
        root.put("exported_by", a.who);
        root.set("case", JSON.valueToTree(d.record()));
        ArrayNode series = root.putArray("series");
        for (Archive.SeriesRecord s : d.series()) {
            ObjectNode n = JSON.valueToTree(s);
            ArrayNode files = n.putArray("files");
            for (Archive.StoredFile f : s.files()) {
                String path = "series/" + s.name() + "/" + f.fileName();
                ObjectNode fn = JSON.valueToTree(f);
                fn.put("path", path);
                files.add(fn);
                payload.put(path, f.sha256());
                sizes.put(path, f.sizeBytes());
            }
            series.add(n);
        }
        ArrayNode analyses = root.putArray("analyses");
        for (Archive.AnalysisRecord an : d.analyses()) {
            ObjectNode n = JSON.valueToTree(an);
            ArrayNode outs = n.putArray("outputs");
            for (Archive.OutputRecord o : an.outputs()) {
                String path = "analyses/" + an.id() + "-" + an.seriesName() + "/" + o.name();
                ObjectNode on = JSON.valueToTree(o);
                on.put("path", path);
                outs.add(on);
                payload.put(path, o.sha256());
                sizes.put(path, o.sizeBytes());
            }
            analyses.add(n);
        }
        ArrayNode docs = root.putArray("documents");
        for (Archive.OutputRecord o : d.documents()) {
            String path = "documents/" + o.id() + "-" + o.name();
            ObjectNode on = JSON.valueToTree(o);
            on.put("path", path);
            docs.add(on);
            payload.put(path, o.sha256());
            sizes.put(path, o.sizeBytes());
        }
        root.set("custody", JSON.valueToTree(d.custody()));
        byte[] caseJson;
        try {
            caseJson = JSON.writeValueAsBytes(root);
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }

        StringBuilder manifest = new StringBuilder();
        long octets = caseJson.length;
        manifest.append(Hashes.of(caseJson)).append("  ").append(BagFormat.encodePath(BagFormat.DATA + BagFormat.CASE_JSON)).append('\n');
        for (Map.Entry<String, String> e : payload.entrySet()) {
            manifest.append(e.getValue()).append("  ").append(BagFormat.encodePath(BagFormat.DATA + e.getKey())).append('\n');
            octets += sizes.get(e.getKey());
        }
        int count = payload.size() + 1;
        Archive.CaseRecord r = d.record();
        StringBuilder info = new StringBuilder();
        info.append("Bag-Software-Agent: ").append(BagFormat.infoValue(softwareAgent)).append('\n');
        info.append("Bagging-Date: ").append(LocalDate.now(ZoneOffset.UTC)).append('\n');
        info.append("External-Identifier: ").append(r.caseNumber()).append('\n');
        info.append("Payload-Oxum: ").append(octets).append('.').append(count).append('\n');
        infoLine(info, "Case-Number", r.caseNumber());
        infoLine(info, "Case-Status", r.status());
        infoLine(info, "Case-Opened", r.openedAt());
        infoLine(info, "Case-Closed", r.closedAt());
        infoLine(info, "Customer-Reference", r.customerRef());
        infoLine(info, "Device", r.device());
        infoLine(info, "Serial-Number", r.serialNumber());
        infoLine(info, "Reported-Fault", r.fault());
        infoLine(info, "Technician", r.technician());
        infoLine(info, "Exported-By", a.who);
        String manifestText = manifest.toString(), infoText = info.toString();
        String tagManifest = Hashes.of(BagFormat.DECLARATION) + "  " + BagFormat.BAGIT_TXT + "\n"
                + Hashes.of(infoText) + "  " + BagFormat.BAG_INFO + "\n"
                + Hashes.of(manifestText) + "  " + BagFormat.MANIFEST + "\n";
        Map<String, byte[]> tags = new LinkedHashMap<>();
        tags.put(BagFormat.BAGIT_TXT, BagFormat.DECLARATION.getBytes(StandardCharsets.UTF_8));
        tags.put(BagFormat.BAG_INFO, infoText.getBytes(StandardCharsets.UTF_8));
        tags.put(BagFormat.MANIFEST, manifestText.getBytes(StandardCharsets.UTF_8));
        tags.put(BagFormat.TAG_MANIFEST, tagManifest.getBytes(StandardCharsets.UTF_8));

        Path parent = target.toAbsolutePath().getParent();
        Path partial;
        try {
            Files.createDirectories(parent);
            partial = zip ? Files.createTempFile(parent, "." + target.getFileName(), ".partial")
                    : Files.createTempDirectory(parent, "." + target.getFileName() + ".partial-");
        } catch (IOException e) {
            throw new ArchiveException(target, "cannot write here: " + e.getMessage());
        }
        try {
            if (zip) writeZip(a, partial, bagName(target), tags, caseJson, payload);
            else writeFolder(a, partial, tags, caseJson, payload);
            Files.move(partial, target, StandardCopyOption.ATOMIC_MOVE);
            ContentStore.forceFolder(parent);
        } catch (IOException e) {
            throw new ArchiveException(target, "cannot write the bag: " + e.getMessage(), null, e);
        } finally {
            try {
                ContentStore.deleteTree(partial);
            } catch (IOException ignored) {
                // a partial bag has a hidden name; removing it is tidiness
            }
        }
        String manifestSha = Hashes.of(manifestText);
        a.log("export", caseNumber, Digests.caseSubject(caseNumber), manifestSha,
                count + " payload files, " + octets + " bytes to " + target.toAbsolutePath());
        return new Result(target, count, octets, manifestSha);
    }

    private static void infoLine(StringBuilder sb, String label, String value) {
        if (value != null && !value.isBlank()) sb.append(label).append(": ").append(BagFormat.infoValue(value)).append('\n');
    }

    static String bagName(Path target) {
        String n = target.getFileName().toString();
        return n.toLowerCase(java.util.Locale.ROOT).endsWith(".zip") ? n.substring(0, n.length() - 4) : n;
    }

    private static void writeFolder(Archive a, Path dir, Map<String, byte[]> tags, byte[] caseJson,
                                    Map<String, String> payload) throws IOException {
        Path data = Files.createDirectories(dir.resolve("data"));
        write(data.resolve(BagFormat.CASE_JSON), caseJson);
        for (Map.Entry<String, String> e : payload.entrySet()) {
            Path t = data.resolve(e.getKey());
            Files.createDirectories(t.getParent());
            a.copyOut(e.getValue(), t, e.getKey());
            force(t);
        }
        for (Map.Entry<String, byte[]> t : tags.entrySet()) write(dir.resolve(t.getKey()), t.getValue());
    }

    private static void write(Path file, byte[] bytes) throws IOException {
        Files.write(file, bytes, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE);
        force(file);
    }

    private static void force(Path file) throws IOException {
        try (var ch = java.nio.channels.FileChannel.open(file, StandardOpenOption.WRITE)) {
            ch.force(true);
        }
    }

    private static void writeZip(Archive a, Path zipFile, String top, Map<String, byte[]> tags, byte[] caseJson,
                                 Map<String, String> payload) throws IOException {
        try (var ch = java.nio.channels.FileChannel.open(zipFile, StandardOpenOption.WRITE, StandardOpenOption.TRUNCATE_EXISTING);
             OutputStream raw = java.nio.channels.Channels.newOutputStream(ch);
             ZipOutputStream z = new ZipOutputStream(new java.io.BufferedOutputStream(raw, 1 << 16))) {
            List<String> dirsDone = new ArrayList<>();
            for (Map.Entry<String, byte[]> t : tags.entrySet()) {
                z.putNextEntry(new ZipEntry(top + "/" + t.getKey()));
                z.write(t.getValue());
                z.closeEntry();
            }
            z.putNextEntry(new ZipEntry(top + "/data/" + BagFormat.CASE_JSON));
            z.write(caseJson);
            z.closeEntry();
            for (Map.Entry<String, String> e : payload.entrySet()) {
                z.putNextEntry(new ZipEntry(top + "/data/" + e.getKey()));
                MessageDigest md = Hashes.sha256();
                Path src = a.store.path(e.getValue());
                try (InputStream in = Files.newInputStream(src, LinkOption.NOFOLLOW_LINKS)) {
                    byte[] buf = new byte[Hashes.BUFFER];
                    for (int n; (n = in.read(buf)) > 0; ) {
                        md.update(buf, 0, n);
                        z.write(buf, 0, n);
                    }
                }
                if (!Hashes.hex(md.digest()).equals(e.getValue()))
                    throw new ArchiveException(src, "the stored " + e.getKey() + " no longer has its SHA-256",
                            "run 'risetrace case verify'");
                z.closeEntry();
            }
            dirsDone.clear();
            z.finish();
            z.flush();
            ch.force(true);
        }
    }
}
