package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.analysis.RiseModelFit;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;

/**
 * Cost of one part's rise model fit (grid, one-constant LM, two-constant LM from three starts, covariances, choice)
 * for curves of 80, 150 and 1200 points after the start: die plus board, one constant, and a slow nearly straight
 * rise (a neighbour warmed by conduction). Run: mvn -B test -Dbench.exclude=none -Dgroups=benchmark
 * -Dtest=RiseModelFitBenchmark
 */
@Tag("benchmark")
class RiseModelFitBenchmark {

    @Test
    void fitCostPerPart() {
        double[][] shapes = {{1.4, 2.3, 1.3, 20.0}, {2.0, 12.0}, {0.3, 200.0}};
        String[] names = {"die + board", "one constant", "slow, nearly straight"};
        System.out.println("| points | curve | ms per fit (median of 5 passes) | model chosen |");
        System.out.println("|---|---|---|---|");
        for (int n : new int[]{80, 150, 1200}) {
            double step = 45.0 / 90 * 90 / n; // 80 points: 0.5 s frames as phase-short
            for (int s = 0; s < shapes.length; s++) {
                Random rnd = new Random(n + s);
                int curves = 40;
                double[][] t = new double[curves][n + 10], y = new double[curves][n + 10];
                for (int c = 0; c < curves; c++)
                    for (int i = 0; i < n + 10; i++) {
                        t[c][i] = i * step;
                        double tp = t[c][i] - 10 * step, v = 0;
                        if (tp > 0) for (int k = 0; k < shapes[s].length; k += 2)
                            v += shapes[s][k] * (1 - Math.exp(-tp / shapes[s][k + 1]));
                        y[c][i] = v + 0.02 * rnd.nextGaussian();
                    }
                double[] passes = new double[5];
                String model = "";
                for (int pass = -2; pass < 5; pass++) { // two warm-up passes for the JIT
                    long t0 = System.nanoTime();
                    int doubles = 0, singles = 0;
                    for (int c = 0; c < curves; c++) {
                        RiseModelFit f = RiseModelFit.fit(t[c], y[c], 10 * step);
                        if (f == null) continue;
                        if (f.isDouble()) doubles++; else singles++;
                    }
                    if (pass >= 0) passes[pass] = (System.nanoTime() - t0) / 1e6 / curves;
                    model = doubles + " double, " + singles + " single, " + (curves - doubles - singles) + " none";
                }
                java.util.Arrays.sort(passes);
                System.out.printf("| %d | %s | %.2f | %s |%n", n, names[s], passes[2], model);
            }
        }
    }

    /**
     * The fits' share of whole analyses: a simulated 150-frame series of a random 10-part board and the bundled
     * phase-short (90 frames, 21 parts) are analysed three times; then every curve with an onset is fitted again
     * 20 times and the time per analysis' worth of fits is set against the analysis' wall time.
     */
    @Test
    void fitShareOfWholeAnalyses(@TempDir Path dir) {
        SimulationOutput out = Simulator.run(Scenarios.random(31, 10, 0.4).withFrames(150, 0.5, 5.0), dir.resolve("r"));
        share("random 10 parts, 150 frames", out.directory());
        Path bundled = Path.of("sample-frames", "phase-short");
        if (Files.isDirectory(bundled)) share("phase-short, 90 frames", bundled);
    }

    private static void share(String name, Path dir) {
        Series s = Series.open(dir);
        Board b = BoardFile.read(dir.resolve("board.json"), Materials.load().names());
        Analysis a = null;
        long best = Long.MAX_VALUE;
        for (int run = 0; run < 3; run++) {
            long t0 = System.nanoTime();
            a = SeriesAnalyzer.analyze(s, b, dir.resolve("board.json"), dir.toString(), AnalysisOptions.defaults(),
                    SeriesAnalyzer.emissivity(s.profile()), 2, Analyzer.Progress.NONE);
            best = Math.min(best, System.nanoTime() - t0);
        }
        double start = ((Number) a.result().parameters().get("t_start_s")).doubleValue();
        int fitted = 0, onset = 0;
        long fitNs = Long.MAX_VALUE;
        for (int rep = 0; rep < 20; rep++) {
            long t0 = System.nanoTime();
            onset = 0;
            for (RiseCurve c : a.curves())
                if (c.onsetS() != null) {
                    onset++;
                    RiseModelFit.fit(c.tS(), c.riseK(), start);
                }
            fitNs = Math.min(fitNs, System.nanoTime() - t0);
        }
        for (RiseCurve c : a.curves()) if (c.fit() != null) fitted++;
        System.out.printf("%s: %d parts, %d with an onset, %d fitted; analysis %.0f ms (fastest of 3), "
                        + "all fits %.1f ms (fastest of 20) = %.1f %%%n", name, a.curves().size(), onset, fitted,
                best / 1e6, fitNs / 1e6, 100.0 * fitNs / best);
    }
}
