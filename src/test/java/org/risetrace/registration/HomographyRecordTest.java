package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.risetrace.sim.Truth;
import org.risetrace.synth.SpotSeries;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Homography refinements that have not been kept lately are made only now and then; where they have been kept,
 * starts go straight to the homography. Neither saving may cost accuracy, and the first must not happen where the
 * perspective changes from frame to frame. Checked against the same registrar without the savings and against each
 * generator's own truth (invented data, no outside reference): the simulator moves its tilted camera within the
 * image plane (the perspective is the reference's own), the second generator ({@link SpotSeries}, built apart
 * from the simulator) tilts a hand-held camera afresh in every frame. The margins (0.02 px of mean corner error,
 * 0.5 px for the largest, at least 10 refinements skipped and 25 starts straight) are our choice; the counts in the
 * first two tests are the record's own rules (IDLE_AFTER, PROBE_EVERY, KEPT_BEFORE_STRAIGHT), no outside source.
 */
class HomographyRecordTest {

    @Test
    void afterThreeRefinementsNotKeptOnlyEveryEighthIsMade() {
        DirectRegistrar.HomographyRecord r = new DirectRegistrar.HomographyRecord();
        for (int i = 0; i < DirectRegistrar.IDLE_AFTER; i++) {
            assertTrue(r.refine(), "refinement " + i + " before any was found idle");
            r.outcome(false);
        }
        for (int i = 1; i < DirectRegistrar.PROBE_EVERY; i++) assertFalse(r.refine(), "skipped " + i);
        assertTrue(r.refine(), "the probe");
        r.outcome(false);
        for (int i = 1; i < DirectRegistrar.PROBE_EVERY; i++) assertFalse(r.refine(), "still idle: skipped " + i);
        assertTrue(r.refine(), "the next probe");
        r.outcome(true); // the probe's homography was kept: every refinement is made again
        for (int i = 0; i < DirectRegistrar.IDLE_AFTER; i++) {
            assertTrue(r.refine(), "after a kept one, refinement " + i);
            r.outcome(false);
        }
        assertFalse(r.refine());
        assertEquals(2 * (DirectRegistrar.PROBE_EVERY - 1) + 1, r.skips);
        assertEquals(2, r.probes);
    }

    @Test
    void afterThreeRefinementsKeptStartsGoStraightToTheHomography() {
        DirectRegistrar.HomographyRecord r = new DirectRegistrar.HomographyRecord();
        for (int i = 0; i < DirectRegistrar.KEPT_BEFORE_STRAIGHT; i++) {
            assertFalse(r.straightToHomography(), "after " + i + " kept");
            r.outcome(true);
        }
        assertTrue(r.straightToHomography());
        r.outcome(false);
        assertFalse(r.straightToHomography(), "one not kept ends the run");
        assertTrue(r.refine(), "and one not kept is not yet idle");
    }

    @Test
    void aCameraMovedWithinItsImagePlaneSkipsRefinementsAndLosesNoAccuracy(@TempDir Path dir) {
        // the simulator's hand-held camera: tilted once, then shifted, turned and zoomed at random in every frame
        Scenario sc = Scenarios.small(1.6).withSeed(42_011).withMotion(Scenario.Motion.handheld(5, 0.10, 0.15))
                .withFrames(40, 1.0, 2.0);
        SimulationOutput out = Simulator.run(sc, dir.resolve("sim"));
        Map<String, double[][]> truth = new HashMap<>();
        for (Truth.TruthFrame t : out.truth().frames()) truth.put(t.file(), t.boardCornersPx());
        Compared c = compare(out.directory(), out.boardFile(), truth);
        assertTrue(c.counts[2] > 10, "refinements skipped: " + c.counts[2]);
        assertTrue(c.okError[0] <= c.okError[1] + 0.02, "ok frames' mean corner error " + c.okError[0]
                + " px with the savings, " + c.okError[1] + " px without");
    }

    @Test
    void aCameraTiltedAfreshInEveryFrameKeepsEveryRefinementAndGoesStraightToIt(@TempDir Path dir) {
        SpotSeries.Output out = SpotSeries.generate(SpotSeries.random(61, SpotSeries.HeatingMode.LEADER,
                SpotSeries.MotionKind.HANDHELD, SpotSeries.Encoding.U16_CENTIKELVIN), dir.resolve("spot"));
        Map<String, double[][]> truth = new HashMap<>();
        for (int k = 0; k < out.fileNames().size(); k++) truth.put(out.fileNames().get(k), out.boardCornersPx()[k]);
        Compared c = compare(out.directory(), out.boardFile(), truth);
        assertEquals(0, c.counts[2], "refinements skipped");
        assertTrue(c.counts[4] >= 25, "starts that went straight to the homography: " + c.counts[4]);
        assertTrue(c.okError[0] <= c.okError[1] + 0.02, "ok frames' mean corner error " + c.okError[0]
                + " px with the savings, " + c.okError[1] + " px without");
        assertTrue(c.okError[2] <= Math.max(c.okError[3], 0.5), "the largest ok frame's corner error "
                + c.okError[2] + " px with the savings, " + c.okError[3] + " px without");
    }

    /** @param okError {mean with the savings, mean without, largest with, largest without} over ok frames, px */
    private record Compared(long[] counts, double[] okError) {
    }

    /** Registers the series with and without the savings; every frame must get the same status either way. */
    private static Compared compare(Path seriesDir, Path boardFile, Map<String, double[][]> truth) {
        Series series = Series.open(seriesDir);
        Board board = BoardFile.read(boardFile, null);
        Frame reference = series.read(series.files().indexOf(seriesDir.resolve(board.outline().frame())));
        DirectRegistrar saving = (DirectRegistrar) Registrars.create(reference, board, RegistrationConfig.defaults());
        DirectRegistrar plain = (DirectRegistrar) Registrars.create(reference, board, RegistrationConfig.defaults());
        plain.skipIdleHomographies = false;
        plain.straightToHomography = false;
        int ok = 0;
        double[] err = new double[4];
        for (int i = 0; i < series.size(); i++) {
            Frame f = series.read(i);
            FrameRegistration a = saving.register(f), b = plain.register(f);
            assertEquals(b.status(), a.status(), f.fileName() + ": " + a.reason() + " / " + b.reason());
            if (a.status() == RegistrationStatus.OK) {
                ok++;
                double ea = SyntheticScene.cornerError(a.boardCornersPx(), truth.get(f.fileName()));
                double eb = SyntheticScene.cornerError(b.boardCornersPx(), truth.get(f.fileName()));
                err[0] += ea;
                err[1] += eb;
                err[2] = Math.max(err[2], ea);
                err[3] = Math.max(err[3], eb);
            }
        }
        assertTrue(ok >= 10, "premise: ok frames: " + ok);
        long[] plainCounts = plain.homographyCounts();
        assertEquals(0, plainCounts[2] + plainCounts[4] + plainCounts[5], "the registrar without savings saved");
        err[0] /= ok;
        err[1] /= ok;
        System.out.printf(java.util.Locale.ROOT, "%s: counts %s, ok frames' corner error mean %.3f / %.3f px, "
                + "largest %.3f / %.3f px (with / without the savings)%n", seriesDir.getFileName(),
                java.util.Arrays.toString(saving.homographyCounts()), err[0], err[1], err[2], err[3]);
        return new Compared(saving.homographyCounts(), err);
    }
}
