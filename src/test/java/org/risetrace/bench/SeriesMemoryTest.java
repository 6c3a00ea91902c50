package org.risetrace.bench;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.Simulator;

import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Memory flat in the number of frames (issue 11, item 7), not timed: a series and one ten times as long (the same
 * frames played forward and back, {@link Bench#repeated}) are analysed with their reports in child JVMs under the
 * same small heap limit ({@link HeapProbe}); the live heap (full collections at ten moments) must not grow with the
 * frames, and what the finished result keeps (per-frame records and curves) stays a few kilobytes per frame.
 */
class SeriesMemoryTest {

    @Test
    void tenTimesTheFramesNeedsNoMoreHeap(@TempDir Path dir) {
        Scenario sc = Scenarios.small(0.3).withSize(320, 256).withFrames(30, 0.5, 2.0)
                .withMotion(Scenario.Motion.handheld(0.5, 0.01, 0.01));
        Path shortSeries = Simulator.run(sc, dir.resolve("short")).directory();
        Path longSeries = Bench.repeated(shortSeries, dir.resolve("long"), 300);
        Bench.HeapRow a = Bench.child(shortSeries, dir.resolve("out-short"), "-Xmx128m");
        Bench.HeapRow b = Bench.child(longSeries, dir.resolve("out-long"), "-Xmx128m");
        System.out.printf("30 frames: live max %.1f MiB, retained %.2f MiB; 300 frames: %.1f MiB, %.2f MiB%n",
                a.liveMaxBytes() / 1048576.0, a.retainedBytes() / 1048576.0, b.liveMaxBytes() / 1048576.0,
                b.retainedBytes() / 1048576.0);
        assertTrue(a.frames() == 30 && b.frames() == 300);
        // the largest live heap (full collections at each tenth of the frames): within 10 % (the bound for
        // the benchmark) plus 1 MiB for the per-frame records the result must hold
        assertTrue(b.liveMaxBytes() <= 1.1 * a.liveMaxBytes() + (1 << 20),
                "heap grew with the frames: " + a + " -> " + b);
        // what the result holds per extra frame (file name, SHA-256, corners, times, curves): under 4 KiB a frame
        double perFrame = (b.retainedBytes() - a.retainedBytes()) / 270.0;
        assertTrue(perFrame < 4096, "result holds " + perFrame + " bytes per frame");
    }
}
