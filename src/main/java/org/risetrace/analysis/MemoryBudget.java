package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.frame.InputRejected;

import java.nio.file.Path;
import java.util.Locale;

/**
 * Memory an analysis needs, estimated before any large array is made, so frames or a board resolution too large for
 * this Java process are refused with a message (or run on fewer threads) instead of ending in OutOfMemoryError.
 *
 * <p>The per-pixel figures are measured, not derived: a 1280 x 1024 simulated series (8 frames) ran with -Xmx160m on
 * one thread and failed with -Xmx128m, and needed -Xmx192m on two (failed at 160m): about 120 bytes per frame
 * pixel for the first thread (frame, pyramids, reference model, board raster at the frame's own scale, rise-map
 * accumulators) and about 30 for each further thread. The figures below add a third for safety.
 */
public final class MemoryBudget {
    /** Bytes per frame pixel for the first worker, and for each further worker. */
    static final long FIRST_THREAD_BYTES_PER_PX = 160, EXTRA_THREAD_BYTES_PER_PX = 40;
    /** Bytes per board-raster pixel: rise-map accumulators, rectified raster per worker, smoothed maps, report. */
    static final long BYTES_PER_BOARD_PX = 64;
    /** The largest board raster: as large as the largest frame the import takes by default (50 M pixels). */
    public static final long MAX_BOARD_RASTER_PIXELS = 50_000_000L;
    /** Heap the rest of the program keeps (classes, buffers of the plots and the report). */
    static final long FIXED_BYTES = 64L << 20;

    private MemoryBudget() { }

    /** Board-raster pixels at pxPerMm, refused above {@link #MAX_BOARD_RASTER_PIXELS} (before any allocation). */
    public static long boardRasterPixels(Board board, double pxPerMm, Path boardFile) {
        double w = Math.ceil(board.widthMm() * pxPerMm), h = Math.ceil(board.heightMm() * pxPerMm);
        double px = w * h;
        if (!(px <= MAX_BOARD_RASTER_PIXELS))
            throw new InputRejected(boardFile, String.format(Locale.ROOT, "a %.0f x %.0f mm board at %.4g px/mm would"
                            + " be a %.0f x %.0f pixel raster, over the limit of %d M pixels", board.widthMm(),
                    board.heightMm(), pxPerMm, w, h, MAX_BOARD_RASTER_PIXELS / 1_000_000),
                    "give a smaller --px-per-mm");
        return (long) px;
    }

    /**
     * Refuses a board resolution given by the user (--px-per-mm) that puts less than one board pixel across the
     * smallest marked part: its footprint would be a single pixel of averaged board, and its rise no evidence.
     */
    public static void requireResolvesParts(Board board, double pxPerMm, Path boardFile) {
        double smallest = Double.POSITIVE_INFINITY;
        String ref = null;
        for (org.risetrace.board.Part p : board.partsOrEmpty())
            if (Math.min(p.wMm(), p.hMm()) < smallest) {
                smallest = Math.min(p.wMm(), p.hMm());
                ref = p.ref();
            }
        if (ref != null && smallest * pxPerMm < 1)
            throw new InputRejected(boardFile, String.format(Locale.ROOT, "at %.4g px/mm the board raster has less than"
                            + " one pixel across %s (%.3g mm)", pxPerMm, ref, smallest),
                    String.format(Locale.ROOT, "give --px-per-mm of at least %.3g, or leave it out", 1 / smallest));
    }

    /**
     * The number of worker threads (at most {@code threads}) whose estimated memory fits this process' heap.
     *
     * @throws InputRejected when not even one fits, naming the frame size and the memory it needs
     */
    public static int threadsThatFit(Path frame, int width, int height, long boardPixels, int threads) {
        long available = Runtime.getRuntime().maxMemory();
        long px = (long) width * height;
        for (int t = Math.max(1, threads); t >= 1; t--)
            if (need(px, boardPixels, t) <= available) return t;
        throw new InputRejected(frame, String.format(Locale.ROOT, "frames of %d x %d pixels need about %d MB of memory"
                        + " to analyse, and this Java process may use %d MB", width, height,
                need(px, boardPixels, 1) >> 20, available >> 20),
                "run java with a larger heap (java -Xmx8g -jar risetrace.jar ...), or bin or crop the frames");
    }

    static long need(long framePx, long boardPx, int threads) {
        return FIXED_BYTES + framePx * (FIRST_THREAD_BYTES_PER_PX + EXTRA_THREAD_BYTES_PER_PX * (threads - 1))
                + boardPx * BYTES_PER_BOARD_PX;
    }
}
