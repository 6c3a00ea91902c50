package org.risetrace.analysis;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.io.Series;
import org.risetrace.io.write.FrameEncoding;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.risetrace.sim.Truth;
import org.risetrace.synth.SpotSeries;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The confidence checks of issue 10 on captures from two different generators, through the whole pipeline (import,
 * registration, analysis): our own simulator ({@link Simulator}: finite-volume heat model, band-radiance camera) and
 * the test-scope spot model ({@link SpotSeries}: closed-form heat spots, linear emissivity mix, OpenCV warps), both
 * at 320 x 240, 40 frames at 2 frames/s, injection at 3 s.
 * <ul>
 * <li>LEADER, hand-held, 16-bit and auto-ranged 8-bit: the true leader 2-4 times faster than the runner-up and rising
 *     1-4 K; at least 90 % identified with the right part, at most 1 % of all series identified wrong.</li>
 * <li>TWO_ALIKE (two parts within 10 %): never identified with a third part. NONE (no heating): never identified.</li>
 * </ul>
 * {@code mvn test} runs a reduced set (per generator 6 + 6 leader series, 4 alike, 2 without heating: about a minute);
 * the full set (50 + 50, 50, 20 per generator) runs with {@code mvn test -Pconfidence} and its numbers are in
 * DEVELOPERS.md ("Confidence on hand-held captures"). With the reduced set a single miss in twelve is allowed
 * (11 of 12 = 92 %); with the full set the 90 % of the issue applies.
 *
 * <p>Simulator premise: two sources of the same kind, both with a side of at least 3 mm (as for the spot model: a
 * 2 x 1.25 mm capacitor with bright terminations showed a fifth of its simulated rise), with equal heat capacity and
 * contact conductance (the initial
 * rate is P / C, so the rates' ratio is near the power shares' ratio), shares drawn for a ratio of 2.2-3.8; a series
 * counts only when, on its noise-free twin (what the camera can see), the leader's rate is 2-4 times the runner-up's;
 * the power is then scaled for a visible leader rise of 1.5-3.5 K (the models are linear in the power). Spot model
 * premise: as configured ({@code random}: ratio 2-4,
 * rise 1-4 K; leaders drawn among parts with a side of at least 3 mm, since a 2 mm chip with bright end caps shows a
 * third of its rise at 2.6 px/mm, and in the leader sets no part under a bare metal lid: the premise is about
 * what the camera can see).
 */
class HandHeldConfidenceTest {
    static final boolean FULL = Boolean.getBoolean("confidence.full");
    static final int LEADER = FULL ? 50 : 6, ALIKE = FULL ? 50 : 4, NONE = FULL ? 20 : 2;

    @TempDir
    static Path dir;

    /** One analysed series. */
    record Outcome(String generator, String mode, String encoding, long seed, VerdictStatus status, String ref,
                   List<String> truth, String reason) {
        boolean identified() { return status == VerdictStatus.IDENTIFIED; }
        boolean right() { return identified() && truth.contains(ref); }
        @Override public String toString() {
            return String.format(Locale.ROOT, "%s %s %s #%d truth %s: %s %s (%s)", generator, mode, encoding, seed,
                    truth, status.word(), ref, reason);
        }
    }

    static Analysis analyze(Path seriesDir, Path boardFile) {
        Series s = Series.open(seriesDir);
        Board b = BoardFile.read(boardFile, Materials.load().names());
        return SeriesAnalyzer.analyze(s, b, boardFile, seriesDir.toString(), AnalysisOptions.defaults(),
                SeriesAnalyzer.emissivity(s.profile()), 2, Analyzer.Progress.NONE);
    }

    // ---- the spot model

    static Outcome spot(SpotSeries.HeatingMode mode, SpotSeries.MotionKind motion, SpotSeries.Encoding enc, long seed) {
        SpotSeries.Config c = SpotSeries.random(seed, mode, motion, enc).withLeaderMinSideMm(3);
        // a leader under a bare metal lid (emissivity 0.1 +- 0.05) cannot be ranked on rates alone, rightly (its
        // reading's noise is ten times the camera's and its rate uncertain by a factor of two: LowEmissivitySourceTest
        // covers it); the premise of a visible 2-4 times lead holds for painted and moulded surfaces only
        if (mode == SpotSeries.HeatingMode.LEADER) c = c.withLidChance(0);
        SpotSeries.Output out = SpotSeries.generate(c, dir.resolve("spot-" + mode + "-" + enc + "-" + seed));
        Verdict v = analyze(out.directory(), out.boardFile()).result().verdict();
        return new Outcome("spot", mode.name(), enc.profile, seed, v.status(), v.ref(), out.leaders(), v.reason());
    }

    // ---- our simulator

    /**
     * A random 60 x 40 mm board with two sources of one kind and equal heat capacity, shares for the rate ratio
     * {@code ratio} (1: alike), or none when {@code ratio} is 0; null when the board has no two parts of one kind.
     */
    static Scenario simScenario(long seed, double ratio, FrameEncoding enc, Scenario.Motion motion) {
        SplittableRandom r = new SplittableRandom(seed * 31 + 7);
        Scenario sc = Scenarios.random(seed, 8, 0.5).withSize(320, 240).withFrames(40, 0.5, 3.0).withMotion(motion)
                .withEncoding(enc).withNetd(0.03 + 0.03 * r.nextDouble());
        if (enc == FrameEncoding.U8_SPAN_PNG) { // each frame's own span, as a camera's automatic range sets it
            Scenario.CameraSpec c = sc.camera();
            sc = sc.withCamera(new Scenario.CameraSpec(c.width(), c.height(), c.focalPx(), c.distanceMm(), c.tiltDeg(),
                    c.tiltAxisDeg(), c.rotationDeg(), c.offsetPx(), c.motion(), c.blurSigmaPx(), c.netdK(),
                    c.fixedPatternK(), c.bandUm(), c.encoding(), null, true, c.supersample(),
                    c.backgroundEmissivity(), c.reflectedC(), c.exifStart()));
        }
        if (ratio == 0) return sc.withPower(0);
        List<Scenario.PartSpec> parts = new ArrayList<>(sc.board().parts());
        for (int a = 0; a < parts.size(); a++)
            for (int b = a + 1; b < parts.size(); b++)
                if (parts.get(a).kind().equals(parts.get(b).kind())
                        && Math.min(parts.get(a).wMm(), parts.get(a).hMm()) >= 3
                        && Math.min(parts.get(b).wMm(), parts.get(b).hMm()) >= 3) {
                    Scenario.PartSpec pa = parts.get(a), pb = parts.get(b);
                    double cap = pa.heatCapacityOrDefault(), g = pa.contactOrDefault();
                    parts.set(a, withThermal(pa, cap, g));
                    parts.set(b, withThermal(pb, cap, g));
                    Scenario.BoardSpec board = sc.board().withParts(parts);
                    return sc.withBoard(board).withSources(List.of(new Scenario.SourceShare(pa.ref(), ratio / (1 + ratio)),
                            new Scenario.SourceShare(pb.ref(), 1 / (1 + ratio))));
                }
        return null;
    }

    static Scenario.PartSpec withThermal(Scenario.PartSpec p, double cap, double contact) {
        return new Scenario.PartSpec(p.ref(), p.kind(), p.material(), p.xMm(), p.yMm(), p.wMm(), p.hMm(), p.rotationDeg(),
                p.heightMm(), cap, contact, p.emissivity(), p.leads(), p.leadEmissivity(), p.idlePowerW());
    }

    /** What the camera can see: the leader and runner-up by rate, their ratio, and the leader's rise. */
    record VisiblePremise(String leader, String runnerUp, double ratio, double riseK) {
    }

    /**
     * The premise judged on what the camera can see, as {@link ConfidenceCalibrationTest} does: the same scene
     * simulated without noise, fixed pattern or motion and analysed with the simulation's own mappings; its rates and
     * rises are what the footprint statistic shows of the simulated part temperatures (a package's blurred footprint
     * shows a fraction of its die temperature).
     */
    static VisiblePremise visible(Scenario sc, Path where) {
        SimulationOutput twin = Simulator.run(sc.withNetd(0).withFixedPattern(0).withMotion(Scenario.Motion.stand(0)), where);
        Analysis a = ConfidenceCalibrationTest.analyze(twin, "twin");
        List<PartResult> ps = a.result().parts();
        PartResult p1 = ps.get(0), p2 = ps.get(1);
        return new VisiblePremise(p1.ref(), p2.ref(), p1.rateKPerS() / Math.max(p2.rateKPerS(), 1e-9), p1.riseK());
    }

    /**
     * A simulated series meeting the premise for its mode, or null when this seed does not (no two parts of one
     * kind with a side of 3 mm, or the visible ratio outside 2-4).
     */
    static Outcome sim(String mode, FrameEncoding enc, Scenario.Motion motion, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        double ratio = mode.equals("LEADER") ? 2.2 + 1.6 * r.nextDouble() : mode.equals("TWO_ALIKE") ? 1 + 0.05 * r.nextDouble() : 0;
        Scenario sc = simScenario(seed, ratio, enc, motion);
        if (sc == null) return null;
        Path base = dir.resolve("sim-" + mode + "-" + enc.id() + "-" + seed);
        List<String> truth = List.of();
        if (ratio > 0) {
            VisiblePremise p = visible(sc, base.resolve("twin"));
            if (mode.equals("LEADER") && !(p.ratio() >= 2 && p.ratio() <= 4)) return null;
            if (!(p.riseK() > 0)) return null;
            // the heat model and the camera are linear in the power (radiation linearised; the apparent temperature
            // nearly so over a few kelvin): scale it for a visible leader rise of 1.5-3.5 K
            sc = sc.withPower(sc.fault().powerW() * (1.5 + 2 * r.nextDouble()) / p.riseK());
            truth = mode.equals("LEADER") ? List.of(p.leader())
                    : sc.fault().sourcesOrEmpty().stream().map(Scenario.SourceShare::ref).toList();
        }
        SimulationOutput out = Simulator.run(sc, base.resolve("series"));
        Verdict v = analyze(out.directory(), out.boardFile()).result().verdict();
        return new Outcome("sim", mode, enc.id(), seed, v.status(), v.ref(), truth, v.reason());
    }

    // ---- the checks

    static List<Outcome> collect(String generator, String mode, int count, long seedBase) {
        List<Outcome> outs = new ArrayList<>();
        for (long seed = seedBase; outs.size() < count && seed < seedBase + 20L * count + 20; seed++) {
            boolean eightBit = outs.size() % 2 == 1;
            Outcome o;
            if (generator.equals("spot")) {
                SpotSeries.MotionKind motion = mode.equals("LEADER") || seed % 2 == 0
                        ? SpotSeries.MotionKind.HANDHELD : SpotSeries.MotionKind.STAND;
                o = spot(SpotSeries.HeatingMode.valueOf(mode), motion,
                        eightBit ? SpotSeries.Encoding.U8_SPAN : SpotSeries.Encoding.U16_CENTIKELVIN, seed);
            } else {
                Scenario.Motion motion = mode.equals("LEADER") || seed % 2 == 0
                        ? Scenario.Motion.handheld(5, 0.10, 0.15) : Scenario.Motion.stand(0.15);
                o = sim(mode, eightBit ? FrameEncoding.U8_SPAN_PNG : FrameEncoding.U16_CENTIKELVIN_PNG, motion, seed);
            }
            if (o != null) {
                outs.add(o);
                if (o.identified()) IDENTIFIED.add(o);
            }
        }
        assertEquals(count, outs.size(), "premise: enough " + generator + " " + mode + " series");
        return outs;
    }

    /** Every identified verdict of every set, for the error-rate test over the whole class. */
    static final List<Outcome> IDENTIFIED = java.util.Collections.synchronizedList(new java.util.ArrayList<>());

    /**
     * With the full set: the identified verdicts of all sets and both generators together must reject a 2 % error
     * rate at 95 % confidence, the one-sided exact binomial test (Clopper and Pearson 1934): P(X <= wrong) under
     * Binomial(n, 0.02) below 0.05, from commons-math3's {@code BinomialDistribution}. With no wrong verdict that
     * needs n >= 149 (0.98^149 = 0.049); the full set gives about 200 identified verdicts. The reduced set cannot
     * have that power: it prints the p-value only.
     */
    @AfterAll
    static void twoPercentErrorRateIsRejected() {
        int n = IDENTIFIED.size();
        if (n == 0) return; // a single test method run alone
        long wrong = IDENTIFIED.stream().filter(o -> !o.right()).count();
        double p = new org.apache.commons.math3.distribution.BinomialDistribution(n, 0.02)
                .cumulativeProbability((int) wrong);
        System.out.printf(Locale.ROOT, "confidence: %d identified verdicts, %d wrong; P(X <= %d | n, 2 %%) = %.3f%n",
                n, wrong, wrong, p);
        if (FULL) assertTrue(p < 0.05, String.format(Locale.ROOT, "%d of %d identified verdicts wrong: a 2 %% error "
                + "rate is not rejected (p = %.3f)", wrong, n, p));
    }

    private static String log(List<Outcome> outs) {
        StringBuilder sb = new StringBuilder();
        for (Outcome o : outs) sb.append("\n  ").append(o);
        return sb.toString();
    }

    private static void leaders(String generator, long seedBase) {
        List<Outcome> outs = collect(generator, "LEADER", 2 * LEADER, seedBase);
        long right = outs.stream().filter(Outcome::right).count();
        long wrong = outs.stream().filter(o -> o.identified() && !o.right()).count();
        System.out.printf(Locale.ROOT, "confidence %s LEADER hand-held: %d of %d identified right, %d wrong%s%n",
                generator, right, outs.size(), wrong, log(outs));
        // issue 10: at least 90 % identified with the right part (reduced set: one miss in twelve allowed)
        assertTrue(right >= (FULL ? Math.ceil(0.9 * outs.size()) : outs.size() - 1),
                right + " of " + outs.size() + " identified right" + log(outs));
        // issue 10: identified with the wrong part in at most 1 % of all series
        assertTrue(wrong <= Math.floor(0.01 * outs.size()), wrong + " identified wrong" + log(outs));
    }

    private static void alikeAndNone(String generator, long seedBase) {
        List<Outcome> alike = collect(generator, "TWO_ALIKE", ALIKE, seedBase);
        List<Outcome> none = collect(generator, "NONE", NONE, seedBase + 5000);
        System.out.printf(Locale.ROOT, "confidence %s: TWO_ALIKE %s; NONE %s%n", generator, log(alike), log(none));
        // issue 10: with two parts alike, never identified with a third part
        for (Outcome o : alike) assertTrue(!o.identified() || o.right(), "identified a third part: " + o);
        // issue 10: never identified without heating
        for (Outcome o : none) assertTrue(!o.identified(), "identified without heating: " + o);
    }

    @Test
    void handHeldLeadersFromTheSimulatorAreIdentified() {
        leaders("sim", 91000);
    }

    @Test
    void handHeldLeadersFromTheSpotModelAreIdentified() {
        leaders("spot", 92000);
    }

    @Test
    void alikeAndUnheatedSimulatorSeriesAreNeverIdentifiedWrongly() {
        alikeAndNone("sim", 93000);
    }

    @Test
    void alikeAndUnheatedSpotSeriesAreNeverIdentifiedWrongly() {
        alikeAndNone("spot", 94000);
    }
}
