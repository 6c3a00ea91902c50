package org.risetrace.archive;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Crash safety: a child JVM ({@link AddSeriesChild}, the test's own class path) ingests series and is killed
 * (SIGKILL, {@link Process#destroyForcibly}) at a random moment after it has opened the archive; at least 20 kills
 * on SQLite and 20 on PostgreSQL. After every kill the archive opens, verify is clean (files an interrupted ingest
 * stored without a record are only a note), and every series is wholly present, file for file, or absent. A fresh
 * archive every five kills keeps the kills landing in real ingests. The moments come from a fixed seed.
 */
class CrashTest {
    private static final int KILLS = 20;
    private static final int KILLS_PER_ARCHIVE = 5;
    private static final int SERIES = 6;

    @TempDir
    Path tmp;
    @TempDir
    static Path shared;
    private static final List<Path> SOURCES = new ArrayList<>();
    private static final Map<String, List<String>> LISTING = new HashMap<>();  // series -> "name sha256" of its files

    @BeforeAll
    static void makeSeries() throws IOException {
        for (int i = 0; i < SERIES; i++) {
            Path s = Fixtures.series(shared.resolve("s" + i), 700 + i);
            SOURCES.add(s);
            List<String> l = new ArrayList<>();
            for (Path f : Fixtures.regularFiles(s)) l.add(f.getFileName() + " " + Hashes.of(f));
            Collections.sort(l);
            LISTING.put("s" + i, l);
        }
    }

    /** Both databases at once, each in its own thread (the parent mostly waits on its children). */
    @Test
    void killedIngestsLeaveWholeSeriesOrNoneOnSqliteAndOnPostgres() throws Exception {
        PgServer.get();
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(2);
        try {
            var sqlite = pool.submit(() -> new Loop(tmp.resolve("sqlite")).run(null));
            var postgres = pool.submit(() -> new Loop(tmp.resolve("postgres")).run("postgres"));
            unwrap(sqlite);
            unwrap(postgres);
        } finally {
            pool.shutdownNow();
        }
    }

    private static void unwrap(java.util.concurrent.Future<?> f) throws Exception {
        try {
            f.get(10, TimeUnit.MINUTES);
        } catch (java.util.concurrent.ExecutionException e) {
            if (e.getCause() instanceof Error err) throw err;
            throw (Exception) e.getCause();
        }
    }

    /** One database's kills. */
    private static final class Loop {
        private final Path tmp;
        private boolean lastWasKill;

        Loop(Path tmp) throws IOException {
            this.tmp = Files.createDirectories(tmp);
        }

    Void run(String which) throws Exception {
        List<Path> sources = SOURCES;
        Map<String, List<String>> listing = LISTING;
        Random random = new Random(20261203L + (which == null ? 0 : 1));
        int killed = 0, midIngest = 0, attempts = 0;
        ArchiveSettings settings = null;
        String db = null;
        while (killed < KILLS) {
            assertTrue(++attempts < KILLS * 3, "the child ends before it is killed too often: " + killed + " kills");
            if (killed % KILLS_PER_ARCHIVE == 0 && (settings == null || attempts > 1 && killed > 0 && lastWasKill)) {
                Path folder = tmp.resolve("archive-" + attempts);
                db = which == null ? null : PgServer.newDatabase();
                settings = which == null ? ArchiveSettings.sqlite(folder) : PgServer.settings(folder, db);
                try (Archive a = Archive.open(settings, "lead")) {
                    a.createCase(Fixtures.newCase("C-K"));
                }
            }
            lastWasKill = false;
            List<Path> order = new ArrayList<>(sources);
            Collections.shuffle(order, random);
            Path log = tmp.resolve("child-" + attempts + ".log");
            List<String> cmd = new ArrayList<>(List.of(PostgresArchiveTest.java(), "-Xmx256m", "-XX:TieredStopAtLevel=1", "-XX:+UseSerialGC", "-Xshare:auto",
                    "-cp", System.getProperty("java.class.path"), AddSeriesChild.class.getName(),
                    which == null ? "sqlite" : db, settings.folder().toString(), "C-K"));
            for (Path p : order) cmd.add(p.toString());
            ProcessBuilder pb = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile());
            pb.environment().put("RISETRACE_ARCHIVE_DB_USER", "postgres");
            Process child = pb.start();
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
            while (child.isAlive() && !Files.readString(log).contains("open") && System.nanoTime() < deadline) Thread.sleep(2);
            Thread.sleep(random.nextInt(300));
            if (child.isAlive()) {
                child.destroyForcibly();
                killed++;
                lastWasKill = true;
            }
            assertTrue(child.waitFor(60, TimeUnit.SECONDS), "the child ended");
            int in = (int) Files.readAllLines(log).stream().filter(l -> l.startsWith("in ")).count();
            if (lastWasKill && in < SERIES) midIngest++;
            check(settings, listing, "after run " + attempts + " (" + (lastWasKill ? "killed" : "finished") + ", " + in
                    + " series reported in): " + Files.readString(log));
        }
        assertTrue(midIngest >= KILLS / 2, midIngest + " of " + killed + " kills landed before the child was done");
        // a last run to the end: nothing the kills left stands in its way
        ProcessBuilder lastPb = new ProcessBuilder(lastCommand(which, db, settings, sources)).redirectErrorStream(true)
                .redirectOutput(tmp.resolve("last.log").toFile());
        lastPb.environment().put("RISETRACE_ARCHIVE_DB_USER", "postgres");
        Process last = lastPb.start();
        assertTrue(last.waitFor(120, TimeUnit.SECONDS));
        assertEquals(0, last.exitValue(), Files.readString(tmp.resolve("last.log")));
        try (Archive a = Archive.open(settings, "lead")) {
            assertEquals(SERIES, a.show("C-K").series().size());
        }
        check(settings, listing, "after the last run");
        return null;
    }
    }

    private static List<String> lastCommand(String which, String db, ArchiveSettings settings, List<Path> sources) {
        List<String> cmd = new ArrayList<>(List.of(PostgresArchiveTest.java(), "-cp", System.getProperty("java.class.path"),
                AddSeriesChild.class.getName(), which == null ? "sqlite" : db, settings.folder().toString(), "C-K"));
        for (Path p : sources) cmd.add(p.toString());
        return cmd;
    }

    /** The archive opens, verifies clean, and holds each series whole or not at all. */
    private static void check(ArchiveSettings settings, Map<String, List<String>> listing, String when) throws IOException {
        try (Archive a = Archive.open(settings, "auditor")) {
            Verifier.Report r = Verifier.verify(a, null);
            assertTrue(r.clean(), when + ": " + r.problems());
            for (Archive.SeriesRecord s : a.show("C-K").series()) {
                List<String> have = new ArrayList<>();
                for (Archive.StoredFile f : s.files()) {
                    assertEquals(f.sha256(), Hashes.of(a.store().path(f.sha256())), when);
                    have.add(f.fileName() + " " + f.sha256());
                }
                Collections.sort(have);
                assertEquals(listing.get(s.name()), have, when + ": series " + s.name() + " is whole");
            }
        }
    }
}
