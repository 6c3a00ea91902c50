package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.batch.BatchRunner;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.Simulator;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

/**
 * Batch throughput: eight series of 60 frames (320 x 256, 16-bit PNG, stand; two simulated series, each hard-linked
 * into four folders: the cost per frame is that of distinct frames, since every frame is read, decoded, registered
 * and rectified), analysed with --force by {@link BatchRunner#run} as {@code risetrace batch} does, in three ways:
 * one job on one thread, one job on all threads (frames in parallel, the default for --jobs 1), and one job per core
 * with one thread each (series in parallel, the default). Rounds alternate the three so that other load on a shared
 * machine falls on all alike. Nothing is asserted; the numbers go to DEVELOPERS.md ("Batch benchmark").
 * Run: mvn -B -o test -Dbench.exclude=none -Dgroups=benchmark -Dtest=BatchBenchmark
 */
@Tag("benchmark")
class BatchBenchmark {

    @Test
    void batchThroughputSeriesParallelAgainstFrameParallel(@TempDir Path dir) throws IOException {
        Path root = dir.resolve("captures");
        Path[] sims = {dir.resolve("sim-a"), dir.resolve("sim-b")};
        Simulator.run(Scenarios.small(1.5).withSize(320, 256).withFrames(60, 0.5, 2.0).withSeed(1L), sims[0]);
        Simulator.run(Scenarios.small(0.8).withSize(320, 256).withFrames(60, 0.5, 2.0).withSeed(2L), sims[1]);
        for (int k = 0; k < 8; k++) {
            Path target = Files.createDirectories(root.resolve("board-" + (k % 2)).resolve("run-" + k));
            try (Stream<Path> files = Files.list(sims[k % 2])) {
                for (Path f : files.toList()) Files.createLink(target.resolve(f.getFileName()), f);
            }
        }
        int cores = Runtime.getRuntime().availableProcessors();
        BatchRunner.Options base = BatchRunner.Options.defaults().withForce(true);
        List<BatchRunner.Options> ways = List.of(
                new BatchRunner.Options(base.analysis(), null, 1, 1, true, base.shard()),
                new BatchRunner.Options(base.analysis(), null, 1, null, true, base.shard()),
                new BatchRunner.Options(base.analysis(), null, cores, null, true, base.shard()));
        String[] names = {"--jobs 1 --threads 1", "--jobs 1 (all threads)", "--jobs " + cores + " (1 thread each)"};
        BatchRunner.run(root, dir.resolve("warm"), ways.get(2), BatchRunner.Listener.NONE); // JIT and class loading
        int rounds = 3;
        double[] seconds = new double[ways.size()];
        for (int r = 0; r < rounds; r++)
            for (int w = 0; w < ways.size(); w++) {
                long t0 = System.nanoTime();
                BatchRunner.Outcome o = BatchRunner.run(root, dir.resolve("out-" + w), ways.get(w), BatchRunner.Listener.NONE);
                seconds[w] += (System.nanoTime() - t0) / 1e9;
                if (o.summary().failed() != 0) throw new AssertionError("a series failed: " + o.summary());
            }
        System.out.printf(Locale.ROOT, "batch benchmark, %d cores, 8 series x 60 frames of 320 x 256, %d rounds%n", cores, rounds);
        for (int w = 0; w < ways.size(); w++) {
            double s = seconds[w] / rounds;
            System.out.printf(Locale.ROOT, "  %-28s %6.2f s per batch, %6.1f frames/s, %.2f x one job on one thread%n",
                    names[w], s, 480 / s, seconds[0] / seconds[w]);
        }
    }
}
