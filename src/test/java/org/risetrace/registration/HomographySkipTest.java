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
 * Homography refinements that have not been kept lately are made only now and then. The saving must not cost
 * accuracy where the perspective between frame and reference stays the same, and must not happen where it changes
 * from frame to frame. Both are checked against the same registrar without the saving and against each
 * generator's own truth (invented data, no outside reference): the simulator moves its tilted camera within the
 * image plane (the perspective is the reference's own), the second generator ({@link SpotSeries}, built apart
 * from the simulator) tilts a hand-held camera afresh in every frame. The margins (0.02 px of mean corner error)
 * are our choice.
 */
class HomographySkipTest {

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
    void aCameraMovedWithinItsImagePlaneSkipsRefinementsAndLosesNoAccuracy(@TempDir Path dir) {
        // the simulator's hand-held camera: tilted once, then shifted, turned and zoomed at random in every frame
        Scenario sc = Scenarios.small(1.6).withSeed(42_011).withMotion(Scenario.Motion.handheld(5, 0.10, 0.15))
                .withFrames(40, 1.0, 2.0);
        SimulationOutput out = Simulator.run(sc, dir.resolve("sim"));
        Map<String, double[][]> truth = new HashMap<>();
        for (Truth.TruthFrame t : out.truth().frames()) truth.put(t.file(), t.boardCornersPx());
        Compared c = compare(out.directory(), out.boardFile(), truth);
        assertTrue(c.counts[2] > 10, "refinements skipped: " + c.counts[2]);
        assertTrue(c.okErrorSkipping <= c.okErrorAlways + 0.02, "ok frames' mean corner error " + c.okErrorSkipping
                + " px with skipping, " + c.okErrorAlways + " px without");
    }

    @Test
    void aCameraTiltedAfreshInEveryFrameKeepsEveryRefinement(@TempDir Path dir) {
        SpotSeries.Output out = SpotSeries.generate(SpotSeries.random(61, SpotSeries.HeatingMode.LEADER,
                SpotSeries.MotionKind.HANDHELD, SpotSeries.Encoding.U16_CENTIKELVIN), dir.resolve("spot"));
        Map<String, double[][]> truth = new HashMap<>();
        for (int k = 0; k < out.fileNames().size(); k++) truth.put(out.fileNames().get(k), out.boardCornersPx()[k]);
        Compared c = compare(out.directory(), out.boardFile(), truth);
        assertTrue(c.counts[0] >= 30, "premise: the perspective changes, homographies are kept: " + c.counts[0]);
        assertEquals(0, c.counts[2], "refinements skipped");
        assertEquals(c.okErrorAlways, c.okErrorSkipping, 1e-9);
    }

    private record Compared(long[] counts, double okErrorSkipping, double okErrorAlways) {
    }

    /** Registers the series with and without skipping; every frame must get the same status either way. */
    private static Compared compare(Path seriesDir, Path boardFile, Map<String, double[][]> truth) {
        Series series = Series.open(seriesDir);
        Board board = BoardFile.read(boardFile, null);
        Frame reference = series.read(series.files().indexOf(seriesDir.resolve(board.outline().frame())));
        DirectRegistrar skipping = (DirectRegistrar) Registrars.create(reference, board, RegistrationConfig.defaults());
        DirectRegistrar always = (DirectRegistrar) Registrars.create(reference, board, RegistrationConfig.defaults());
        always.skipIdleHomographies = false;
        int ok = 0;
        double errSkipping = 0, errAlways = 0;
        for (int i = 0; i < series.size(); i++) {
            Frame f = series.read(i);
            FrameRegistration a = skipping.register(f), b = always.register(f);
            assertEquals(b.status(), a.status(), f.fileName() + ": " + a.reason() + " / " + b.reason());
            if (a.status() == RegistrationStatus.OK) {
                ok++;
                errSkipping += SyntheticScene.cornerError(a.boardCornersPx(), truth.get(f.fileName()));
                errAlways += SyntheticScene.cornerError(b.boardCornersPx(), truth.get(f.fileName()));
            }
        }
        assertTrue(ok >= 10, "premise: ok frames: " + ok);
        assertEquals(0, always.homographyCounts()[2], "the registrar without skipping skipped");
        return new Compared(skipping.homographyCounts(), errSkipping / ok, errAlways / ok);
    }
}
