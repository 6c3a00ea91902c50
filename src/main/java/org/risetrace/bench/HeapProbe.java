package org.risetrace.bench;

import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.io.Series;
import org.risetrace.report.Reports;

import java.nio.file.Path;
import java.util.Locale;

/**
 * The child process of {@code risetrace bench} that measures the heap: analyses one series (analysis and report, as
 * {@code analyze} does) under the heap limit its parent gave the JVM and prints one line
 * {@code frames=N seconds=S peak_in_use_bytes=U pool_peak_bytes=P after_gc_max_bytes=G live_max_bytes=L
 * retained_bytes=R verdict=V}: U the peak of the heap in use (all pools at one moment, garbage included), P the sum
 * of the pools' own peaks (reached at different moments), G the largest heap after any collection (a young collection leaves
 * old garbage), L the largest heap after a full collection at ten moments of the run (each tenth of the frames),
 * R the heap still in use after a full collection with the result held; L and R less the heap in use before.
 * Arguments: series folder, output folder, and optionally the number of worker threads (default: as
 * {@code analyze}).
 */
public final class HeapProbe {
    private HeapProbe() {
    }

    public static void main(String[] args) {
        Path series = Path.of(args[0]), out = Path.of(args[1]);
        int threads = args.length > 2 ? Integer.parseInt(args[2]) : SeriesAnalyzer.defaultThreads();
        long before = HeapWatch.usedAfterFullGc();
        try (HeapWatch watch = new HeapWatch()) {
            long t0 = System.nanoTime();
            Series s = Series.open(series);
            Board b = BoardFile.read(series.resolve("board.json"), null);
            long[] live = {0};
            // the live heap at ten moments of the run: a full collection each time a tenth of the frames is done
            // (the same ten pauses for any length, so the time per frame stays comparable between lengths)
            Analyzer.Progress sampler = (done, total) -> {
                if (done * 10L / total != (done - 1) * 10L / total) live[0] = Math.max(live[0], HeapWatch.usedAfterFullGc());
            };
            Analysis a = SeriesAnalyzer.analyze(s, b, series.resolve("board.json"), series.toString(),
                    AnalysisOptions.defaults(), SeriesAnalyzer.emissivity(s.profile()), threads,
                    sampler);
            Reports.writeAll(a, out, null, true);
            double seconds = (System.nanoTime() - t0) / 1e9;
            long peak = watch.peakInUseBytes(), pool = watch.poolPeakBytes(), afterGc = watch.maxAfterGcBytes();
            long retained = HeapWatch.usedAfterFullGc() - before;
            System.out.printf(Locale.ROOT, "frames=%d seconds=%.4f peak_in_use_bytes=%d pool_peak_bytes=%d "
                            + "after_gc_max_bytes=%d live_max_bytes=%d retained_bytes=%d verdict=%s%n", s.size(), seconds,
                    peak, pool, afterGc,
                    live[0] - before, retained, a.result().verdict().status().word());
            java.lang.ref.Reference.reachabilityFence(a);
        }
    }
}
