package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.risetrace.frame.InputRejected;

import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The pixels of a whole series are bounded (frames x first frame's size, before the frames are decoded). */
class SeriesLimitsTest {
    @Test
    void aLongSeriesOfLargeFramesIsRefusedAndAnOrdinaryOneIsNot() {
        Series.requireTotal(Path.of("s"), 10_000, 640, 480); // 3.1 G pixels: a long but real capture
        InputRejected e = assertThrows(InputRejected.class, () -> Series.requireTotal(Path.of("s"), 100_000, 640, 480));
        assertTrue(e.getMessage().contains("100000 frames of 640 x 480"), e.getMessage());
    }
}
