package org.risetrace.synth;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Generation speed of {@link SpotSeries}: 20 random 320 x 240 series of 40 frames (16-bit and 8-bit, stand and
 * hand-held, leader), after a warm-up. Prints milliseconds per series (wall and this thread's CPU). Not a timed
 * test; run with {@code mvn -B test -Dbench.exclude=none -Dgroups=benchmark -Dtest=SpotSeriesBenchmark}.
 */
@Tag("benchmark")
class SpotSeriesBenchmark {
    @TempDir
    Path dir;

    @Test
    void generate20SeriesOf40Frames() {
        for (int i = 0; i < 3; i++)
            SpotSeries.generate(SpotSeries.random(900 + i, SpotSeries.HeatingMode.LEADER, SpotSeries.MotionKind.HANDHELD,
                    SpotSeries.Encoding.U16_CENTIKELVIN), dir.resolve("warm" + i));
        java.lang.management.ThreadMXBean tx = java.lang.management.ManagementFactory.getThreadMXBean();
        double load = java.lang.management.ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
        long cpu0 = tx.getCurrentThreadCpuTime(), t0 = System.nanoTime();
        int n = 20;
        for (int i = 0; i < n; i++) {
            SpotSeries.Output out = SpotSeries.generate(SpotSeries.random(1000 + i, SpotSeries.HeatingMode.LEADER,
                    i % 2 == 0 ? SpotSeries.MotionKind.STAND : SpotSeries.MotionKind.HANDHELD,
                    i % 4 < 2 ? SpotSeries.Encoding.U16_CENTIKELVIN : SpotSeries.Encoding.U8_SPAN), dir.resolve("s" + i));
            assertEquals(40, out.fileNames().size());
        }
        double wallMs = (System.nanoTime() - t0) / 1e6 / n, cpuMs = (tx.getCurrentThreadCpuTime() - cpu0) / 1e6 / n;
        System.out.printf(java.util.Locale.ROOT, "SpotSeriesBenchmark: 320x240, 40 frames: %.0f ms wall, %.0f ms CPU "
                        + "(this thread) per series; %d cores, load average %.1f at the start%n", wallMs, cpuMs,
                Runtime.getRuntime().availableProcessors(), load);
    }
}
