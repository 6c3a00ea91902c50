package org.risetrace.analysis;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Homography;
import org.risetrace.registration.Rectifier;
import org.risetrace.registration.RegistrationStatus;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.risetrace.sim.Truth;

import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Calibration of the verdict's confidence over freshly simulated small series with random source power (down to
 * zero), source position, camera noise and camera drift. The frames are mapped with the simulation's own
 * board-to-frame homographies, so the test measures the analysis' statistics, not the registration stage (which
 * has its own tests); resampling, noise and drift are all real. The whole pipeline (registration included), on two
 * generators and with enough series to reject a 2 % error rate, is {@link HandHeldConfidenceTest}
 * ({@code mvn test -Pconfidence}).
 */
class ConfidenceCalibrationTest {
    static final int SERIES = 50;

    static BoardMapper truthMapper(Truth truth, Rectifier rect) {
        Map<String, Homography> hs = new HashMap<>();
        for (Truth.TruthFrame f : truth.frames()) hs.put(f.file(), Homography.fromRows(f.boardToFrame()));
        return new BoardMapper() {
            @Override public FrameRegistration register(Frame f) {
                return new FrameRegistration(f.fileName(), f.tSeconds(), RegistrationStatus.OK, null,
                        hs.get(f.fileName()), null, 0, Double.NaN, Double.NaN);
            }
            @Override public BoardRaster rectify(Frame f, Homography h) { return rect.rectify(f, h); }
        };
    }

    /** Counts over the simulated series, run once for both tests. */
    record Counts(int identified, int wrong, int strong, int strongIdentified, String log) {
    }

    private static Counts counts;

    @TempDir
    static Path dir;

    static synchronized Counts run() {
        if (counts == null) counts = simulate(dir);
        return counts;
    }

    @Test
    void identifiedVerdictsAreRarelyWrong() {
        Counts c = run();
        // issue #5: identified but wrong at most 1 % (with 50 series: none)
        assertTrue(c.wrong() <= 0.01 * SERIES, c.wrong() + " of " + c.identified() + " identified verdicts wrong" + c.log());
        assertTrue(c.identified() >= 5, "premise: some series identified, got " + c.identified() + c.log());
    }

    @Test
    void strongLeadsAreIdentified() {
        Counts c = run();
        // issue #5: identified when the source leads by 5 sigma at least 90 % of the time (lead defined above)
        assertTrue(c.strong() >= 5, "premise: enough strong cases, got " + c.strong() + c.log());
        assertTrue(c.strongIdentified() >= 0.9 * c.strong(), c.strongIdentified() + " of " + c.strong()
                + " strong leads identified" + c.log());
    }

    /** Least-squares slope of the finite points i in [from, to), by the reference library. */
    static double olsSlope(double[] t, double[] y, int from, int to) {
        org.apache.commons.math3.stat.regression.SimpleRegression r = new org.apache.commons.math3.stat.regression.SimpleRegression();
        for (int i = from; i < to; i++) if (Double.isFinite(y[i])) r.addData(t[i], y[i]);
        return r.getSlope();
    }

    static Counts simulate(Path dir) {
        SplittableRandom rnd = new SplittableRandom(20261201);
        int identified = 0, wrong = 0, strong = 0, strongIdentified = 0;
        StringBuilder log = new StringBuilder();
        for (int k = 0; k < SERIES; k++) {
            double power = rnd.nextDouble() < 0.2 ? 0 : 0.4 * Math.pow(rnd.nextDouble(), 3);
            double netd = 0.03 + 0.05 * rnd.nextDouble(), drift = 0.08 * rnd.nextDouble();
            Scenario sc = Scenarios.random(7000 + k, 6, power).withNetd(netd)
                    .withMotion(Scenario.Motion.stand(drift)).withFrames(24, 0.5, 2.0);
            SimulationOutput out = Simulator.run(sc, dir.resolve("c" + k));
            Analysis a = analyze(out, "c" + k);
            // the camera's view of the same scene without noise, fixed pattern or drift: same heat model, same
            // optics and footprints, so its rise curves are what the footprint statistic can see of the true
            // temperatures (a small package's blurred peak falls short of the simulated part temperature)
            SimulationOutput clean = Simulator.run(sc.withNetd(0).withFixedPattern(0)
                    .withMotion(Scenario.Motion.stand(0)), dir.resolve("clean" + k));
            Analysis visible = analyze(clean, "clean" + k);
            AnalysisOptions o = AnalysisOptions.defaults();

            // true rates: OLS slope (commons-math3 SimpleRegression, not the code's own LineFit) of the simulation's
            // true part temperatures over the window the analysis used; sigma: the analysis' own standard errors
            Truth t = out.truth();
            double[] tt = new double[t.frames().size()];
            for (int i = 0; i < tt.length; i++) tt[i] = t.frames().get(i).tS();
            double win = ((Number) a.result().parameters().get("rate_window_used_s")).doubleValue();
            int from = 0;
            while (tt[from] <= t.injectionStartS()) from++;
            int to = from;
            while (to < tt.length && (tt[to] <= t.injectionStartS() + win || to - from < o.minRateFrames())) to++;
            // the source's lead in sigmas: the smallest (r_source - r_i) / sqrt(se_source^2 + se_i^2) over every other
            // part i, since a part whose rate is poorly known cannot be ruled out by a small difference
            // Two "true" rates per part: the simulated part temperature (truth.json), and what the camera can see of
            // it, the same OLS slope over the same frames of the noise-free twin's rise curve
            Map<String, Double> dieRate = new HashMap<>(), seenRate = new HashMap<>(), se = new HashMap<>();
            for (PartResult p : a.result().parts()) {
                dieRate.put(p.ref(), olsSlope(tt, t.part(p.ref()), from, to));
                se.put(p.ref(), p.rateSe());
            }
            for (RiseCurve c : visible.curves())
                if (c.tS().length == tt.length) seenRate.put(c.ref(), olsSlope(c.tS(), c.riseK(), from, to));
            String source = t.primarySource();
            double dieSeparation = separation(dieRate, se, source);
            double trueSeparation = seenRate.size() == dieRate.size() ? separation(seenRate, se, source) : Double.NEGATIVE_INFINITY;
            Verdict v = a.result().verdict();
            boolean id = v.status() == VerdictStatus.IDENTIFIED;
            boolean right = id && v.ref().equals(t.primarySource());
            if (id) identified++;
            if (id && !right) wrong++;
            // the premise of a 5-sigma lead is judged on what the camera can see (the noise-free twin): optical
            // blur shows a small package's footprint a fraction of its die temperature, which no reading of the
            // frames can recover
            if (trueSeparation >= 5) {
                strong++;
                if (right) strongIdentified++;
            }
            log.append(String.format(java.util.Locale.ROOT, "%n#%d %.3f W source %s separation seen %.1f (die %.1f): %s %s",
                    k, power, t.primarySource(), trueSeparation, dieSeparation, v.status().word(), v.ref()) + " " + v.reason());
        }
        System.out.println(log);
        System.out.println("calibration: " + identified + " identified, " + wrong + " wrong, " + strongIdentified
                + " of " + strong + " strong leads identified");
        return new Counts(identified, wrong, strong, strongIdentified, log.toString());
    }

    /**
     * The source's lead in sigmas: the smallest (r_source - r_i) / sqrt(se_source^2 + se_i^2) over every other part
     * i, since a part whose rate is poorly known cannot be ruled out by a small difference; -infinity when the
     * source is not a marked part.
     */
    static double separation(Map<String, Double> rate, Map<String, Double> se, String source) {
        if (!rate.containsKey(source)) return Double.NEGATIVE_INFINITY;
        double sep = Double.POSITIVE_INFINITY;
        for (String ref : rate.keySet())
            if (!ref.equals(source))
                sep = Math.min(sep, (rate.get(source) - rate.get(ref)) / Math.hypot(se.get(source), se.get(ref)));
        return sep;
    }

    /** The analysis of one simulated series, its frames mapped with the simulation's own homographies. */
    static Analysis analyze(SimulationOutput out, String label) {
        Series s = Series.open(out.directory());
        Board b = BoardFile.read(out.boardFile(), null);
        AnalysisOptions o = AnalysisOptions.defaults();
        double[] times = new double[s.size()];
        for (int i = 0; i < times.length; i++) times[i] = s.tSeconds(i);
        BaselinePlan plan = BaselinePlan.plan(times, s.sidecar().injection().startS(), null, o.lastFrames());
        Rectifier rect = new Rectifier(b, Rectifier.defaultPxPerMm(b));
        SeriesAnalysis sa = new SeriesAnalysis(b, o, plan, SeriesAnalyzer.emissivity(s.profile()),
                new SeriesAnalysis.Context(label, "board.json", s.profile().name(), s.sidecar().injection(),
                        s.sidecar().reflectedC(), "test", "band"));
        FrameSource src = new FrameSource() {
            @Override public int size() { return s.size(); }
            @Override public String fileName(int i) { return s.fileName(i); }
            @Override public double tSeconds(int i) { return s.tSeconds(i); }
            @Override public Frame read(int i) { return s.read(i); }
        };
        return Analyzer.run(src, b, () -> truthMapper(out.truth(), rect),
                () -> AmbientSampler.forBoard(b, o.ambientGapMm(), o.ambientBandMm()), sa, 2, Analyzer.Progress.NONE);
    }
}
