package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.FootprintSampler;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Rectifier;
import org.risetrace.registration.Registrar;
import org.risetrace.registration.RegistrationConfig;
import org.risetrace.registration.Registrars;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;

import java.nio.file.Path;

/**
 * Costs of the analysis stage, measured in one run: per frame decode, registration, and the analysis work after
 * registration (rectify + footprint sampling), then the whole {@code analyze} of a 150-frame 640 x 480 hand-held
 * series. Run: mvn -B test -Dbench.exclude=none -Dgroups=benchmark -Dtest=AnalysisBenchmark
 */
@Tag("benchmark")
class AnalysisBenchmark {

    @Test
    void analysisCostPerFrameAndWholeSeries(@TempDir Path dir) {
        Scenario sc = Scenarios.small(0.3).withSize(640, 480).withFrames(150, 0.5, 5.0)
                .withMotion(Scenario.Motion.handheld(0.5, 0.01, 0.01));
        SimulationOutput out = Simulator.run(sc, dir.resolve("s"));
        Series s = Series.open(out.directory());
        Board b = BoardFile.read(out.boardFile(), null);
        AnalysisOptions o = AnalysisOptions.defaults();

        // per-frame costs on one thread
        Frame ref = s.read(0);
        Registrar reg = Registrars.create(ref, b, RegistrationConfig.defaults());
        Rectifier rect = new Rectifier(b, Rectifier.defaultPxPerMm(b));
        FootprintSampler fs = new FootprintSampler(b.partsOrEmpty(), rect.width(), rect.height(), rect.pxPerMm());
        double[] stats = new double[b.partsOrEmpty().size() * FootprintSampler.STATS];
        int n = 40;
        long decode = 0, register = 0, analysis = 0;
        for (int round = 0; round < 2; round++) { // first round warms the JIT
            decode = register = analysis = 0;
            for (int i = 0; i < n; i++) {
                long t0 = System.nanoTime();
                Frame f = s.read(i);
                long t1 = System.nanoTime();
                FrameRegistration r = reg.register(f);
                long t2 = System.nanoTime();
                if (r.boardToFrame() != null) {
                    BoardRaster br = rect.rectify(f, r.boardToFrame());
                    fs.sample(br.celsius(), br.valid(), stats);
                }
                long t3 = System.nanoTime();
                decode += t1 - t0;
                register += t2 - t1;
                analysis += t3 - t2;
            }
        }
        System.out.printf("per frame (640x480, board raster %dx%d): decode %.2f ms, registration %.2f ms, "
                        + "analysis after registration %.2f ms (%.2f x decode)%n", rect.width(), rect.height(),
                decode / 1e6 / n, register / 1e6 / n, analysis / 1e6 / n, (double) analysis / decode);

        // whole analyze on all cores: three runs in this JVM (the first includes more of the JIT's compiling), and
        // the same for a series over the full hand-held range of issue #4 (every frame a new pose)
        wholeAnalyze("mild hand-held (0.5 deg, 1 %, 1 %)", s, b, out.boardFile(), o);
        Scenario wide = Scenarios.small(0.3).withSize(640, 480).withFrames(150, 0.5, 5.0)
                .withMotion(Scenario.Motion.handheld(5, 0.10, 0.15));
        SimulationOutput out2 = Simulator.run(wide, dir.resolve("wide"));
        wholeAnalyze("full hand-held range (5 deg, 10 %, 15 %)", Series.open(out2.directory()),
                BoardFile.read(out2.boardFile(), null), out2.boardFile(), o);
    }

    private static void wholeAnalyze(String label, Series s, Board b, Path boardFile, AnalysisOptions o) {
        for (int run = 1; run <= 3; run++) {
            long t0 = System.nanoTime();
            Analysis a = SeriesAnalyzer.analyze(s, b, boardFile, "bench", o, SeriesAnalyzer.emissivity(s.profile()),
                    SeriesAnalyzer.defaultThreads(), Analyzer.Progress.NONE);
            double seconds = (System.nanoTime() - t0) / 1e9;
            System.out.printf("whole analyze, %s, run %d: %d frames in %.2f s = %.1f ms per frame (%d threads); "
                            + "verdict %s; target <= 2.25 s (10 x faster than 150 ms per frame)%n", label, run, s.size(),
                    seconds, 1000 * seconds / s.size(), SeriesAnalyzer.defaultThreads(),
                    a.result().verdict().status().word());
        }
    }
}
