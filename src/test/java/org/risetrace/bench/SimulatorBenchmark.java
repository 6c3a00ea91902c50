package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.risetrace.sim.Truth;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Simulating a 640 x 512 camera view of a 300-frame series (the phase-short board at twice the bundled resolution,
 * 0.5 mm thermal grid, 16-bit PNG): prints seconds and the grid size. Not a timed test; run with
 * {@code mvn -B test -Dbench.exclude=none -Dgroups=benchmark -Dtest=SimulatorBenchmark}.
 */
@Tag("benchmark")
class SimulatorBenchmark {
    @TempDir
    Path dir;

    @Test
    void simulate640x512With300Frames() throws IOException {
        Scenario s = Scenario.read(Path.of("sample-frames/phase-short/scenario.json"))
                .withSize(640, 512).withFrames(300, 0.5, 5.0);
        // warm-up on a short run so the JIT has compiled the hot loops
        Simulator.run(s.withFrames(4, 0.5, 1.0), dir.resolve("warm"));
        java.lang.management.OperatingSystemMXBean os = java.lang.management.ManagementFactory.getOperatingSystemMXBean();
        long cpu0 = os instanceof com.sun.management.OperatingSystemMXBean sun ? sun.getProcessCpuTime() : -1;
        double load = os.getSystemLoadAverage();
        long t0 = System.nanoTime();
        SimulationOutput out = Simulator.run(s, dir.resolve("run"));
        double seconds = (System.nanoTime() - t0) / 1e9;
        long cpu1 = os instanceof com.sun.management.OperatingSystemMXBean sun ? sun.getProcessCpuTime() : -1;
        double cpuSeconds = (cpu1 - cpu0) / 1e9;
        Truth.Grid g = out.truth().grid();
        long bytes;
        try (Stream<Path> files = Files.list(dir.resolve("run"))) {
            bytes = files.mapToLong(f -> f.toFile().length()).sum();
        }
        assertEquals(300, out.frameFiles().size());
        System.out.printf("SimulatorBenchmark: 640x512 px, 300 frames, thermal grid %d x %d cells (%.2f mm) + %d parts, "
                        + "time step %.2f s over %.1f s: %.1f s wall, %.1f s CPU (all threads), %.0f ms wall per frame, "
                        + "%.1f MB written, %d cores, load average %.1f at the start%n",
                g.nx(), g.ny(), g.dxMm(), out.truth().partTemperaturesC().size(), g.timeStepS(),
                out.truth().frames().get(299).tS(), seconds, cpuSeconds, 1000 * seconds / 300, bytes / 1e6,
                Runtime.getRuntime().availableProcessors(), load);
    }
}
