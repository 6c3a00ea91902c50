package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Registrar;
import org.risetrace.registration.Registrars;
import org.risetrace.registration.RegistrationConfig;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;

import javax.imageio.ImageIO;
import java.io.ByteArrayInputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Registration cost per 640 x 512 frame (stand and hand-held) against the cost of decoding the same frame from its
 * 16-bit PNG with the JDK's ImageIO, measured in one run (target, issue #4: ratio at most 1.0), and against the
 * tool's own import of the files (its direct PNG decoder, about three times faster than ImageIO).
 * Run: mvn -B test -Dbench.exclude=none -Dgroups=benchmark -Dtest=RegistrationBenchmark
 */
@Tag("benchmark")
class RegistrationBenchmark {
    @TempDir
    Path dir;

    @Test
    void registrationCostPerFrameAgainstDecodeCost() throws Exception {
        for (String kind : new String[]{"stand", "hand-held"}) {
            Scenario.Motion motion = kind.equals("stand") ? Scenario.Motion.stand(0.15)
                    : Scenario.Motion.handheld(5, 0.10, 0.15);
            Scenario sc = Scenarios.small(1.5).withSize(640, 512).withMotion(motion).withFrames(12, 1.0, 1.0).withSeed(9);
            SimulationOutput out = Simulator.run(sc, dir.resolve(kind));
            Board board = BoardFile.read(out.boardFile(), null);
            Series series = Series.open(out.directory());
            List<Frame> frames = new ArrayList<>();
            List<byte[]> bytes = new ArrayList<>();
            Frame ref = null;
            for (int i = 0; i < series.size(); i++) {
                Frame f = series.read(i);
                if (f.fileName().equals(board.outline().frame())) ref = f;
                else {
                    frames.add(f);
                    bytes.add(Files.readAllBytes(series.file(i)));
                }
            }
            Registrar reg = Registrars.create(ref, board, RegistrationConfig.defaults());
            // warm-up: one pass of each, then timed passes
            for (Frame f : frames) reg.register(f);
            for (byte[] b : bytes) ImageIO.read(new ByteArrayInputStream(b));
            int rounds = 3, ok = 0;
            long reg0 = System.nanoTime();
            for (int r = 0; r < rounds; r++)
                for (Frame f : frames) {
                    FrameRegistration g = reg.register(f);
                    if (r == 0 && g.status() == org.risetrace.registration.RegistrationStatus.OK) ok++;
                    else if (r == 0) System.out.println("  " + f.fileName() + " " + g.status() + ": " + g.reason());
                }
            long reg1 = System.nanoTime();
            long dec0 = System.nanoTime();
            for (int r = 0; r < rounds; r++) for (byte[] b : bytes) ImageIO.read(new ByteArrayInputStream(b));
            long dec1 = System.nanoTime();
            // and the tool's own import of the same files (read, SHA-256, its PNG decoder, mapping to Celsius)
            for (int i = 0; i < series.size(); i++) series.read(i); // warm-up of the import path
            long imp0 = System.nanoTime();
            for (int r = 0; r < rounds; r++)
                for (int i = 0; i < series.size(); i++) if (!series.fileName(i).equals(board.outline().frame())) series.read(i);
            long imp1 = System.nanoTime();
            double regMs = (reg1 - reg0) / 1e6 / (rounds * frames.size());
            double decMs = (dec1 - dec0) / 1e6 / (rounds * frames.size());
            double impMs = (imp1 - imp0) / 1e6 / (rounds * frames.size());
            System.out.printf(Locale.ROOT, "registration benchmark %s 640x512: register %.2f ms/frame, ImageIO decode %.2f "
                    + "ms/frame, ratio %.2f; risetrace import %.2f ms/frame, ratio %.2f (%d of %d frames ok)%n", kind,
                    regMs, decMs, regMs / decMs, impMs, regMs / impMs, ok, frames.size());
        }
    }
}
