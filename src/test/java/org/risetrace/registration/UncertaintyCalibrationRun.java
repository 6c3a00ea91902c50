package org.risetrace.registration;

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

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * One row per registered frame of simulated series with truth: the true RMS corner error, the grade and the raw
 * uncertainty parts. Used to calibrate {@link MappingUncertainty} (a regression of the squared true error on the
 * parts) and by {@code MappingUncertaintyTest} to check the calibration.
 */
final class UncertaintyCalibrationRun {
    private UncertaintyCalibrationRun() {
    }

    /** One frame's outcome. */
    record Row(String generator, String motion, long seed, String file, RegistrationStatus status, double trueRmsPx,
               double sigmaPx, double alignVar, double patchBias2, double patchNoise, int mappings, double rmsPx,
               int inliers, double similarity, String reason, double refBias2, int refInliers, String refStatus) {
        String tsv() {
            return String.format(Locale.ROOT, "%s\t%s\t%d\t%s\t%s\t%.5f\t%.5f\t%.6g\t%.6g\t%.6g\t%d\t%.4f\t%d\t%.4f\t%.6g\t%d\t%s\t%s",
                    generator, motion, seed, file, status.word(), trueRmsPx, sigmaPx, alignVar, patchBias2, patchNoise,
                    mappings, rmsPx, inliers, similarity, refBias2, refInliers, refStatus, reason == null ? "" : reason.replace('\t', ' '));
        }
    }

    /** RMS over the four corners of the distance between two corner sets. */
    static double rmsCornerError(double[][] a, double[][] b) {
        double s = 0;
        for (int i = 0; i < 4; i++) {
            double dx = a[i][0] - b[i][0], dy = a[i][1] - b[i][1];
            s += (dx * dx + dy * dy) / 4;
        }
        return Math.sqrt(s);
    }

    /**
     * Registers every frame but the reference of one series (frames read back through Series), the reference outline
     * marked with its true corners (the marking's own error is not registration's).
     */
    static List<Row> register(String generator, String motion, long seed, Path seriesDir, Path boardFile,
                              List<double[][]> trueCorners) {
        Board clicked = BoardFile.read(boardFile, null);
        Series series = Series.open(seriesDir);
        String refName = clicked.outline().frame();
        int refIndex = -1;
        for (int i = 0; i < series.size(); i++) if (series.fileName(i).equals(refName)) refIndex = i;
        Board board = new Board(clicked.name(), clicked.sizeMm(), new Outline(refName, trueCorners.get(refIndex), null),
                clicked.parts(), clicked.ambient());
        Registrar reg = Registrars.create(series.read(refIndex), board, RegistrationConfig.defaults());
        DirectRegistrar dr = (DirectRegistrar) reg;
        List<Row> rows = new ArrayList<>();
        for (int i = 0; i < series.size(); i++) {
            if (i == refIndex) continue;
            Frame f = series.read(i);
            FrameRegistration g = reg.register(f);
            MappingUncertainty u = dr.lastUncertainty();
            double err = g.boardCornersPx() == null ? Double.NaN : rmsCornerError(g.boardCornersPx(), trueCorners.get(i));
            DirectRegistrar.Grade atRef = g.boardToFrame() == null ? null : dr.gradeAgainstReference(f, g.boardToFrame());
            rows.add(new Row(generator, motion, seed, f.fileName(), g.status(), err, g.cornerSigmaPx(), u.alignVariance(),
                    u.patchBias2(), u.patchNoiseVar(), u.mappings(), g.rmsPx(), g.inliers(), g.similarity(), g.reason(),
                    atRef == null ? Double.NaN : atRef.uncertainty().patchBias2(), atRef == null ? 0 : atRef.inliers(),
                    atRef == null ? "-" : atRef.status().word()));
        }
        return rows;
    }

    /** Our own simulator's series: even seeds the small board, odd ones random boards; frames at 1 s. */
    static List<Row> simulator(Path dir, Scenario.Motion motion, long seedBase, int count, int frames) {
        List<Row> rows = new ArrayList<>();
        for (int s = 0; s < count; s++) {
            long seed = seedBase + s;
            Scenario sc = (s % 2 == 0 ? Scenarios.small(1.0 + 0.1 * (s % 7)).withSeed(seed)
                    : Scenarios.random(seed, 10, 1.0 + 0.1 * (s % 5))).withMotion(motion).withFrames(frames, 1.0, 2.0);
            SimulationOutput out = Simulator.run(sc, dir.resolve("sim-" + motion.kind() + "-" + seed));
            List<double[][]> corners = new ArrayList<>();
            for (Truth.TruthFrame t : out.truth().frames()) corners.add(t.boardCornersPx());
            rows.addAll(register("sim", motion.kind(), seed, out.directory(), out.boardFile(), corners));
        }
        return rows;
    }

    /** The second generator's series (test scope, {@link org.risetrace.synth.SpotSeries}), random configurations. */
    static List<Row> spot(Path dir, org.risetrace.synth.SpotSeries.MotionKind motion,
                          org.risetrace.synth.SpotSeries.Encoding encoding, long seedBase, int count) {
        List<Row> rows = new ArrayList<>();
        for (int s = 0; s < count; s++) {
            long seed = seedBase + s;
            org.risetrace.synth.SpotSeries.Output out = org.risetrace.synth.SpotSeries.generate(
                    org.risetrace.synth.SpotSeries.random(seed, org.risetrace.synth.SpotSeries.HeatingMode.LEADER,
                            motion, encoding), dir.resolve("spot-" + motion + "-" + encoding + "-" + seed));
            rows.addAll(register("spot-" + encoding.profile, motion == org.risetrace.synth.SpotSeries.MotionKind.STAND
                    ? "stand" : "handheld", seed, out.directory(), out.boardFile(), List.of(out.boardCornersPx())));
        }
        return rows;
    }

    static void write(List<Row> rows, Path file) throws IOException {
        try (PrintWriter w = new PrintWriter(Files.newBufferedWriter(file))) {
            w.println("generator\tmotion\tseed\tfile\tstatus\ttrue_rms_px\tsigma_px\talign_var\tpatch_bias2\tpatch_noise\tmappings\trms_px\tinliers\tsimilarity\tref_bias2\tref_inliers\tref_status\treason");
            for (Row r : rows) w.println(r.tsv());
        }
    }

    /** Writes the rows of our simulator's series to args[0] (args[1]: series per motion, args[2]: frames). */
    public static void main(String[] args) throws IOException {
        Path out = Path.of(args[0]);


        int count = args.length > 1 ? Integer.parseInt(args[1]) : 12, frames = args.length > 2 ? Integer.parseInt(args[2]) : 40;
        Path dir = Files.createTempDirectory("calib");
        List<Row> rows = new ArrayList<>();
        if (!Boolean.getBoolean("spotonly")) {
            rows.addAll(simulator(dir, Scenario.Motion.stand(0.15), 41000, count, frames));
            rows.addAll(simulator(dir, Scenario.Motion.handheld(5, 0.10, 0.15), 42000, count, frames));
        }
        for (org.risetrace.synth.SpotSeries.MotionKind m : org.risetrace.synth.SpotSeries.MotionKind.values())
            for (org.risetrace.synth.SpotSeries.Encoding e : org.risetrace.synth.SpotSeries.Encoding.values())
                rows.addAll(spot(dir, m, e, 43000 + 100L * m.ordinal() + 1000L * e.ordinal(), count / 2));
        write(rows, out);
        System.out.println(rows.size() + " frames written to " + out);
    }
}
