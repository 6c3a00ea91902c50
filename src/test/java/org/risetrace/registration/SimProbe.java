package org.risetrace.registration;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.board.Outline;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.risetrace.sim.Truth;

import java.nio.file.Path;

@Tag("benchmark")
class SimProbe {
    @Test
    void probe() throws Exception {
        Path dir = Path.of("target/simprobe");
        for (int s = 7; s < 8; s++) {
            long t0 = System.nanoTime();
            Scenario sc = (s % 2 == 0 ? Scenarios.small(1.5 + 0.1 * s).withSeed(6000 + s) : Scenarios.random(6000 + s, 10, 1.5))
                    .withMotion(s < 4 ? Scenario.Motion.handheld(5, 0.10, 0.15) : Scenario.Motion.stand(0.15)).withFrames(8, 1.0, 1.0);
            System.out.println("variant " + s);
            SimulationOutput out = Simulator.run(sc, dir.resolve("s" + s));
            long t1 = System.nanoTime();
            Truth truth = out.truth();
            Board clicked = BoardFile.read(out.boardFile(), null);
            String refName = clicked.outline().frame();
            Board board = new Board(clicked.name(), clicked.sizeMm(), new Outline(refName, truth.frames().get(0).boardCornersPx(), null), clicked.parts(), null);
            Series series = Series.open(out.directory());
            Frame ref = series.read(0);
            Registrar reg = Registrars.create(ref, board, new RegistrationConfig("auto", 0, 0.6, -1, 0.35, 10, 0.6, -1, 1.6, 20, 0.35));
            System.out.printf("sim %.0f ms; corners %s%n", (t1 - t0) / 1e6, java.util.Arrays.deepToString(truth.frames().get(0).boardCornersPx()));
            for (int i = 1; i < series.size(); i++) {
                Frame f = series.read(i);
                long a = System.nanoTime();
                FrameRegistration g = reg.register(f);
                long b = System.nanoTime();
                double e = g.boardCornersPx() == null ? Double.NaN : SyntheticScene.cornerError(g.boardCornersPx(), truth.frames().get(i).boardCornersPx());
                System.out.printf("s%d f%d %s err %.3f sim %.3f rms %.3f inl %d %.1f ms %s%n", s, i, g.status(), e, g.similarity(), g.rmsPx(), g.inliers(), (b - a) / 1e6, g.reason());
            }
        }
    }
}
