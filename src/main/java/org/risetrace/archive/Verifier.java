package org.risetrace.archive;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermission;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * {@code case verify}: re-hashes every stored original and output a record names, checks each file's size and
 * SHA-256, checks the custody chain, and compares every subject's records with the digest the custody log kept
 * for it. Each mismatch is one sentence naming the case, the file or the record.
 */
public final class Verifier {
    /**
     * @param problems     each mismatch, in plain words (empty: the archive is whole)
     * @param notes        things worth knowing that are not damage (files left by an interrupted ingest)
     * @param filesChecked stored files re-hashed
     * @param bytesChecked their bytes
     * @param recordsChecked subjects whose records were compared with the log
     * @param chainHead    the last custody entry's hash: written down, it shows later that no entry was rewritten
     */
    public record Report(List<String> problems, List<String> notes, int filesChecked, long bytesChecked,
                         int recordsChecked, long entries, String chainHead) {
        public boolean clean() {
            return problems.isEmpty();
        }
    }

    private Verifier() { }

    /** Verifies the whole archive ({@code caseNumber} null) or one case, and logs the verification. */
    public static Report verify(Archive a, String caseNumber) {
        Report r = a.index.read(c -> check(a, c, caseNumber));
        try {
            a.log("verify", caseNumber, caseNumber == null ? "archive" : Digests.caseSubject(caseNumber), r.chainHead(),
                    r.clean() ? "whole: " + r.filesChecked() + " files" : r.problems().size() + " problems");
        } catch (RuntimeException e) {
            List<String> p = new ArrayList<>(r.problems());
            p.add("the verification could not be logged: " + e.getMessage());
            return new Report(p, r.notes(), r.filesChecked(), r.bytesChecked(), r.recordsChecked(), r.entries(), r.chainHead());
        }
        return r;
    }

    private static Report check(Archive a, Connection c, String caseNumber) throws SQLException {
        List<String> problems = new ArrayList<>(), notes = new ArrayList<>();
        if (caseNumber != null) Archive.requireCase(c, caseNumber);
        List<Custody.Entry> all = Custody.entries(c, null);
        problems.addAll(Custody.checkChain(all));

        // the records against the digests the log kept
        Map<String, Custody.Entry> logged = new LinkedHashMap<>();
        for (Custody.Entry e : all)
            if (e.stateDigest() != null && e.subject() != null && (caseNumber == null || caseNumber.equals(e.caseNumber())))
                logged.put(e.subject(), e);
        Set<String> present = new LinkedHashSet<>(subjects(c, caseNumber));
        Set<String> subjects = new LinkedHashSet<>(present);
        subjects.addAll(logged.keySet());
        for (String s : subjects) {
            Custody.Entry e = logged.get(s);
            String now = Digests.of(c, s);
            if (e == null) problems.add(describe(s) + ": the record is not in the custody log (added outside risetrace)");
            else if (now == null) problems.add(describe(s) + ": the record is missing (custody entry " + e.seq() + ", "
                    + e.action() + " at " + e.loggedAt() + ", has it)");
            else if (!now.equals(e.stateDigest())) problems.add(describe(s) + ": the record was changed after custody entry "
                    + e.seq() + " (" + e.action() + " at " + e.loggedAt() + " by " + e.who() + ")");
        }

        // the files against their records
        Map<String, String> files = new LinkedHashMap<>();  // sha256 -> what
        Map<String, Long> sizes = new HashMap<>();
        String where = caseNumber == null ? "" : " WHERE case_number = ?";
        try (PreparedStatement ps = c.prepareStatement("SELECT case_number, series_name, file_name, sha256, size_bytes FROM frames"
                + where + " ORDER BY case_number, series_name, file_index")) {
            if (caseNumber != null) ps.setString(1, caseNumber);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    files.putIfAbsent(rs.getString(4), "case " + rs.getString(1) + ", series " + rs.getString(2) + ", "
                            + rs.getString(3));
                    sizes.put(rs.getString(4), rs.getLong(5));
                }
            }
        }
        try (PreparedStatement ps = c.prepareStatement("SELECT case_number, analysis_id, name, sha256, size_bytes FROM outputs"
                + where + " ORDER BY id")) {
            if (caseNumber != null) ps.setString(1, caseNumber);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    long id = rs.getLong(2);
                    String owner = rs.wasNull() ? "" : ", analysis " + id;
                    files.putIfAbsent(rs.getString(4), "case " + rs.getString(1) + owner + ", " + rs.getString(3));
                    sizes.put(rs.getString(4), rs.getLong(5));
                }
            }
        }
        int checked = 0;
        long bytes = 0;
        int writable = 0;
        for (Map.Entry<String, String> f : files.entrySet()) {
            String sha = f.getKey();
            if (!Hashes.isHex(sha)) {
                problems.add(f.getValue() + ": the record's SHA-256 '" + sha + "' is not a SHA-256");
                continue;
            }
            Path p = a.store.path(sha);
            if (!Files.exists(p, LinkOption.NOFOLLOW_LINKS)) {
                problems.add(f.getValue() + ": the stored file " + p + " is missing");
                continue;
            }
            if (!Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS)) {
                problems.add(f.getValue() + ": " + p + " is not a regular file");
                continue;
            }
            try {
                long size = Files.size(p);
                String actual = Hashes.of(p);
                checked++;
                bytes += size;
                if (!actual.equals(sha)) problems.add(f.getValue() + ": the stored file " + p + " was altered (its SHA-256 is now "
                        + actual + ")");
                else if (size != sizes.get(sha)) problems.add(f.getValue() + ": the record gives " + sizes.get(sha)
                        + " bytes, the file has " + size);
                Set<PosixFilePermission> perms = Files.getPosixFilePermissions(p, LinkOption.NOFOLLOW_LINKS);
                if (perms.contains(PosixFilePermission.OWNER_WRITE) || perms.contains(PosixFilePermission.GROUP_WRITE)
                        || perms.contains(PosixFilePermission.OTHERS_WRITE)) writable++;
            } catch (IOException | UnsupportedOperationException e) {
                problems.add(f.getValue() + ": cannot read the stored file " + p + ": " + e.getMessage());
            }
        }
        if (writable > 0) notes.add(writable + " stored files are writable again (they are stored read-only); their contents check out");
        if (caseNumber == null) {
            try {
                Set<String> named = new HashSet<>(files.keySet());
                long loose = a.store.all().stream().filter(h -> !named.contains(h)).count();
                if (loose > 0) notes.add(loose + " stored files belong to no record (left by an interrupted ingest or import; harmless)");
            } catch (IOException e) {
                problems.add("cannot list the stored files: " + e.getMessage());
            }
        }
        String head = all.isEmpty() ? Custody.GENESIS : all.get(all.size() - 1).entryHash();
        return new Report(problems, notes, checked, bytes, present.size(), all.size(), head);
    }

    private static String describe(String subject) {
        int colon = subject.indexOf(':');
        String kind = subject.substring(0, colon), key = subject.substring(colon + 1);
        return switch (kind) {
            case "case" -> "case " + key;
            case "series" -> "case " + key.substring(0, key.indexOf('/')) + ", series " + key.substring(key.indexOf('/') + 1);
            case "analysis" -> "analysis " + key;
            case "output" -> "stored output " + key;
            default -> subject;
        };
    }

    /** The subjects whose records exist now. */
    private static List<String> subjects(Connection c, String caseNumber) throws SQLException {
        List<String> out = new ArrayList<>();
        String where = caseNumber == null ? "" : " WHERE case_number = ?";
        query(c, "SELECT case_number FROM cases" + where, caseNumber, rs -> out.add(Digests.caseSubject(rs.getString(1))));
        query(c, "SELECT case_number, name FROM series" + where, caseNumber,
                rs -> out.add(Digests.seriesSubject(rs.getString(1), rs.getString(2))));
        query(c, "SELECT id FROM analyses" + where, caseNumber, rs -> out.add(Digests.analysisSubject(rs.getLong(1))));
        query(c, "SELECT id FROM outputs WHERE analysis_id IS NULL" + (caseNumber == null ? "" : " AND case_number = ?"),
                caseNumber, rs -> out.add(Digests.outputSubject(rs.getLong(1))));
        return out;
    }

    private interface Row { void take(ResultSet rs) throws SQLException; }

    private static void query(Connection c, String sql, String arg, Row row) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement(sql)) {
            if (arg != null) ps.setString(1, arg);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) row.take(rs);
            }
        }
    }
}
