package org.risetrace.bench;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.Excitation;
import org.risetrace.analysis.LockIn;
import org.risetrace.analysis.LockInAnalysis;
import org.risetrace.analysis.LockInAnalyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * Cost of the lock-in analysis against the steady analysis on the same 1,000 frames of 640 x 512 (target: within
 * 20 % per frame), and its memory against the number of periods. The series is 40 simulated frames (a square-wave
 * source, period 8 s, camera on a stand) hard-linked 25 times over under new names, with a series.json giving 0.5 s
 * frames and the period: every frame is read, decoded, registered and rectified as in {@code risetrace analyze};
 * the repeated content does not change the cost. Runs alternate (steady, lock-in, steady, lock-in) so that the
 * other builds on the shared machine load both alike.
 * Run: mvn -B -o test -Dbench.exclude=none -Dgroups=benchmark -Dtest=LockInBenchmark
 */
@Tag("benchmark")
class LockInBenchmark {

    @Test
    void lockInCostsAboutWhatTheSteadyAnalysisCostsAndItsMemoryIsFlatInPeriods(@TempDir Path dir) throws IOException {
        SimulationOutput sim = Simulator.run(Scenarios.small(0.5).withSize(640, 512).withFrames(40, 0.5, 1.0)
                .withSquareWave(8.0, 0.5), dir.resolve("sim"));
        Path full = series(dir, sim, 1000), quarter = series(dir, sim, 250);
        Board board = BoardFile.read(full.resolve("board.json"), null);
        AnalysisOptions o = AnalysisOptions.defaults();
        int threads = SeriesAnalyzer.defaultThreads();
        Series s = Series.open(full);
        steady(Series.open(quarter), board, o, threads); // warm-up: JIT and class loading
        lockIn(Series.open(quarter), board, o, threads);
        int rounds = 3;
        for (int run = 0; run < rounds; run++) {
            double[] st = steady(s, board, o, threads), li = lockIn(s, board, o, threads);
            System.out.printf(Locale.ROOT, "round %d, 1000 frames 640x512, %d threads: steady %.2f ms wall, %.2f ms CPU "
                            + "per frame; lock-in %.2f ms wall, %.2f ms CPU per frame (of which the in-order lock-in "
                            + "accumulation %.3f ms, finish %.0f ms in all); ratio wall %.3f, CPU %.3f (target <= 1.2)%n",
                    run + 1, threads, st[0], st[1], li[0], li[1], li[2], li[3], li[0] / st[0], li[1] / st[1]);
        }

        // memory: per-pixel state and heap held after the analysis, 250 frames (15 periods) against 1000 (62)
        for (Path p : new Path[]{quarter, full}) {
            Series ser = Series.open(p);
            long before = usedAfterGc();
            Excitation ex = LockInAnalysis.excitation(ser.sidecar().injection());
            double[] t = new double[ser.size()];
            for (int i = 0; i < t.length; i++) t[i] = ser.tSeconds(i);
            LockInAnalysis li = new LockInAnalysis(board, ex, ex.window(t), o, SeriesAnalyzer.emissivity(ser.profile()), null);
            Analysis steady = SeriesAnalyzer.analyze(ser, board, p.resolve("board.json"), "bench", o,
                    SeriesAnalyzer.emissivity(ser.profile()), threads, Analyzer.Progress.NONE, li);
            long held = usedAfterGc() - before;
            LockIn result = li.finish(steady);
            System.out.printf(Locale.ROOT, "%d frames, %d whole periods: per-pixel lock-in state %.2f MB, heap held "
                            + "after the pass (both analyses, all frame records) %.1f MB; verdict %s%n", ser.size(),
                    result.result().periods(), li.pixelStateBytes() / 1e6, held / 1e6,
                    result.result().verdict().status().word());
        }
    }

    /** Process CPU time of all threads, ns (the JVM's own count; less disturbed by other builds than wall time). */
    private static long cpuNs() {
        return ((com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory
                .getOperatingSystemMXBean()).getProcessCpuTime();
    }

    /** {wall ms, CPU ms} per frame. */
    private static double[] steady(Series s, Board b, AnalysisOptions o, int threads) {
        long t0 = System.nanoTime(), c0 = cpuNs();
        Analysis a = SeriesAnalyzer.analyze(s, b, null, "bench", o, SeriesAnalyzer.emissivity(s.profile()), threads,
                Analyzer.Progress.NONE);
        if (a.result() == null) throw new IllegalStateException();
        return new double[]{(System.nanoTime() - t0) / 1e6 / s.size(), (cpuNs() - c0) / 1e6 / s.size()};
    }

    /**
     * {wall ms, CPU ms, in-order accumulation ms} per frame and the finish in ms: the steps of
     * {@link LockInAnalyzer#analyze} with the accumulator timed on the caller's thread.
     */
    private static double[] lockIn(Series s, Board b, AnalysisOptions o, int threads) {
        long t0 = System.nanoTime(), c0 = cpuNs();
        Excitation ex = LockInAnalysis.excitation(s.sidecar().injection());
        double[] t = new double[s.size()];
        for (int i = 0; i < t.length; i++) t[i] = s.tSeconds(i);
        LockInAnalysis li = new LockInAnalysis(b, ex, ex.window(t), o, SeriesAnalyzer.emissivity(s.profile()), null);
        long[] accumulate = new long[1];
        Analysis steady = SeriesAnalyzer.analyze(s, b, null, "bench", o, SeriesAnalyzer.emissivity(s.profile()),
                threads, Analyzer.Progress.NONE, sample -> {
                    long a0 = System.nanoTime();
                    li.accept(sample);
                    accumulate[0] += System.nanoTime() - a0;
                });
        long f0 = System.nanoTime();
        LockIn result = li.finish(steady);
        long finish = System.nanoTime() - f0;
        if (result.result() == null) throw new IllegalStateException();
        return new double[]{(System.nanoTime() - t0) / 1e6 / s.size(), (cpuNs() - c0) / 1e6 / s.size(),
                accumulate[0] / 1e6 / s.size(), finish / 1e6};
    }

    private static long usedAfterGc() {
        Runtime rt = Runtime.getRuntime();
        for (int i = 0; i < 3; i++) System.gc();
        return rt.totalMemory() - rt.freeMemory();
    }

    /** n frames: the 40 simulated ones hard-linked in turn, 0.5 s apart, with the period in series.json. */
    private static Path series(Path dir, SimulationOutput sim, int n) throws IOException {
        Path out = dir.resolve("series-" + n);
        Files.createDirectories(out);
        for (int i = 0; i < n; i++) {
            Path src = sim.frameFiles().get(i % sim.frameFiles().size());
            Files.createLink(out.resolve(String.format("f%04d.png", i + 1)), src);
        }
        Files.copy(sim.boardFile(), out.resolve("board.json"));
        ObjectMapper json = new ObjectMapper();
        ObjectNode sidecar = (ObjectNode) json.readTree(sim.directory().resolve("series.json").toFile());
        sidecar.remove("frames");
        sidecar.put("frame_interval_s", 0.5);
        json.writeValue(out.resolve("series.json").toFile(), sidecar);
        return out;
    }
}
