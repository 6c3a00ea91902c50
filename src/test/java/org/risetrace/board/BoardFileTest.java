package org.risetrace.board;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** board.json schema as issue #4 item 1 defines it; one test per validation error. */
class BoardFileTest {
    @TempDir
    Path dir;

    private static final Path FIXTURE = Path.of("src/test/resources/fixtures/board/valid-board.json");
    private static final Set<String> MATERIALS = Set.of("epoxy", "solder-mask", "ceramic");

    private String fixture() throws IOException {
        return Files.readString(FIXTURE);
    }

    private InputRejected rejected(String json) throws IOException {
        Path f = dir.resolve("board.json");
        Files.writeString(f, json);
        InputRejected e = assertThrows(InputRejected.class, () -> BoardFile.read(f, MATERIALS));
        assertEquals(f, e.file(), "the error names the file");
        return e;
    }

    @Test
    void validBoardFileReadsEveryField() {
        Board b = BoardFile.read(FIXTURE, MATERIALS);
        assertEquals("buck test board BT-7", b.name());
        assertEquals(80.0, b.widthMm());
        assertEquals(60.0, b.heightMm());
        assertEquals("frame_0000.png", b.outline().frame());
        assertEquals(134.4, b.outline().cornersPx()[1][0]);
        assertEquals(1, b.outline().frames().size());
        assertEquals(3, b.parts().size());
        Part q4 = b.parts().get(0);
        assertEquals("Q4", q4.ref());
        assertEquals("epoxy", q4.material());
        assertEquals(41.5, q4.xMm());
        assertNull(b.parts().get(2).rotationDeg());
        assertEquals(1, b.ambient().size());
    }

    @Test
    void writtenBoardReadsBackEqual(@TempDir Path out) {
        Board b = BoardFile.read(FIXTURE, MATERIALS);
        Path f = out.resolve("copy.json");
        BoardFile.write(b, f);
        Board c = BoardFile.read(f, MATERIALS);
        assertEquals(BoardFile.toJson(b), BoardFile.toJson(c));
    }

    @Test
    void unknownFieldIsRejectedByName() throws IOException {
        InputRejected e = rejected(fixture().replace("\"kind\": \"mosfet\"", "\"knd\": \"mosfet\""));
        assertTrue(e.reason().contains("unknown field") && e.reason().contains("knd"), e.getMessage());
        assertTrue(e.reason().contains("line"), e.getMessage());
    }

    @Test
    void malformedJsonIsRejectedWithLineAndColumn() throws IOException {
        InputRejected e = rejected(fixture().replace("\"size_mm\": [80.0, 60.0],", "\"size_mm\": [80.0, 60.0]"));
        assertTrue(e.reason().contains("malformed JSON") && e.reason().contains("line 4"), e.getMessage());
    }

    @Test
    void missingPartCoordinateIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("\"x_mm\": 60.0, ", ""));
        assertTrue(e.reason().contains("parts[2].x_mm"), e.getMessage());
    }

    @Test
    void missingSizeIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("\"size_mm\": [80.0, 60.0],", ""));
        assertTrue(e.reason().contains("size_mm"), e.getMessage());
    }

    @Test
    void negativeBoardSizeIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("[80.0, 60.0]", "[80.0, -60.0]"));
        assertTrue(e.reason().contains("size_mm"), e.getMessage());
    }

    @Test
    void zeroPartSizeIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("\"w_mm\": 7.0", "\"w_mm\": 0"));
        assertTrue(e.reason().contains("parts[2] (U2).w_mm"), e.getMessage());
    }

    @Test
    void selfCrossingOutlineIsRejected() throws IOException {
        // top-right and bottom-right swapped: a bow-tie
        InputRejected e = rejected(fixture().replace("[[25.6, 21.8], [134.4, 19.2], [132.8, 107.5], [27.2, 105.0]]",
                "[[25.6, 21.8], [132.8, 107.5], [134.4, 19.2], [27.2, 105.0]]"));
        assertTrue(e.reason().contains("outline.corners_px") && e.reason().contains("convex"), e.getMessage());
    }

    @Test
    void concaveOutlineIsRejected() throws IOException {
        // bottom-right pulled in past the diagonal
        InputRejected e = rejected(fixture().replace("[132.8, 107.5]", "[60.0, 50.0]"));
        assertTrue(e.reason().contains("convex"), e.getMessage());
    }

    @Test
    void outlineMarkedAnticlockwiseIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("[[25.6, 21.8], [134.4, 19.2], [132.8, 107.5], [27.2, 105.0]]",
                "[[25.6, 21.8], [27.2, 105.0], [132.8, 107.5], [134.4, 19.2]]"));
        assertTrue(e.reason().contains("wrong way round"), e.getMessage());
    }

    @Test
    void outlineWithThreeCornersIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace(", [27.2, 105.0]]", "]"));
        assertTrue(e.reason().contains("four corners"), e.getMessage());
    }

    @Test
    void badOverridingCornersAreRejectedByFrameName() throws IOException {
        InputRejected e = rejected(fixture().replace("[[27.0, 22.5], [135.9, 20.1], [134.0, 108.3], [28.4, 105.9]]",
                "[[27.0, 22.5], [134.0, 108.3], [135.9, 20.1], [28.4, 105.9]]"));
        assertTrue(e.reason().contains("outline.frames.frame_0007.png"), e.getMessage());
    }

    @Test
    void partOutsideBoardIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("\"x_mm\": 60.0", "\"x_mm\": 78.0"));
        assertTrue(e.reason().contains("U2") && e.reason().contains("outside the board"), e.getMessage());
    }

    @Test
    void rotatedPartReachingPastTheEdgeIsRejected() throws IOException {
        // C17: 2 x 1.25 mm; at 45 degrees its half-extent is (1 + 0.625) / sqrt 2 = 1.149 mm > 1.1 mm to the edge
        InputRejected e = rejected(fixture().replace("\"x_mm\": 12.0, \"y_mm\": 40.0", "\"x_mm\": 1.1, \"y_mm\": 40.0")
                .replace("\"rotation_deg\": 90", "\"rotation_deg\": 45"));
        assertTrue(e.reason().contains("C17"), e.getMessage());
    }

    @Test
    void duplicateDesignatorIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("\"ref\": \"U2\"", "\"ref\": \"Q4\""));
        assertTrue(e.reason().contains("duplicate designator 'Q4'"), e.getMessage());
    }

    @Test
    void unknownMaterialIsRejectedWhenMaterialsAreGiven() throws IOException {
        InputRejected e = rejected(fixture().replace("\"epoxy\"", "\"unobtainium\""));
        assertTrue(e.reason().contains("unknown material 'unobtainium'"), e.getMessage());
        Path f = dir.resolve("board.json");
        assertEquals("unobtainium", BoardFile.read(f, null).parts().get(0).material(), "no set: no check");
    }

    @Test
    void wrongTypeIsRejectedWithField() throws IOException {
        InputRejected e = rejected(fixture().replace("\"x_mm\": 41.5", "\"x_mm\": \"left\""));
        assertTrue(e.reason().contains("x_mm"), e.getMessage());
    }

    @Test
    void missingOutlineIsRejectedWithAHint() throws IOException {
        String json = fixture();
        int a = json.indexOf("\"outline\""), b = json.indexOf("\"parts\"");
        InputRejected e = rejected(json.substring(0, a) + json.substring(b));
        assertTrue(e.reason().contains("outline") && e.hint().contains("corners"), e.getMessage());
        assertEquals(3, BoardFile.readWithoutOutline(dir.resolve("board.json"), MATERIALS).parts().size());
    }

    @Test
    void ambientAreaOutsideBoardIsRejected() throws IOException {
        InputRejected e = rejected(fixture().replace("{ \"x_mm\": 5.0, \"y_mm\": 5.0", "{ \"x_mm\": -5.0, \"y_mm\": 5.0"));
        assertTrue(e.reason().contains("ambient[0]"), e.getMessage());
    }

    @Test
    void ambientAreaOnAPartIsRejected() throws IOException {
        // the ambient reading is subtracted from every part's: an area on a heating part cancels that part's rise
        // (common practice: ambient is read on bare board); on Q4 (41.5, 22, 5 x 6 mm) it cut the rate 64-fold
        InputRejected e = rejected(fixture().replace("{ \"x_mm\": 5.0, \"y_mm\": 5.0", "{ \"x_mm\": 42.0, \"y_mm\": 22.0"));
        assertTrue(e.reason().contains("ambient[0]") && e.reason().contains("overlaps part Q4"), e.getMessage());
        // touching only: the area's edge 0.5 mm from Q4's side is bare board
        Path near = dir.resolve("near.json");
        Files.writeString(near, fixture().replace("{ \"x_mm\": 5.0, \"y_mm\": 5.0", "{ \"x_mm\": 36.5, \"y_mm\": 22.0"));
        assertEquals(1, BoardFile.read(near, MATERIALS).ambient().size());
    }

    @Test
    void typeErrorsAndCutFilesAreSaidInPlainWords() throws IOException {
        // a user reads the message, not the JSON library's internals (a base64 variant, coercion settings, a
        // redacted source): what was expected and what was found, at the field's line and column
        InputRejected e = rejected(fixture().replaceFirst("\"size_mm\": \\[[^]]*]", "\"size_mm\": \"100x70\""));
        assertTrue(e.reason().contains("field 'size_mm'") && e.reason().contains("expected a list [ ... ], found text"),
                e.getMessage());
        assertFalse(e.getMessage().contains("base64") || e.getMessage().contains("deserialize"), e.getMessage());
        e = rejected(fixture().replace("\"x_mm\": 41.5", "\"x_mm\": true"));
        assertTrue(e.reason().contains("expected a number, found true or false"), e.getMessage());
        String json = fixture();
        e = rejected(json.substring(0, json.length() / 2));
        assertTrue(e.reason().contains("the file ends before the JSON document does"), e.getMessage());
        assertFalse(e.getMessage().contains("REDACTED") || e.getMessage().contains("StreamReadFeature"), e.getMessage());
    }

    @Test
    void missingFileIsRejected() {
        Path f = dir.resolve("none.json");
        InputRejected e = assertThrows(InputRejected.class, () -> BoardFile.read(f, null));
        assertTrue(e.reason().contains("not found"));
    }
}
