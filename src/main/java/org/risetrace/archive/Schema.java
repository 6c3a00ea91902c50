package org.risetrace.archive;

import java.util.List;

/**
 * The index schema as numbered migrations, the same tables on SQLite and PostgreSQL (portable types: TEXT, BIGINT,
 * INTEGER; times as ISO-8601 UTC text, which sorts as time). {@code schema_version} holds every version applied; a
 * newer archive than this build knows is refused rather than guessed at.
 */
final class Schema {
    private Schema() { }

    /** One migration: its number, what it does, and its statements for each database. */
    record Migration(int version, String description, List<String> common, List<String> sqlite, List<String> postgres) { }

    static final String VERSION_TABLE =
            "CREATE TABLE IF NOT EXISTS schema_version (version INTEGER PRIMARY KEY, description TEXT NOT NULL, "
                    + "applied_at TEXT NOT NULL)";

    static final List<Migration> MIGRATIONS = List.of(new Migration(1, "cases, series, frames, analyses, outputs, custody log",
            List.of(
                    "CREATE TABLE meta (meta_key TEXT PRIMARY KEY, meta_value TEXT NOT NULL)",
                    "CREATE TABLE cases (case_number TEXT PRIMARY KEY, customer_ref TEXT, device TEXT, serial_number TEXT, "
                            + "fault TEXT, technician TEXT, status TEXT NOT NULL, opened_at TEXT NOT NULL, closed_at TEXT)",
                    "CREATE INDEX cases_opened ON cases (opened_at)",
                    "CREATE INDEX cases_status ON cases (status)",
                    "CREATE TABLE series (case_number TEXT NOT NULL REFERENCES cases (case_number), name TEXT NOT NULL, "
                            + "added_at TEXT NOT NULL, added_by TEXT NOT NULL, source TEXT, injection TEXT, notes TEXT, "
                            + "file_count INTEGER NOT NULL, PRIMARY KEY (case_number, name))",
                    "CREATE TABLE frames (case_number TEXT NOT NULL, series_name TEXT NOT NULL, file_index INTEGER NOT NULL, "
                            + "role TEXT NOT NULL, file_name TEXT NOT NULL, sha256 TEXT NOT NULL, size_bytes BIGINT NOT NULL, "
                            + "modified_at TEXT, PRIMARY KEY (case_number, series_name, file_index), "
                            + "FOREIGN KEY (case_number, series_name) REFERENCES series (case_number, name))",
                    "CREATE INDEX frames_sha256 ON frames (sha256)",
                    "CREATE TABLE analyses (id BIGINT PRIMARY KEY, case_number TEXT NOT NULL, series_name TEXT NOT NULL, "
                            + "analysed_at TEXT NOT NULL, analysed_by TEXT NOT NULL, tool_version TEXT NOT NULL, "
                            + "mode TEXT NOT NULL, parameters TEXT NOT NULL, verdict_status TEXT, verdict_ref TEXT, "
                            + "headline TEXT, reason TEXT, "
                            + "FOREIGN KEY (case_number, series_name) REFERENCES series (case_number, name))",
                    "CREATE TABLE outputs (id BIGINT PRIMARY KEY, case_number TEXT NOT NULL REFERENCES cases (case_number), "
                            + "analysis_id BIGINT REFERENCES analyses (id), kind TEXT NOT NULL, name TEXT NOT NULL, "
                            + "sha256 TEXT NOT NULL, size_bytes BIGINT NOT NULL, made_at TEXT NOT NULL)",
                    "CREATE INDEX outputs_case ON outputs (case_number)",
                    "CREATE TABLE custody (seq BIGINT PRIMARY KEY, logged_at TEXT NOT NULL, who TEXT NOT NULL, "
                            + "action TEXT NOT NULL, case_number TEXT, subject TEXT, sha256 TEXT, state_digest TEXT, "
                            + "detail TEXT, prev_hash TEXT NOT NULL, entry_hash TEXT NOT NULL)",
                    "CREATE INDEX custody_subject ON custody (subject)",
                    "CREATE INDEX custody_case ON custody (case_number)"),
            List.of(
                    "CREATE TRIGGER custody_no_update BEFORE UPDATE ON custody BEGIN "
                            + "SELECT RAISE(ABORT, 'the custody log is append-only'); END",
                    "CREATE TRIGGER custody_no_delete BEFORE DELETE ON custody BEGIN "
                            + "SELECT RAISE(ABORT, 'the custody log is append-only'); END",
                    "CREATE TRIGGER frames_no_update BEFORE UPDATE ON frames BEGIN "
                            + "SELECT RAISE(ABORT, 'stored originals are never changed'); END",
                    "CREATE TRIGGER frames_no_delete BEFORE DELETE ON frames BEGIN "
                            + "SELECT RAISE(ABORT, 'stored originals are never changed'); END"),
            List.of(
                    "CREATE FUNCTION risetrace_append_only() RETURNS trigger LANGUAGE plpgsql AS "
                            + "$$ BEGIN RAISE EXCEPTION 'the table % is append-only', TG_TABLE_NAME; END $$",
                    "CREATE TRIGGER custody_append_only BEFORE UPDATE OR DELETE ON custody "
                            + "FOR EACH ROW EXECUTE FUNCTION risetrace_append_only()",
                    "CREATE TRIGGER custody_no_truncate BEFORE TRUNCATE ON custody "
                            + "FOR EACH STATEMENT EXECUTE FUNCTION risetrace_append_only()",
                    "CREATE TRIGGER frames_append_only BEFORE UPDATE OR DELETE ON frames "
                            + "FOR EACH ROW EXECUTE FUNCTION risetrace_append_only()",
                    "CREATE TRIGGER frames_no_truncate BEFORE TRUNCATE ON frames "
                            + "FOR EACH STATEMENT EXECUTE FUNCTION risetrace_append_only()")));

    static int latest() {
        return MIGRATIONS.get(MIGRATIONS.size() - 1).version();
    }
}
