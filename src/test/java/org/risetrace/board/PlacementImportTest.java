package org.risetrace.board;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.cli.Main;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class PlacementImportTest {
    static final Path MM = Path.of("src/test/resources/fixtures/board/placement-mm.csv");
    static final Path MIL = Path.of("src/test/resources/fixtures/board/placement-mil.csv");

    private static Part part(Board b, String ref) {
        return b.partsOrEmpty().stream().filter(p -> p.ref().equals(ref)).findFirst().orElseThrow();
    }

    @Test
    void quotedCsvWithTitleLinesAndUnitSuffixesImportsTopParts() {
        PlacementImport.Options o = new PlacementImport.Options(null, null, null, null, null, "mm", null, null, true,
                "top", Map.of(), new double[]{80, 60}, null);
        Board b = PlacementImport.read(MM, o).board();
        assertEquals(3, b.partsOrEmpty().size(), "bottom-layer R9 left out");
        Part q4 = part(b, "Q4");
        assertEquals(41.5, q4.xMm(), 1e-9);
        // y up, CAD origin at the bottom-left corner: board y = height - CAD y = 60 - 38
        assertEquals(22.0, q4.yMm(), 1e-9);
        assertNull(q4.rotationDeg());
        assertEquals("transistor", q4.kind());
        Part c17 = part(b, "C17");
        assertEquals(90.0, c17.rotationDeg());
        assertEquals(1.6, c17.wMm(), 1e-12, "default C footprint (0603: 1.6 x 0.8 mm, common practice)");
        assertNull(b.outline(), "outline left for the user");
    }

    @Test
    void milValuesSemicolonsAndDecimalCommaConvertToMillimetres() {
        PlacementImport.Options o = new PlacementImport.Options(null, null, null, null, null, "mil", 0.0, 0.0, false,
                "all", Map.of("L", new double[]{5, 5}), new double[]{60, 40}, "bt8");
        Board b = PlacementImport.read(MIL, o).board();
        assertEquals(3, b.partsOrEmpty().size());
        // 1 mil = 0.0254 mm exactly (inch = 25.4 mm by definition)
        assertEquals(25.4, part(b, "L1").xMm(), 1e-9);
        assertEquals(12.7, part(b, "L1").yMm(), 1e-9);
        assertEquals(1500.5 * 0.0254, part(b, "C3").xMm(), 1e-9);
        assertEquals(5.0, part(b, "L1").wMm(), "footprint option wins over the default");
        assertEquals(45.0, part(b, "C3").rotationDeg());
    }

    @Test
    void bottomSideFilterKeepsOnlyBottomParts() {
        PlacementImport.Options o = new PlacementImport.Options(null, null, null, null, null, "mil", 0.0, 0.0, false,
                "bottom", Map.of(), new double[]{60, 40}, null);
        Board b = PlacementImport.read(MIL, o).board();
        assertEquals(1, b.partsOrEmpty().size());
        assertEquals("D2", b.partsOrEmpty().get(0).ref());
    }

    @Test
    void namedColumnsOverrideTheUsualNames(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("p.csv");
        Files.writeString(f, "Part Id,Horiz,Vert,Turn\nTP1,10,5,0\nTP2,20,6,30\n");
        PlacementImport.Options o = new PlacementImport.Options("Part Id", "Horiz", "Vert", "Turn", null, "mm", 0.0, 0.0,
                false, "top", Map.of(), new double[]{40, 20}, null);
        Board b = PlacementImport.read(f, o).board();
        assertEquals(2, b.partsOrEmpty().size());
        assertEquals(30.0, part(b, "TP2").rotationDeg());
        assertEquals(6.0, part(b, "TP2").yMm(), 1e-9);
    }

    @Test
    void repeatedDesignatorIsRejectedNamingTheLine(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("p.csv");
        Files.writeString(f, "Ref,X,Y\nC1,1,1\nC2,2,2\nC1,3,3\n");
        InputRejected e = assertThrows(InputRejected.class, () -> PlacementImport.read(f, PlacementImport.Options.defaults()));
        assertTrue(e.reason().contains("line 4") && e.reason().contains("C1"), e.getMessage());
    }

    @Test
    void csvWithoutRecognisableHeaderIsRejected(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("p.csv");
        Files.writeString(f, "a,b,c\n1,2,3\n");
        InputRejected e = assertThrows(InputRejected.class, () -> PlacementImport.read(f, PlacementImport.Options.defaults()));
        assertTrue(e.reason().contains("header"), e.getMessage());
    }

    @Test
    void nonNumericCoordinateIsRejectedNamingLineAndPart(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("p.csv");
        Files.writeString(f, "Ref,X,Y\nC1,1,1\nC2,two,2\n");
        InputRejected e = assertThrows(InputRejected.class, () -> PlacementImport.read(f, PlacementImport.Options.defaults()));
        assertTrue(e.reason().contains("line 3") && e.reason().contains("C2"), e.getMessage());
    }

    @Test
    void partOutsideTheGivenBoardSizeIsRejected(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("p.csv");
        Files.writeString(f, "Ref,X,Y\nU1,100,5\n");
        PlacementImport.Options o = new PlacementImport.Options(null, null, null, null, null, "mm", 0.0, 0.0, false,
                "top", Map.of(), new double[]{50, 50}, null);
        assertThrows(InputRejected.class, () -> PlacementImport.read(f, o));
    }

    @Test
    void commandWritesABoardFileTheReaderAccepts(@TempDir Path dir) {
        Path out = dir.resolve("board.json");
        int code = Main.run("board", "import-placement", MM.toString(), "--size-mm", "80,60", "--footprint", "U=7x7",
                "--out", out.toString());
        assertEquals(0, code);
        Board b = BoardFile.readWithoutOutline(out, null);
        assertEquals(3, b.partsOrEmpty().size());
        assertEquals(7.0, part(b, "U2").wMm());
        assertEquals(1, Main.run("board", "import-placement", MM.toString(), "--out", out.toString()),
                "an existing file is not overwritten without --force");
        assertEquals(2, Main.run("board", "import-placement", MM.toString(), "--footprint", "U=seven"), "usage error");
    }
}
