package org.risetrace.bench;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.cli.Main;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code risetrace bench --quick} through {@link Main#run}: the structure of what it reports (every measurement
 * present, finite and positive, each ratio the quotient of the rates it names), not its timings; and the
 * generated series removed afterwards.
 */
class BenchCommandTest {

    @Test
    void quickBenchReportsEveryMeasurementAndCleansUp(@TempDir Path dir) throws Exception {
        PrintStream oldOut = System.out, oldErr = System.err;
        ByteArrayOutputStream out = new ByteArrayOutputStream(), err = new ByteArrayOutputStream();
        int code;
        try {
            System.setOut(new PrintStream(out, true, StandardCharsets.UTF_8));
            System.setErr(new PrintStream(err, true, StandardCharsets.UTF_8));
            code = Main.run("bench", "--quick", "--json", "--work-dir", dir.toString());
        } finally {
            System.setOut(oldOut);
            System.setErr(oldErr);
        }
        assertEquals(0, code, err.toString(StandardCharsets.UTF_8));
        JsonNode r = new ObjectMapper().readTree(out.toString(StandardCharsets.UTF_8)); // stdout is the JSON alone
        assertTrue(r.get("quick").asBoolean());
        List<String> names = List.of("hand-held-png", "hand-held-tiff", "stand-png", "stand-tiff");
        assertEquals(names.size(), r.get("series").size());
        for (int k = 0; k < names.size(); k++) {
            JsonNode s = r.get("series").get(k);
            assertEquals(names.get(k), s.get("series").asText());
            assertEquals(12, s.get("frames").asInt());
            for (String f : List.of("decode_fps", "import_fps", "registration_fps", "analysis_fps",
                    "analysis_all_cores_fps", "peak_heap_bytes"))
                assertTrue(s.get(f).asDouble() > 0 && Double.isFinite(s.get(f).asDouble()), names.get(k) + " " + f);
            assertTrue(s.get("verdict").asText().length() > 0);
        }
        JsonNode b = r.get("batch");
        assertEquals(4, b.get("series_count").asInt());
        assertEquals(48, b.get("frames").asInt());
        for (String f : List.of("one_job_one_thread_fps", "one_job_all_threads_fps", "two_jobs_fps"))
            assertTrue(b.get(f).asDouble() > 0, f);
        assertEquals(2, r.get("cold").size());
        for (JsonNode c : r.get("cold")) {
            assertTrue(c.get("wall_seconds").asDouble() > 0);
            // the child's own timing line (analyze -Drisetrace.timing=true) was found and passed on
            assertTrue(c.get("timing").asText().contains("analysis"), c.toString());
        }
        JsonNode heap = r.get("heap");
        assertEquals(5, heap.size());
        assertEquals(12, heap.get(0).get("frames").asInt());
        assertEquals(120, heap.get(1).get("frames").asInt()); // ten times as long, in the same heap limit
        assertEquals("256m", heap.get(1).get("heap_limit").asText());
        assertEquals("default", heap.get(2).get("heap_limit").asText());
        // the short and the long series again, in a heap near what one thread needs, on one thread
        assertEquals(12, heap.get(3).get("frames").asInt());
        assertEquals(120, heap.get(4).get("frames").asInt());
        for (int k = 3; k < 5; k++) {
            assertEquals("128m", heap.get(k).get("heap_limit").asText());
            assertEquals(1, heap.get(k).get("threads").asInt());
        }
        for (JsonNode h : heap)
            assertTrue(h.get("pool_peak_bytes").asLong() > 0 && h.get("live_max_bytes").asLong() > 0
                    && h.get("ms_per_frame").asDouble() > 0
                    // the heap at its fullest holds at least what it kept after a collection
                    && h.get("peak_in_use_bytes").asLong() >= h.get("after_gc_max_bytes").asLong(), h.toString());
        assertEquals(8, r.get("targets").size());
        // each target's value is the quotient it names, from the numbers above
        double worst = Double.POSITIVE_INFINITY;
        for (JsonNode s : r.get("series")) worst = Math.min(worst, s.get("analysis_fps").asDouble() / s.get("decode_fps").asDouble());
        assertEquals(worst, r.get("targets").get(0).get("value").asDouble(), 1e-9 * worst);
        assertEquals(b.get("two_jobs_fps").asDouble() / b.get("one_job_one_thread_fps").asDouble(),
                r.get("targets").get(2).get("value").asDouble(), 1e-9);
        assertEquals(heap.get(1).get("live_max_bytes").asDouble() / Math.max(heap.get(0).get("live_max_bytes").asDouble(),
                        heap.get(2).get("live_max_bytes").asDouble()),
                r.get("targets").get(4).get("value").asDouble(), 1e-9);
        assertEquals(heap.get(4).get("live_max_bytes").asDouble() / heap.get(3).get("live_max_bytes").asDouble(),
                r.get("targets").get(5).get("value").asDouble(), 1e-9);
        assertEquals(heap.get(4).get("ms_per_frame").asDouble() / heap.get(3).get("ms_per_frame").asDouble(),
                r.get("targets").get(6).get("value").asDouble(), 1e-9);
        assertTrue(b.get("warm_up_batches").asInt() == 0, "--quick times the batch without warming up");
        assertEquals(0, r.get("warm_up_rounds").asInt(), "--quick measures the series without warming up");
        try (Stream<Path> left = Files.list(dir)) {
            assertEquals(0, left.count(), "the generated series are removed");
        }
    }

    @Test
    void tableShowsEveryRowAndMarksMissedTargets() {
        Bench.SeriesRow s = new Bench.SeriesRow("hand-held-png", 300, 50, 150, 60, 30, 55, 80L << 20, "identified Q1");
        Bench.Result r = new Bench.Result(2, "17", 1.0, 1.2, 640, 512, false, 3, 0.04, List.of(s),
                new Bench.BatchRow(4, 1200, 20, 35, 36, 3, 0.04, 0.02), List.of(new Bench.ColdRow("x", 3.5, "t")),
                List.of(new Bench.HeapRow(300, "256m", 0, 25, 180L << 20, 200L << 20, 90L << 20, 60L << 20, 1L << 20, "identified"),
                        new Bench.HeapRow(3000, "256m", 0, 24, 207L << 20, 210L << 20, 99L << 20, 62L << 20, 3L << 20, "identified"),
                        new Bench.HeapRow(300, "default", 0, 22, 250L << 20, 300L << 20, 95L << 20, 61L << 20, 1L << 20, "identified"),
                        new Bench.HeapRow(300, "128m", 1, 40, 120L << 20, 130L << 20, 80L << 20, 50L << 20, 1L << 20, "identified"),
                        new Bench.HeapRow(3000, "128m", 1, 50, 124L << 20, 140L << 20, 92L << 20, 52L << 20, 3L << 20, "identified")),
                null);
        r = new Bench.Result(r.cores(), r.java(), r.loadAverageBefore(), r.loadAverageAfter(), r.width(), r.height(),
                r.quick(), r.warmUpRounds(), r.lastWarmUpCompilerShare(), r.series(), r.batch(), r.cold(), r.heap(), Bench.targets(r.series(), r.batch(), r.cold(), r.heap()));
        String t = Bench.table(r);
        // 30 / 50 = 0.60 of the bare decode on one thread, 55 / 50 = 1.10 on all cores
        assertTrue(t.contains("30.0 (0.60x)"), t);
        assertTrue(t.contains("55.0 (1.10x)"), t);
        assertTrue(t.contains("two jobs 36.0 f/s = 1.80x"), t);
        // the record's own 3 rounds and 0.04 share, as the table words them
        assertTrue(t.contains("(3 untimed rounds over the four series before, compilers 4 % of the last one's wall time)"), t);
        assertTrue(t.lines().anyMatch(l -> l.startsWith("  met ") && l.contains("two jobs")), t);
        // 24 ms per frame against 22: 1.09, within 1.2; 62 MiB live against the larger of 60 and 61 (the two runs
        // of 300 frames): 1.02
        assertTrue(t.lines().anyMatch(l -> l.startsWith("  met ") && l.contains("time per frame") && l.contains("1.09")), t);
        assertTrue(t.lines().anyMatch(l -> l.startsWith("  met ") && l.contains("live heap") && l.contains("1.02")), t);
        assertTrue(t.lines().anyMatch(l -> l.startsWith("  met ") && l.contains("cold analyze") && l.contains("3.50")), t);
        // in the tight heap: 52 MiB live against 50: 1.04, within 1.1; 50 ms per frame against 40: 1.25, over 1.2
        assertTrue(t.lines().anyMatch(l -> l.startsWith("  met ") && l.contains("live heap")
                && l.contains("128m, one thread") && l.contains("1.04")), t);
        assertTrue(t.lines().anyMatch(l -> l.startsWith("  MISS") && l.contains("time per frame, 3000 / 300")
                && l.contains("1.25")), t);
        // the peaks are shown, not judged: in use 207 MiB against 180 (1.15) and 124 against 120 (1.03); after
        // any collection 99 against 90 (1.10) and 92 against 80 (1.15)
        assertTrue(t.contains("3000 / 300 frames: peak in use 1.15 with 256m, 1.03 with 128m; largest after any "
                + "collection 1.10 and 1.15"), t);
        assertTrue(t.contains("(3 untimed batches before, compilers 4 % of the last one's wall time; compilers 2 % of the timed"), t);
    }
}
