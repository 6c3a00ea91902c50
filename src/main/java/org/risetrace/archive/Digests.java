package org.risetrace.archive;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.ResultSetMetaData;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.List;

/**
 * The digest of a subject's records as stored: the rows read back as text, in a fixed order, as a JSON array,
 * hashed with SHA-256. The custody log keeps the digest each action left; {@code case verify} computes it again,
 * so an edited, removed or added row shows as a digest that differs from the log's.
 * Subjects: {@code case:N}, {@code series:N/name} (with its files), {@code analysis:ID} (with its outputs),
 * {@code output:ID} (a file made for the case, such as a customer report).
 */
final class Digests {
    private static final ObjectMapper JSON = new ObjectMapper();

    private Digests() { }

    static String caseSubject(String caseNumber) { return "case:" + caseNumber; }
    static String seriesSubject(String caseNumber, String name) { return "series:" + caseNumber + "/" + name; }
    static String analysisSubject(long id) { return "analysis:" + id; }
    static String outputSubject(long id) { return "output:" + id; }

    /** The digest of the subject's rows now, or null when its main row is gone. */
    static String of(Connection c, String subject) throws SQLException {
        int colon = subject.indexOf(':');
        String kind = subject.substring(0, colon), key = subject.substring(colon + 1);
        List<Object> parts = new ArrayList<>();
        switch (kind) {
            case "case" -> {
                List<List<String>> row = rows(c, "SELECT case_number, customer_ref, device, serial_number, fault, "
                        + "technician, status, opened_at, closed_at FROM cases WHERE case_number = ?", key);
                if (row.isEmpty()) return null;
                parts.add(row);
            }
            case "series" -> {
                int slash = key.indexOf('/');
                String cn = key.substring(0, slash), name = key.substring(slash + 1);
                List<List<String>> row = rows(c, "SELECT case_number, name, added_at, added_by, source, injection, notes, "
                        + "file_count FROM series WHERE case_number = ? AND name = ?", cn, name);
                if (row.isEmpty()) return null;
                parts.add(row);
                parts.add(rows(c, "SELECT file_index, role, file_name, sha256, size_bytes, modified_at FROM frames "
                        + "WHERE case_number = ? AND series_name = ? ORDER BY file_index", cn, name));
            }
            case "analysis" -> {
                List<List<String>> row = rows(c, "SELECT id, case_number, series_name, analysed_at, analysed_by, "
                        + "tool_version, mode, parameters, verdict_status, verdict_ref, headline, reason FROM analyses "
                        + "WHERE id = ?", Long.parseLong(key));
                if (row.isEmpty()) return null;
                parts.add(row);
                parts.add(rows(c, "SELECT id, case_number, kind, name, sha256, size_bytes, made_at FROM outputs "
                        + "WHERE analysis_id = ? ORDER BY id", Long.parseLong(key)));
            }
            case "output" -> {
                List<List<String>> row = rows(c, "SELECT id, case_number, analysis_id, kind, name, sha256, size_bytes, "
                        + "made_at FROM outputs WHERE id = ?", Long.parseLong(key));
                if (row.isEmpty()) return null;
                parts.add(row);
            }
            default -> throw new IllegalArgumentException("unknown subject " + subject);
        }
        try {
            return Hashes.of(JSON.writeValueAsString(parts));
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static List<List<String>> rows(Connection c, String sql, Object... args) throws SQLException {
        List<List<String>> out = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement(sql)) {
            for (int i = 0; i < args.length; i++) ps.setObject(i + 1, args[i]);
            try (ResultSet rs = ps.executeQuery()) {
                ResultSetMetaData md = rs.getMetaData();
                while (rs.next()) {
                    List<String> row = new ArrayList<>(md.getColumnCount());
                    for (int i = 1; i <= md.getColumnCount(); i++) row.add(rs.getString(i));
                    out.add(row);
                }
            }
        }
        return out;
    }
}
