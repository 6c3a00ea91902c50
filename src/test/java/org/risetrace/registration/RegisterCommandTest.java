package org.risetrace.registration;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.board.Outline;
import org.risetrace.cli.Main;
import org.risetrace.frame.Frame;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.awt.image.DataBufferUShort;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** End to end: 16-bit centikelvin PNG frames on disk, board.json, `risetrace register`, registration.json. */
class RegisterCommandTest {
    static final int W = 160, H = 128;

    static void writePng(Frame f, Path file) throws IOException {
        BufferedImage img = new BufferedImage(f.width(), f.height(), BufferedImage.TYPE_USHORT_GRAY);
        short[] d = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
        // centikelvin: counts = (celsius + 273.15) * 100, the u16-centikelvin profile
        for (int i = 0; i < d.length; i++) d[i] = (short) Math.round((f.celsius()[i] + 273.15) * 100);
        ImageIO.write(img, "png", file.toFile());
    }

    @Test
    void registerWritesOneEntryPerFrameWithCornersAndRectifiedFrames(@TempDir Path dir) throws IOException {
        SyntheticScene scene = new SyntheticScene(77);
        double[][] rc = SyntheticScene.referenceCorners(W, H);
        List<double[][]> truth = new ArrayList<>();
        for (int i = 0; i < 5; i++) {
            double[][] c = SyntheticScene.moved(rc, W, H, 0.8 * i, 1 + 0.01 * i, 2.5 * i, -1.5 * i);
            truth.add(c);
            Board tmp = scene.board("frame_0.png", rc);
            writePng(scene.render(W, H, Homographies.boardToFrame(tmp, c), 0.8 * i, 0.05, i, "x"),
                    dir.resolve("frame_" + i + ".png"));
        }
        float[] flat = new float[W * H];
        java.util.Arrays.fill(flat, 24f);
        writePng(new Frame(W, H, flat, 0, null, Path.of("x"), "", null), dir.resolve("frame_5.png"));
        double[][] marked = {{30, 25}, {130, 24}, {129, 104}, {31, 103}};
        Board board = new Board("bench board", new double[]{scene.widthMm, scene.heightMm},
                new Outline("frame_0.png", rc, Map.of("frame_4.png", marked)), scene.parts, null);
        BoardFile.write(board, dir.resolve("board.json"));
        Files.writeString(dir.resolve("series.json"), "{\"profile\": \"u16-centikelvin\", \"frame_interval_s\": 0.5}");

        int code = Main.run("register", dir.toString(), "--write-rectified", "--px-per-mm", "1.5");
        assertEquals(0, code);
        RegistrationReport r = SeriesRegistration.read(dir.resolve("registration.json"));
        assertEquals(6, r.frames().size());
        assertEquals(RegistrationStatus.MARKED, r.frames().get(0).status(), "reference");
        for (int i = 1; i <= 3; i++) {
            RegistrationReport.Entry e = r.frames().get(i);
            assertEquals(RegistrationStatus.OK, e.status(), e.file() + " " + e.reason());
            assertEquals(0.5 * i, e.tSeconds(), 1e-9, "time from frame_interval_s");
            // 16-bit quantisation of 0.01 K does not move corners noticeably: the hand-held limit of issue #4
            assertTrue(SyntheticScene.cornerError(e.boardCornersPx(), truth.get(i)) <= 0.25, e.file());
        }
        assertEquals(RegistrationStatus.MARKED, r.frames().get(4).status(), "user-marked corners win");
        assertEquals(RegistrationStatus.FAILED, r.frames().get(5).status(), "flat frame");
        assertEquals(3, r.summary().ok());
        assertEquals(1, r.summary().failed());
        assertEquals(2, r.summary().marked());
        BufferedImage rect = ImageIO.read(dir.resolve("rectified/frame_1.png").toFile());
        assertEquals(Math.round(scene.widthMm * 1.5), rect.getWidth());
        assertEquals(Math.round(scene.heightMm * 1.5), rect.getHeight());
        assertTrue(Files.notExists(dir.resolve("rectified/frame_5.png")), "no rectified image of a failed frame");

        // a frame cut short is recorded as failed with the reader's reason, and the others are registered (as the
        // analysis leaves such a frame out; before, it ended the whole run)
        byte[] whole = Files.readAllBytes(dir.resolve("frame_3.png"));
        Files.write(dir.resolve("frame_3.png"), java.util.Arrays.copyOf(whole, whole.length / 2));
        assertEquals(0, Main.run("register", dir.toString(), "--out", dir.resolve("cut").toString()));
        RegistrationReport cut = SeriesRegistration.read(dir.resolve("cut/registration.json"));
        assertEquals(6, cut.frames().size());
        assertEquals(RegistrationStatus.FAILED, cut.frames().get(3).status());
        assertTrue(cut.frames().get(3).reason().startsWith("cannot be read: "), cut.frames().get(3).reason());
        assertEquals(RegistrationStatus.OK, cut.frames().get(2).status(), cut.frames().get(2).reason());
        Files.write(dir.resolve("frame_3.png"), whole);

        // rectified frames too coarse to hold any part are refused, as analyze refuses them (they were 1 x 1 px)
        assertEquals(1, Main.run("register", dir.toString(), "--out", dir.resolve("coarse").toString(),
                "--write-rectified", "--px-per-mm", "0.001"));
        assertTrue(Files.notExists(dir.resolve("coarse/rectified")), "nothing written");

        // a second run does not replace the first one's registration.json unasked (common practice: never
        // overwrite a file the user did not ask to replace; it may be the only record of a run, or edited)
        Files.writeString(dir.resolve("registration.json"), "{\"mine\": true}");
        assertEquals(1, Main.run("register", dir.toString()));
        assertEquals("{\"mine\": true}", Files.readString(dir.resolve("registration.json")));
        assertEquals(0, Main.run("register", dir.toString(), "--force"));
        assertEquals(6, SeriesRegistration.read(dir.resolve("registration.json")).frames().size());
    }

    @Test
    void registerRejectsABoardWhoseReferenceFrameIsMissing(@TempDir Path dir) throws IOException {
        SyntheticScene scene = new SyntheticScene(78);
        double[][] rc = SyntheticScene.referenceCorners(W, H);
        Board board = scene.board("nothere.png", rc);
        writePng(scene.render(W, H, Homographies.boardToFrame(board, rc), 0, 0.05, 1, "x"), dir.resolve("a.png"));
        BoardFile.write(board, dir.resolve("board.json"));
        assertEquals(1, Main.run("register", dir.toString()));
    }
}
