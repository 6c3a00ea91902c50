package org.risetrace.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.io.write.FrameEncoding;
import org.risetrace.io.write.FrameWriters;
import org.risetrace.report.ColourMaps;
import org.risetrace.report.FrameView;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code risetrace frame-view} through {@link Main#run}: the PNG it writes is read back with the JDK's own ImageIO
 * decoder (the reference) and checked against the geometry the README documents: size, the colour of a known hot
 * and a known cold pixel at the two ends of the ember map, and grid lines exactly through the documented columns
 * and rows.
 */
class FrameViewTest {
    static final int W = 40, H = 30, HOT_X = 17, HOT_Y = 11;

    static Path frame(Path dir) {
        float[] c = new float[W * H];
        Arrays.fill(c, 20f);
        c[HOT_Y * W + HOT_X] = 60f; // the one hot pixel: the top of the range
        c[3 * W + 3] = 19f;         // the one cold pixel: the bottom
        Path f = dir.resolve("frame.tif");
        FrameWriters.write(f, FrameEncoding.F32_TIFF, W, H, c, null);
        return f;
    }

    @Test
    void pngHasTheDocumentedSizeColoursAndGrid(@TempDir Path dir) throws IOException {
        Path png = dir.resolve("view.png");
        InspectCommandTest.Result r = InspectCommandTest.run("frame-view", frame(dir).toString(), "--out",
                png.toString(), "--grid", "5", "--scale", "5", "--profile", "f32-celsius");
        assertEquals(Main.EXIT_OK, r.code(), r.err());
        assertTrue(r.out().contains("40 x 30 px at 5 screen px per pixel, grid every 5 px, 19.00 to 60.00 °C"), r.out());
        BufferedImage img = ImageIO.read(png.toFile());
        int s = 5;
        assertEquals(FrameView.LEFT + W * s + FrameView.RIGHT, img.getWidth());
        assertEquals(FrameView.TOP + H * s + FrameView.BOTTOM, img.getHeight());

        // the hot pixel's block (away from its middle row and column) is the ember map's hot end, the cold one its
        // cold end; a pixel at 20 C lies 1/41 of the way up
        int hot = img.getRGB(FrameView.LEFT + HOT_X * s + 1, FrameView.TOP + HOT_Y * s + 1) & 0xffffff;
        assertEquals(ColourMaps.EMBER.rgb(1.0), hot);
        int cold = img.getRGB(FrameView.LEFT + 3 * s + 1, FrameView.TOP + 3 * s + 1) & 0xffffff;
        assertEquals(ColourMaps.EMBER.rgb(0.0), cold);
        int warm = img.getRGB(FrameView.LEFT + 7 * s + 1, FrameView.TOP + 7 * s + 1) & 0xffffff;
        assertEquals(ColourMaps.EMBER.rgb(1.0 / 41), warm);

        // grid: the middle column of every 5th pixel's block (LEFT + u s + s / 2), and only there
        int probeRow = FrameView.TOP + 7 * s + 1; // inside a frame row that is not a grid row
        for (int u = 0; u < W; u++) {
            int col = FrameView.LEFT + u * s + s / 2;
            int rgb = img.getRGB(col, probeRow) & 0xffffff;
            if (u % 5 == 0) assertEquals(FrameView.GRID_RGB, rgb, "grid line at x = " + u);
            else assertNotEquals(FrameView.GRID_RGB, rgb, "no grid line at x = " + u);
            assertNotEquals(FrameView.GRID_RGB, img.getRGB(col - 1, probeRow) & 0xffffff, "line one column wide");
        }
        int probeCol = FrameView.LEFT + 7 * s + 1;
        for (int v = 0; v < H; v++) {
            int rgb = img.getRGB(probeCol, FrameView.TOP + v * s + s / 2) & 0xffffff;
            if (v % 5 == 0) assertEquals(FrameView.GRID_RGB, rgb, "grid line at y = " + v);
            else assertNotEquals(FrameView.GRID_RGB, rgb, "no grid line at y = " + v);
        }
        // the grid's colour is none of the map's, so a line is never mistaken for a temperature
        for (int c : ColourMaps.EMBER.table()) assertNotEquals(FrameView.GRID_RGB, c);
    }

    @Test
    void defaultScaleIsOddAndAboutNineHundredSixtyAcross() {
        assertEquals(3, FrameView.defaultScale(320));  // 960 / 320 = 3
        assertEquals(5, FrameView.defaultScale(160));  // 6, made odd
        assertEquals(1, FrameView.defaultScale(1280));
        assertFalse(FrameView.defaultScale(100) % 2 == 0);
    }

    @Test
    void missingFrameAndEvenScaleAreRefusedInOneLine(@TempDir Path dir) {
        InspectCommandTest.Result missing = InspectCommandTest.run("frame-view", dir.resolve("nope.png").toString(),
                "--out", dir.resolve("x.png").toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, missing.code());
        assertTrue(missing.err().contains("nope.png") && missing.err().contains("not found"), missing.err());
        assertEquals(1, missing.err().lines().count(), missing.err());
        InspectCommandTest.Result even = InspectCommandTest.run("frame-view", frame(dir).toString(), "--out",
                dir.resolve("x.png").toString(), "--scale", "4");
        assertEquals(Main.EXIT_USAGE, even.code(), even.err());
    }

    @Test
    void neverWritesOverTheFrameOrAnExistingFileUnasked(@TempDir Path dir) throws Exception {
        // common practice: a tool never replaces a file it was not asked to replace; the radiometric frame itself
        // would be lost to a false-colour picture
        Path f = frame(dir);
        byte[] original = Files.readAllBytes(f);
        InspectCommandTest.Result self = InspectCommandTest.run("frame-view", f.toString(), "--out", f.toString(),
                "--force");
        assertEquals(Main.EXIT_INPUT_REJECTED, self.code(), self.err());
        assertTrue(self.err().contains("is the frame being drawn"), self.err());
        assertArrayEquals(original, Files.readAllBytes(f), "the frame is unchanged");

        Path mine = dir.resolve("notes.png");
        Files.writeString(mine, "mine");
        InspectCommandTest.Result exists = InspectCommandTest.run("frame-view", f.toString(), "--out", mine.toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, exists.code(), exists.err());
        assertTrue(exists.err().contains("exists already") && exists.err().contains("--force"), exists.err());
        assertEquals("mine", Files.readString(mine));
        assertEquals(0, InspectCommandTest.run("frame-view", f.toString(), "--out", mine.toString(), "--force").code());
        assertTrue(Files.size(mine) > 100, "replaced when asked");

        // a folder: one line, no stack trace
        InspectCommandTest.Result folder = InspectCommandTest.run("frame-view", f.toString(), "--out", dir.toString());
        assertEquals(Main.EXIT_INPUT_REJECTED, folder.code(), folder.err());
        assertTrue(folder.err().contains("is a folder"), folder.err());
        assertEquals(1, folder.err().lines().count(), folder.err());
    }
}
