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

    /** The frame pixels at which exactly {@code threads} workers still fit this heap (no board raster). */
    static long pixelsFitting(int threads) {
        return (HEAP - MemoryBudget.FIXED_BYTES) / (MemoryBudget.FIRST_THREAD_BYTES_PER_PX
                + MemoryBudget.EXTRA_THREAD_BYTES_PER_PX * (threads - 1));
    }

    @Test
    void smallFramesKeepEveryThread() {
        assertEquals(4, MemoryBudget.threadsThatFit(FRAME, 640, 480, 0, 4));
    }

    @Test
    void framesThatFitOneWorkerOnlyRunOnOne() {
        long px = (pixelsFitting(1) + pixelsFitting(2)) / 2; // fits one worker, not two
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
