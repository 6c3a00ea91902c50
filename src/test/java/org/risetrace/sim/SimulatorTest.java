package org.risetrace.sim;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.board.Board;
import org.risetrace.io.Sidecar;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

class SimulatorTest {
    @TempDir
    Path dir;

    @Test
    void writesFramesSidecarBoardFileAndTruth() throws IOException {
        Scenario s = Scenarios.small();
        SimulationOutput out = Simulator.run(s, dir);
        assertEquals(30, out.frameFiles().size());
        for (Path f : out.frameFiles()) {
            // each frame a 16-bit grey PNG of the camera's size, as the JDK's decoder reads it
            java.awt.image.BufferedImage img = javax.imageio.ImageIO.read(f.toFile());
            assertEquals(s.camera().width(), img.getWidth(), f.toString());
            assertEquals(s.camera().height(), img.getHeight(), f.toString());
            assertEquals(16, img.getColorModel().getComponentSize(0), f.toString());
        }
        Board board = Scenario.JSON.readValue(out.boardFile().toFile(), Board.class);
        Sidecar sidecar = Scenario.JSON.readValue(out.sidecarFile().toFile(), Sidecar.class);
        Truth truth = Truth.read(out.truthFile());
        assertEquals("f0001.png", board.outline().frame());
        assertEquals(11, board.parts().size());
        assertEquals("u16-centikelvin", sidecar.profile());
        assertEquals(2.0, sidecar.injection().startS());
        assertEquals(0.5, sidecar.frames().get("f0002.png").tS(), 1e-12);
        // the outline is the first frame's true corners to the nearest half pixel, as a user would click them
        double[][] trueCorners = truth.frames().get(0).boardCornersPx();
        for (int c = 0; c < 4; c++)
            for (int a = 0; a < 2; a++) {
                double clicked = board.outline().cornersPx()[c][a];
                assertEquals(trueCorners[c][a], clicked, 0.25 + 1e-9);
                assertEquals(0.0, clicked * 2 - Math.rint(clicked * 2), 1e-12);
            }
        // the source part ends hotter than every other part; nothing moves before the injection start
        double[] q1 = truth.part("Q1");
        for (Map.Entry<String, double[]> e : truth.partTemperaturesC().entrySet()) {
            if (!e.getKey().equals("Q1")) assertTrue(q1[29] > e.getValue()[29] + 1, e.getKey());
            assertEquals(23.0, e.getValue()[0], 1e-9);
        }
        assertEquals("Q1", truth.primarySource());
    }

    @Test
    void sameScenarioAndSeedGiveTheSameBytes() throws IOException {
        Scenario s = Scenarios.small().withFrames(6, 0.5, 1.0).withMotion(Scenario.Motion.handheld(5, 0.1, 0.15));
        Path a = dir.resolve("a"), b = dir.resolve("b"), c = dir.resolve("c");
        Simulator.run(s, a);
        Simulator.run(s, b);
        Simulator.run(s.withSeed(2), c);
        Map<String, String> ha = hashes(a), hb = hashes(b), hc = hashes(c);
        assertEquals(9, ha.size());
        assertEquals(ha, hb);
        assertNotEquals(ha.get("f0002.png"), hc.get("f0002.png"));
    }

    static Map<String, String> hashes(Path folder) throws IOException {
        Map<String, String> out = new TreeMap<>();
        try (Stream<Path> files = Files.list(folder)) {
            for (Path f : files.toList()) out.put(f.getFileName().toString(), sha256(f));
        }
        return out;
    }

    static String sha256(Path f) throws IOException {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(f)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    @Test
    void rejectsUnknownFieldNamingFileLineAndField() throws IOException {
        Path f = dir.resolve("bad.json");
        Files.writeString(f, "{\n  \"name\": \"x\",\n  \"sede\": 3\n}\n");
        var e = org.junit.jupiter.api.Assertions.assertThrows(org.risetrace.frame.InputRejected.class, () -> Scenario.read(f));
        assertTrue(e.getMessage().contains("bad.json") && e.getMessage().contains("sede") && e.getMessage().contains("line 3"),
                e.getMessage());
    }

    @Test
    void rejectsSharesThatDoNotSumToOneNamingTheField() {
        Scenario s = Scenarios.small().withSources(java.util.List.of(new Scenario.SourceShare("Q1", 0.5)));
        var e = org.junit.jupiter.api.Assertions.assertThrows(org.risetrace.frame.InputRejected.class,
                () -> s.validate(Path.of("x.json")));
        assertTrue(e.getMessage().contains("x.json") && e.getMessage().contains("fault.sources"), e.getMessage());
        Scenario t = Scenarios.small().withSources(java.util.List.of(new Scenario.SourceShare("Q99", 1.0)));
        var e2 = org.junit.jupiter.api.Assertions.assertThrows(org.risetrace.frame.InputRejected.class,
                () -> t.validate(Path.of("x.json")));
        assertTrue(e2.getMessage().contains("Q99"), e2.getMessage());
    }

    /** Starting from the idle steady state, a board with idle power but no fault stays where it is. */
    @Test
    void idleSteadyStartStaysSteadyWithoutInjection() {
        Scenario base = Scenarios.small(0.0);
        java.util.List<Scenario.PartSpec> parts = new java.util.ArrayList<>(base.board().partsOrEmpty());
        Scenario.PartSpec u1 = parts.get(parts.size() - 1);
        parts.set(parts.size() - 1, new Scenario.PartSpec(u1.ref(), u1.kind(), u1.material(), u1.xMm(), u1.yMm(),
                u1.wMm(), u1.hMm(), null, null, null, null, null, u1.leads(), null, 0.3));
        Scenario.BoardSpec b = base.board().withParts(parts);
        Scenario s = base.withBoard(new Scenario.BoardSpec(b.name(), b.sizeMm(), b.thicknessMm(), b.copperLayers(),
                b.cellMm(), b.hConvWPerM2K(), null, null, "idle-steady", b.parts(), b.traces(), b.holes()));
        Simulator.History h = Simulator.thermal(s);
        int last = h.tS().length - 1;
        double u1Rise = h.partsC()[0][parts.size() - 1] - 23.0;
        assertTrue(u1Rise > 1.0, "idle power warms U1 at the start: " + u1Rise);
        for (int p = 0; p < parts.size(); p++) assertEquals(h.partsC()[0][p], h.partsC()[last][p], 1e-4);
        // steady state: all idle power leaves through the faces, nothing is stored
        assertEquals(h.energy().injectedJ(), h.energy().lostJ(), 1e-3 * h.energy().injectedJ());
    }
}
