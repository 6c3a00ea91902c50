package org.risetrace.synth;

import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;

/**
 * Heat as closed-form curves, no heat equation: from the injection start every part's body rises uniformly by
 * {@code rate * g(tau)}, where g is a one- or two-time-constant curve with slope 1 at tau = 0,
 * {@code g(tau) = f tau1 (1 - exp(-tau/tau1)) + (1 - f) tau2 (1 - exp(-tau/tau2))}, the same shape for every part
 * of a series (so the ratio of two parts' rises is the ratio of their initial rates at every time). A heating part
 * also leaks onto the bare board around it as a Gaussian spot whose variance grows as in plane diffusion from a
 * point, {@code sigma^2 = s0^2 + 2 D tau}, with the amplitude falling as {@code s0^2 / sigma^2} so that the spot's
 * heat stays a chosen fraction of the part's own rise times its area (the 2-D diffusion kernel's normalisation).
 * The whole board warms uniformly by a small fraction of the leader's curve; ambient drifts by a few hundredths of
 * a kelvin (a ramp or half a sine).
 */
final class SpotHeat {
    final double injectionStartS;
    final double tau1S, tau2S, fastFraction;
    /** Each marked part's own initial rate (K/s) above the board's warming. */
    final double[] ownRateKPerS;
    /** Uniform board warming's initial rate (K/s); parts sit on the board and carry it too. */
    final double boardRateKPerS;
    final double spotFraction, diffusivityMm2PerS;
    final double ambientDriftK;
    final boolean driftIsRamp;
    final double seriesEndS;

    private SpotHeat(double injectionStartS, double tau1S, double tau2S, double fastFraction, double[] ownRateKPerS,
                     double boardRateKPerS, double spotFraction, double diffusivityMm2PerS, double ambientDriftK,
                     boolean driftIsRamp, double seriesEndS) {
        this.injectionStartS = injectionStartS;
        this.tau1S = tau1S;
        this.tau2S = tau2S;
        this.fastFraction = fastFraction;
        this.ownRateKPerS = ownRateKPerS;
        this.boardRateKPerS = boardRateKPerS;
        this.spotFraction = spotFraction;
        this.diffusivityMm2PerS = diffusivityMm2PerS;
        this.ambientDriftK = ambientDriftK;
        this.driftIsRamp = driftIsRamp;
        this.seriesEndS = seriesEndS;
    }

    /** The rise shape: 0 before the injection, slope 1 K/s per K/s of initial rate at the start. */
    double shape(double tS) {
        double tau = tS - injectionStartS;
        if (tau <= 0) return 0;
        double g = fastFraction * tau1S * -Math.expm1(-tau / tau1S);
        if (fastFraction < 1) g += (1 - fastFraction) * tau2S * -Math.expm1(-tau / tau2S);
        return g;
    }

    /** Ambient offset (K) from its value at t = 0. */
    double ambientOffsetK(double tS) {
        double x = seriesEndS <= 0 ? 0 : tS / seriesEndS;
        return driftIsRamp ? ambientDriftK * x : ambientDriftK * Math.sin(Math.PI * x);
    }

    /** True total initial rate of part p: its own plus the board's warming. */
    double initialRateKPerS(int p) {
        return ownRateKPerS[p] + boardRateKPerS;
    }

    /** True rise of part p above ambient at time tS (K). */
    double riseK(int p, double tS) {
        return initialRateKPerS(p) * shape(tS);
    }

    /** Spot variance (mm^2) of a part whose body has half-size s0 (mm), at time tS. */
    double spotVarianceMm2(double s0Mm, double tS) {
        double tau = Math.max(0, tS - injectionStartS);
        return s0Mm * s0Mm + 2 * diffusivityMm2PerS * tau;
    }

    /** Spot peak (K) on the board around part p at time tS. */
    double spotPeakK(int p, double s0Mm, double tS) {
        return spotFraction * ownRateKPerS[p] * shape(tS) * s0Mm * s0Mm / spotVarianceMm2(s0Mm, tS);
    }

    /**
     * Draws the curve shape and the rates of {@code parts} parts for a heating mode; {@code heated} receives the
     * indices of the leading part(s) in order (empty for no heating).
     */
    static SpotHeat draw(SplittableRandom rnd, SpotSeries.Config c, List<SpotBoard.PartLayout> layout,
                         List<Integer> heated) {
        int parts = layout.size();
        double end = (c.frames() - 1) * c.intervalS();
        double tau1 = 6 + 34 * rnd.nextDouble();
        boolean two = rnd.nextBoolean();
        double tau2 = two ? 60 + 240 * rnd.nextDouble() : tau1;
        double fast = two ? 0.4 + 0.4 * rnd.nextDouble() : 1.0;
        double spot = 0.3 + 0.3 * rnd.nextDouble();
        double diffusivity = 0.2 + 1.3 * rnd.nextDouble();
        double drift = c.ambientDriftK() * (2 * rnd.nextDouble() - 1);
        boolean ramp = rnd.nextBoolean();
        double beta = 0.02 + 0.04 * rnd.nextDouble();
        double[] total = new double[parts];
        SpotSeries.Heating h = c.heating();
        List<Integer> eligible = new java.util.ArrayList<>();
        int largest = 0;
        for (int p = 0; p < parts; p++) {
            SpotBoard.PartLayout l = layout.get(p);
            if (Math.min(l.wMm(), l.hMm()) >= h.leaderMinSideMm()) eligible.add(p);
            SpotBoard.PartLayout big = layout.get(largest);
            if (l.wMm() * l.hMm() > big.wMm() * big.hMm()) largest = p;
        }
        int first = eligible.isEmpty() ? largest : eligible.get(rnd.nextInt(eligible.size()));
        int second;
        if (h.mode() == SpotSeries.HeatingMode.TWO_ALIKE && eligible.size() > 1) {
            eligible.remove((Integer) first);
            second = eligible.get(rnd.nextInt(eligible.size()));
        } else {
            second = (first + 1 + rnd.nextInt(parts - 1)) % parts;
        }
        SpotHeat probe = new SpotHeat(c.injectionStartS(), tau1, tau2, fast, new double[parts], 0, spot, diffusivity,
                drift, ramp, end);
        double board = 0;
        switch (h.mode()) {
            case NONE -> { }
            case LEADER, TWO_ALIKE -> {
                double lead = h.riseK() / probe.shape(end);
                double runner = lead / h.ratio();
                board = beta * lead;
                total[first] = lead;
                total[second] = runner;
                double othersMax = h.mode() == SpotSeries.HeatingMode.LEADER ? 0.9 * runner : 0.4 * runner;
                for (int p = 0; p < parts; p++)
                    if (p != first && p != second) total[p] = board + (othersMax - board) * rnd.nextDouble();
                heated.add(first);
                if (h.mode() == SpotSeries.HeatingMode.TWO_ALIKE) heated.add(second);
            }
        }
        double[] own = new double[parts];
        for (int p = 0; p < parts; p++) own[p] = Math.max(0, total[p] - board);
        if (h.mode() == SpotSeries.HeatingMode.NONE) Arrays.fill(own, 0);
        return new SpotHeat(c.injectionStartS(), tau1, tau2, fast, own, board, spot, diffusivity, drift, ramp, end);
    }
}
