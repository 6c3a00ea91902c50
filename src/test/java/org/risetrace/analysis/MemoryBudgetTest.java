package org.risetrace.analysis;

import org.junit.jupiter.api.Test;
import org.risetrace.board.Board;
import org.risetrace.board.Part;
import org.risetrace.frame.InputRejected;

import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The memory estimate decides threads and refusals before any large array exists. */
class MemoryBudgetTest {
    static final Path FRAME = Path.of("f.png");
    static final long HEAP = Runtime.getRuntime().maxMemory();

    /**
     * The largest frame (in pixels) whose estimate {@link MemoryBudget#need} for {@code threads} workers fits this
     * heap, found by bisection on the production estimate itself (called, not re-derived here).
     */
    static long pixelsFitting(int threads) {
        long lo = 0, hi = HEAP;
        while (hi - lo > 1) {
            long mid = (lo + hi) >>> 1;
            if (MemoryBudget.need(mid, 0, threads) <= HEAP) lo = mid;
            else hi = mid;
        }
        return lo;
    }

    @Test
    void estimateIsNeverBelowTheHeapsMeasuredToBeNeeded() {
        // measured (MemoryBudget's notes): a 1280 x 1024 simulated series of 8 frames failed with -Xmx128m and ran
        // with -Xmx160m on one thread; on two it failed with -Xmx160m and ran with -Xmx192m. A safe estimate asks at
        // least for the heap that was seen to suffice, and grows with the frame and with every worker.
        long px = 1280L * 1024;
        assertTrue(MemoryBudget.need(px, 0, 1) >= 160L << 20, "one worker: " + (MemoryBudget.need(px, 0, 1) >> 20) + " MB");
        assertTrue(MemoryBudget.need(px, 0, 2) >= 192L << 20, "two workers: " + (MemoryBudget.need(px, 0, 2) >> 20) + " MB");
        assertTrue(MemoryBudget.need(2 * px, 0, 1) > MemoryBudget.need(px, 0, 1));
        assertTrue(MemoryBudget.need(px, 0, 3) > MemoryBudget.need(px, 0, 2));
        assertTrue(MemoryBudget.need(px, 1_000_000, 1) > MemoryBudget.need(px, 0, 1), "the board raster counts");
    }

    @Test
    void smallFramesKeepEveryThread() {
        assertEquals(4, MemoryBudget.threadsThatFit(FRAME, 640, 480, 0, 4));
    }

    @Test
    void framesThatFitOneWorkerOnlyRunOnOne() {
        long px = (pixelsFitting(1) + pixelsFitting(2)) / 2; // fits one worker, not two
        assertTrue(px > pixelsFitting(2), "premise: two workers need more per pixel than one");
        int side = (int) Math.sqrt(px);
        assertEquals(1, MemoryBudget.threadsThatFit(FRAME, side, (int) (px / side), 0, 2));
    }

    @Test
    void framesBeyondOneWorkerAreRefusedNamingTheirSizeAndTheHeap() {
        long px = pixelsFitting(1) + 1_000_000;
        int side = (int) Math.sqrt(px) + 1;
        InputRejected e = assertThrows(InputRejected.class, () -> MemoryBudget.threadsThatFit(FRAME, side, side, 0, 2));
        assertTrue(e.getMessage().contains(side + " x " + side) && e.getMessage().contains("-Xmx"), e.getMessage());
    }

    @Test
    void aBoardRasterOverTheLimitIsRefusedAndACoarseOneThatMissesPartsToo() {
        Board b = new Board("b", new double[]{70, 50}, null, List.of(new Part("R1", null, null, 10, 10, 1.0, 0.5, null)), null);
        assertEquals(140L * 100, MemoryBudget.boardRasterPixels(b, 2, FRAME));
        assertThrows(InputRejected.class, () -> MemoryBudget.boardRasterPixels(b, 150, FRAME));
        MemoryBudget.requireResolvesParts(b, 2, FRAME); // 0.5 mm x 2 px/mm = one pixel across
        InputRejected e = assertThrows(InputRejected.class, () -> MemoryBudget.requireResolvesParts(b, 1.9, FRAME));
        assertTrue(e.getMessage().contains("R1") && e.getMessage().contains("at least 2"), e.getMessage());
    }
}
