package org.risetrace.archive;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The custody log: one entry per ingest, analysis, report, export, import, verification and status change; who,
 * what, when, the SHA-256 of what was touched and the digest of the records the action left ({@link Digests}).
 * Append-only twice over: the database refuses an update or delete (triggers), and each entry's hash covers the one
 * before it, so an edited, removed or inserted entry breaks the chain where it was made ({@code case verify} names
 * the first broken entry).
 */
public final class Custody {
    static final String GENESIS = "0".repeat(64);
    private static final ObjectMapper JSON = new ObjectMapper();

    /** One entry of the log. */
    public record Entry(long seq, String loggedAt, String who, String action, String caseNumber, String subject,
                        String sha256, String stateDigest, String detail, String prevHash, String entryHash) {
        /** The hash this entry must carry: SHA-256 of its fields and the previous entry's hash, as a JSON array. */
        public String expectedHash() {
            return hash(prevHash, seq, loggedAt, who, action, caseNumber, subject, sha256, stateDigest, detail);
        }
    }

    private Custody() { }

    static String hash(String prev, long seq, String at, String who, String action, String caseNumber, String subject,
                       String sha256, String stateDigest, String detail) {
        try {
            return Hashes.of(JSON.writeValueAsString(Arrays.asList(prev, Long.toString(seq), at, who, action, caseNumber,
                    subject, sha256, stateDigest, detail)));
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Appends an entry (the caller holds the writer lock, inside its transaction). */
    static Entry append(Connection c, String who, String action, String caseNumber, String subject, String sha256,
                        String stateDigest, String detail) throws SQLException {
        long seq;
        String prev;
        try (Statement st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT seq, entry_hash FROM custody ORDER BY seq DESC LIMIT 1")) {
            if (rs.next()) {
                seq = rs.getLong(1) + 1;
                prev = rs.getString(2);
            } else {
                seq = 1;
                prev = GENESIS;
            }
        }
        String at = Index.now();
        String h = hash(prev, seq, at, who, action, caseNumber, subject, sha256, stateDigest, detail);
        try (PreparedStatement ps = c.prepareStatement("INSERT INTO custody (seq, logged_at, who, action, case_number, "
                + "subject, sha256, state_digest, detail, prev_hash, entry_hash) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)")) {
            ps.setLong(1, seq);
            ps.setString(2, at);
            ps.setString(3, who);
            ps.setString(4, action);
            ps.setString(5, caseNumber);
            ps.setString(6, subject);
            ps.setString(7, sha256);
            ps.setString(8, stateDigest);
            ps.setString(9, detail);
            ps.setString(10, prev);
            ps.setString(11, h);
            ps.executeUpdate();
        }
        return new Entry(seq, at, who, action, caseNumber, subject, sha256, stateDigest, detail, prev, h);
    }

    /** Every entry in order, or a case's entries ({@code caseNumber} non-null). */
    static List<Entry> entries(Connection c, String caseNumber) throws SQLException {
        String sql = "SELECT seq, logged_at, who, action, case_number, subject, sha256, state_digest, detail, prev_hash, "
                + "entry_hash FROM custody" + (caseNumber == null ? "" : " WHERE case_number = ?") + " ORDER BY seq";
        List<Entry> out = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement(sql)) {
            if (caseNumber != null) ps.setString(1, caseNumber);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next())
                    out.add(new Entry(rs.getLong(1), rs.getString(2), rs.getString(3), rs.getString(4), rs.getString(5),
                            rs.getString(6), rs.getString(7), rs.getString(8), rs.getString(9), rs.getString(10),
                            rs.getString(11)));
            }
        }
        return out;
    }

    /** The chain's problems, each as a sentence naming the entry; empty when whole. */
    static List<String> checkChain(List<Entry> all) {
        List<String> problems = new ArrayList<>();
        String prev = GENESIS;
        long expectSeq = 1;
        for (Entry e : all) {
            if (e.seq() != expectSeq)
                problems.add("custody log: entry " + expectSeq + (e.seq() > expectSeq ? " to " + (e.seq() - 1) + " missing" : " repeated"));
            if (!e.prevHash().equals(prev))
                problems.add("custody log: entry " + e.seq() + " does not follow the entry before it (an entry was removed, inserted or edited)");
            if (!e.expectedHash().equals(e.entryHash()))
                problems.add("custody log: entry " + e.seq() + " (" + e.action() + " " + e.subject() + ") was edited after it was written");
            prev = e.entryHash();
            expectSeq = e.seq() + 1;
        }
        return problems;
    }
}
