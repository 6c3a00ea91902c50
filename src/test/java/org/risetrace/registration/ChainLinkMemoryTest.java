package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.lang.ref.WeakReference;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A registrar holds a bounded number of frames however many chain links it makes (issue 11, item 7: memory flat in
 * the number of frames). A heated hand-held series makes link after link; each replaced link and the frame it last
 * graded ok must become garbage. The frames are held here only weakly, so after a full collection the ones still
 * reachable are the ones the registrar keeps: the last ok frame of the thread and of its current link (the weak
 * reference semantics: java.lang.ref.WeakReference, cleared once its referent is only weakly reachable).
 */
class ChainLinkMemoryTest {

    @Test
    void replacedLinksLeaveNoFramesBehind(@TempDir Path dir) throws InterruptedException {
        // heating and hand-held motion: the picture drifts from the reference, frames go through chain links
        // (the calibration series of MappingUncertaintyTest, seed and heating chosen to make several links)
        Scenario sc = Scenarios.small(1.6).withSeed(42_006).withMotion(Scenario.Motion.handheld(5, 0.10, 0.15))
                .withFrames(60, 1.0, 2.0);
        SimulationOutput out = Simulator.run(sc, dir.resolve("sim"));
        Series series = Series.open(out.directory());
        Board board = BoardFile.read(out.boardFile(), null);
        Frame reference = series.read(series.files().indexOf(out.directory().resolve(board.outline().frame())));
        Registrar registrar = Registrars.create(reference, board, RegistrationConfig.defaults());
        List<WeakReference<Frame>> seen = new ArrayList<>();
        Set<String> links = new HashSet<>();
        for (int i = 0; i < series.size(); i++) {
            Frame f = series.read(i);
            seen.add(new WeakReference<>(f));
            FrameRegistration r = registrar.register(f);
            if (r.reason() != null && r.reason().startsWith("through "))
                links.add(r.reason().substring(0, r.reason().indexOf(" (")));
        }
        assertTrue(links.size() >= 3, "premise: the series makes several chain links, made " + links);
        int reachable = 0;
        for (int attempt = 0; attempt < 10; attempt++) {
            System.gc();
            Thread.sleep(20);
            reachable = (int) seen.stream().filter(w -> w.get() != null).count();
            if (reachable <= 2) break;
        }
        // the thread's last ok frame and its current link's last ok frame; every replaced link's frames are garbage
        assertTrue(reachable <= 2, reachable + " of " + seen.size() + " frames still held after " + links.size()
                + " links");
    }
}
