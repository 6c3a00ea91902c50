package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;

import java.awt.image.BufferedImage;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** Frames written by the JDK's ImageIO writers and read by risetrace's readers give the written counts. */
class RoundTripTest {
    @TempDir
    Path dir;

    private static void assertCentikelvin(Frame f, int w, int h) {
        assertEquals(w, f.width());
        assertEquals(h, f.height());
        for (int y = 0; y < h; y++)
            for (int x = 0; x < w; x++) {
                // u16-centikelvin: T = 0.01 K * count; 0 degC = 273.15 K (SI definition of the degree Celsius)
                double expected = TestImages.count(x, y) * 0.01 - 273.15;
                assertEquals(expected, f.at(x, y), 1e-4, "pixel " + x + "," + y);
            }
    }

    @Test
    void sixteenBitPngFromImageIoReadsItsCounts() throws Exception {
        BufferedImage img = TestImages.ushortGrey(160, 128);
        Path file = TestImages.write(img, "png", dir.resolve("a.png"));
        Frame f = FrameReaders.read(file, ReadContext.of(Profiles.load("u16-centikelvin")));
        assertCentikelvin(f, 160, 128);
        assertEquals("png", f.decoding().container());
        assertEquals(16, f.decoding().bitDepth());
    }

    @Test
    void sixteenBitTiffFromImageIoReadsItsCountsInEveryCompression() throws Exception {
        BufferedImage img = TestImages.ushortGrey(160, 128);
        for (String c : new String[]{null, "LZW", "Deflate", "PackBits"}) {
            Path file = TestImages.writeTiff(img, c, dir.resolve("a-" + c + ".tif"));
            Frame f = FrameReaders.read(file, ReadContext.defaults());
            assertCentikelvin(f, 160, 128);
            assertEquals("tiff", f.decoding().container());
            assertEquals("u16-centikelvin", f.decoding().profile());
        }
    }
}
