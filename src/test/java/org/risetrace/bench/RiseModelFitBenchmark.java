package org.risetrace.bench;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.risetrace.analysis.RiseModelFit;

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
}
