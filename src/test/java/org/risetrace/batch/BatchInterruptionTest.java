package org.risetrace.batch;

import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.cli.Main;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A batch killed mid-run: {@code risetrace batch} in a child JVM (ProcessBuilder, the test's own class path) is
 * killed (SIGKILL, {@link Process#destroyForcibly}) at three moments, each run resuming the one before: during the
 * first series' analysis, while a series' outputs are being renamed into place, and after two series are done.
 * After each kill every visible output is whole (JSON parses, HTML and CSV end as written) and every manifest
 * stands beside whole outputs. Reference: the summary of an uninterrupted run over the same tree, which the final
 * re-run must equal byte for byte.
 */
class BatchInterruptionTest {
    @TempDir
    Path tmp;

    @Test
    void aKilledBatchLeavesOnlyWholeOutputsAndTheRerunEqualsAnUninterruptedRun() throws Exception {
        Path root = tmp.resolve("captures");
        for (int i = 1; i <= 5; i++) BatchRunnerTest.sim(root.resolve("board/s" + i), 0.5 + 0.4 * i, 12, 20L + i);
        Path reference = tmp.resolve("reference"), out = tmp.resolve("killed");
        BatchRunner.Options options = BatchRunner.Options.defaults().withJobs(1);
        BatchRunner.run(root, reference, options, BatchRunner.Listener.NONE);

        List<Predicate<Path>> moments = List.of(
                o -> Files.isDirectory(o.resolve("board/s1")),                            // first series under way
                o -> count(o, p -> p.getFileName().toString().startsWith(BatchRunner.STAGING_PREFIX)) > 0, // writing
                o -> count(o, p -> p.getFileName().toString().equals(Manifest.FILE_NAME)) >= 2);  // two done
        int killed = 0;
        for (Predicate<Path> moment : moments) {
            Process child = startChild(root, out);
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
            boolean hit = false;
            while (child.isAlive() && System.nanoTime() < deadline) {
                if (Files.isDirectory(out) && moment.test(out)) {
                    child.destroyForcibly();
                    hit = true;
                    break;
                }
                Thread.sleep(2);
            }
            child.waitFor(30, TimeUnit.SECONDS);
            if (hit) killed++;
            assertOnlyWholeOutputs(out);
        }
        assertTrue(killed >= 2, "the child was killed at " + killed + " of 3 moments");
        BatchRunner.Outcome rerun = BatchRunner.run(root, out, options, BatchRunner.Listener.NONE);
        assertEquals(5, rerun.summary().total());
        assertTrue(rerun.skipped() >= 1, "series finished before a kill are not analysed again: " + rerun.skipped());
        assertEquals(Files.readString(reference.resolve(BatchSummary.JSON_FILE)), Files.readString(out.resolve(BatchSummary.JSON_FILE)));
        assertEquals(Files.readString(reference.resolve(SummaryCsv.FILE_NAME)), Files.readString(out.resolve(SummaryCsv.FILE_NAME)));
        assertOnlyWholeOutputs(out);
        assertEquals(0, count(out, p -> p.getFileName().toString().startsWith(".")), "no temporary file left after a whole run");
    }

    private Process startChild(Path root, Path out) throws IOException {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        ProcessBuilder pb = new ProcessBuilder(java, "-Xmx512m", "-Djava.awt.headless=true",
                "-cp", System.getProperty("java.class.path"), Main.class.getName(),
                "batch", root.toString(), "--out", out.toString(), "--jobs", "1", "--quiet");
        pb.redirectErrorStream(true).redirectOutput(tmp.resolve("child.log").toFile());
        return pb.start();
    }

    private static long count(Path dir, Predicate<Path> which) {
        try (Stream<Path> s = Files.walk(dir)) {
            return s.filter(which).count();
        } catch (IOException | java.io.UncheckedIOException e) {
            return 0; // a folder renamed or removed while walking: not this moment yet
        }
    }

    /** Every visible file is whole; every manifest stands beside the three whole outputs of its series. */
    private static void assertOnlyWholeOutputs(Path out) throws IOException {
        if (!Files.isDirectory(out)) return;
        ObjectMapper json = new ObjectMapper();
        List<Path> files;
        try (Stream<Path> s = Files.walk(out)) {
            files = new ArrayList<>(s.filter(Files::isRegularFile).toList());
        }
        for (Path f : files) {
            if (hidden(out, f)) continue;
            String name = f.getFileName().toString();
            String text = Files.readString(f);
            if (name.endsWith(".json")) json.readTree(text); // throws on a half-written document
            else if (name.endsWith(".html")) assertTrue(text.stripTrailing().endsWith("</html>"), f + " is whole");
            else if (name.endsWith(".csv")) assertTrue(text.endsWith("\n"), f + " ends with its last record");
            else throw new AssertionError("unexpected visible file " + f);
            if (name.equals(Manifest.FILE_NAME)) {
                SeriesSummary row = json.readValue(text, Manifest.class).summary();
                if (!row.failed())
                    for (String out3 : new String[]{"analysis.json", "parts.csv", "report.html"})
                        assertTrue(Files.isRegularFile(f.resolveSibling(out3)), f + " stands beside " + out3);
            }
        }
        assertFalse(files.isEmpty() && !Files.isDirectory(out), "output folder");
    }

    /** Inside a staging folder or a temporary name: not an output yet. */
    private static boolean hidden(Path out, Path f) {
        for (Path part : out.relativize(f)) if (part.toString().startsWith(".")) return true;
        return false;
    }
}
