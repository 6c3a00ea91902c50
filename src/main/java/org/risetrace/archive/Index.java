package org.risetrace.archive;

import org.sqlite.SQLiteConfig;

import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.Properties;

/**
 * The index database: one JDBC connection to SQLite (in the archive folder: WAL journal, foreign keys on, full
 * synchronous commits, writers serialised by {@code BEGIN IMMEDIATE}) or to PostgreSQL (writers serialised by a
 * transaction-scoped advisory lock). Every change runs in one transaction through {@link #write}: either all its
 * rows and its custody entry are committed, or none.
 */
public final class Index implements AutoCloseable {
    public enum Dialect { SQLITE, POSTGRESQL }

    public static final String SQLITE_FILE = "index.sqlite";
    /** The advisory lock key that serialises writers on PostgreSQL (any fixed number; "rt" in ASCII). */
    private static final long WRITER_LOCK = 0x7274L;
    private static final DateTimeFormatter TIME = DateTimeFormatter.ofPattern("yyyy-MM-dd'T'HH:mm:ss.SSS'Z'")
            .withZone(ZoneOffset.UTC);

    private final Connection conn;
    private final Dialect dialect;
    private final String where;
    /** SQLite: a second connection whose deferred transactions read one snapshot (WAL) without the write lock. */
    private Connection reader;
    private java.util.function.Supplier<Connection> readerFactory;

    /** Work in a transaction. */
    @FunctionalInterface
    public interface Work<T> {
        T run(Connection c) throws SQLException;
    }

    private Index(Connection conn, Dialect dialect, String where) {
        this.conn = conn;
        this.dialect = dialect;
        this.where = where;
    }

    static Index open(ArchiveSettings s) {
        try {
            if (!s.postgres()) {
                SQLiteConfig cfg = new SQLiteConfig();
                cfg.setJournalMode(SQLiteConfig.JournalMode.WAL);
                cfg.enforceForeignKeys(true);
                cfg.setSynchronous(SQLiteConfig.SynchronousMode.FULL);
                cfg.setBusyTimeout(60_000);
                cfg.setTransactionMode(SQLiteConfig.TransactionMode.IMMEDIATE);
                Path file = s.folder().resolve(SQLITE_FILE);
                Connection c = DriverManager.getConnection("jdbc:sqlite:" + file, cfg.toProperties());
                Index ix = new Index(c, Dialect.SQLITE, file.toString());
                SQLiteConfig readCfg = new SQLiteConfig();
                readCfg.enforceForeignKeys(true);
                readCfg.setBusyTimeout(60_000);
                readCfg.setTransactionMode(SQLiteConfig.TransactionMode.DEFERRED);
                ix.readerFactory = () -> {
                    try {
                        return DriverManager.getConnection("jdbc:sqlite:" + file, readCfg.toProperties());
                    } catch (SQLException e) {
                        throw new ArchiveException(file, "cannot open the archive index: " + e.getMessage(), null, e);
                    }
                };
                return migrate(ix);
            }
            Properties p = new Properties();
            p.setProperty("user", s.user());
            if (s.password() != null) p.setProperty("password", s.password());
            p.setProperty("ApplicationName", "risetrace");
            Connection c = DriverManager.getConnection(s.dbUrl(), p);
            return migrate(new Index(c, Dialect.POSTGRESQL, s.dbUrl()));
        } catch (SQLException e) {
            throw new ArchiveException(s.postgres() ? null : s.folder().resolve(SQLITE_FILE),
                    "cannot open the archive index" + (s.postgres() ? " " + s.dbUrl() : "") + ": " + e.getMessage(),
                    null, e);
        }
    }

    public Dialect dialect() {
        return dialect;
    }

    public String where() {
        return where;
    }

    static String now() {
        return TIME.format(Instant.now());
    }

    static String time(Instant t) {
        return TIME.format(t);
    }

    /** Runs {@code work} as the only writer, in one transaction. */
    public <T> T write(Work<T> work) {
        try {
            conn.setAutoCommit(false); // SQLite: BEGIN IMMEDIATE takes the write lock now
            try {
                if (dialect == Dialect.POSTGRESQL)
                    try (Statement st = conn.createStatement()) {
                        st.execute("SELECT pg_advisory_xact_lock(" + WRITER_LOCK + ")");
                    }
                T out = work.run(conn);
                conn.commit();
                return out;
            } catch (SQLException | RuntimeException | Error e) {
                try {
                    conn.rollback();
                } catch (SQLException suppressed) {
                    e.addSuppressed(suppressed);
                }
                throw e;
            } finally {
                conn.setAutoCommit(true);
            }
        } catch (SQLException e) {
            throw new ArchiveException(null, "archive index " + where + ": " + e.getMessage(), null, e);
        }
    }

    /** Runs {@code work} reading one consistent state. */
    public <T> T read(Work<T> work) {
        try {
            if (dialect == Dialect.SQLITE) {
                if (reader == null) reader = readerFactory.get();
                reader.setAutoCommit(false); // a deferred transaction: every statement sees the same snapshot
                try {
                    return work.run(reader);
                } finally {
                    reader.commit();
                    reader.setAutoCommit(true);
                }
            }
            conn.setAutoCommit(false);
            try {
                conn.setTransactionIsolation(Connection.TRANSACTION_REPEATABLE_READ);
                T out = work.run(conn);
                conn.commit();
                return out;
            } catch (SQLException | RuntimeException e) {
                conn.rollback();
                throw e;
            } finally {
                conn.setAutoCommit(true);
                conn.setTransactionIsolation(Connection.TRANSACTION_READ_COMMITTED);
            }
        } catch (SQLException e) {
            throw new ArchiveException(null, "archive index " + where + ": " + e.getMessage(), null, e);
        }
    }

    private static Index migrate(Index ix) throws SQLException {
        ix.write(c -> {
            try (Statement st = c.createStatement()) {
                st.execute(Schema.VERSION_TABLE);
            }
            int have = 0;
            try (Statement st = c.createStatement(); ResultSet rs = st.executeQuery("SELECT MAX(version) FROM schema_version")) {
                if (rs.next()) have = rs.getInt(1);
            }
            if (have > Schema.latest())
                throw new ArchiveException(null, "the archive index " + ix.where + " has schema version " + have
                        + ", newer than this risetrace knows (" + Schema.latest() + ")", "use a newer risetrace");
            for (Schema.Migration m : Schema.MIGRATIONS) {
                if (m.version() <= have) continue;
                try (Statement st = c.createStatement()) {
                    for (String sql : m.common()) st.execute(sql);
                    for (String sql : ix.dialect == Dialect.SQLITE ? m.sqlite() : m.postgres()) st.execute(sql);
                }
                try (PreparedStatement ps = c.prepareStatement(
                        "INSERT INTO schema_version (version, description, applied_at) VALUES (?, ?, ?)")) {
                    ps.setInt(1, m.version());
                    ps.setString(2, m.description());
                    ps.setString(3, now());
                    ps.executeUpdate();
                }
            }
            return null;
        });
        return ix;
    }

    /** A value of the meta table, or null. */
    static String meta(Connection c, String key) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT meta_value FROM meta WHERE meta_key = ?")) {
            ps.setString(1, key);
            try (ResultSet rs = ps.executeQuery()) {
                return rs.next() ? rs.getString(1) : null;
            }
        }
    }

    static void setMeta(Connection c, String key, String value) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("INSERT INTO meta (meta_key, meta_value) VALUES (?, ?)")) {
            ps.setString(1, key);
            ps.setString(2, value);
            ps.executeUpdate();
        }
    }

    /** The next number of a BIGINT key (callers hold the writer lock). */
    static long next(Connection c, String table, String column) throws SQLException {
        try (Statement st = c.createStatement(); ResultSet rs = st.executeQuery(
                "SELECT COALESCE(MAX(" + column + "), 0) + 1 FROM " + table)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    @Override
    public void close() {
        try {
            if (reader != null) reader.close();
            conn.close();
        } catch (SQLException ignored) {
            // closing: nothing to keep
        }
    }
}
