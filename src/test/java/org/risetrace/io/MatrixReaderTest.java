package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** CSV/TSV temperature matrices: one image row per line, separators and decimal marks as exporters write them. */
class MatrixReaderTest {
    @TempDir
    Path dir;

    Frame read(String name, String text) throws IOException {
        return FrameReaders.read(Files.writeString(dir.resolve(name), text), ReadContext.defaults());
    }

    @Test
    void decimalCommaReadsTheSameAsDecimalPoint() throws IOException {
        Frame point = read("p.csv", "23.5,24.25,-1.5\n30,31.125,32\n");
        Frame comma = read("c.csv", "23,5;24,25;-1,5\n30;31,125;32\n");
        Frame tab = read("t.tsv", "23,5\t24.25\t-1,5\r\n30\t31,125\t32\r\n");
        assertEquals(3, point.width());
        assertEquals(2, point.height());
        assertArrayEquals(point.celsius(), comma.celsius());
        assertArrayEquals(point.celsius(), tab.celsius());
        assertEquals(24.25f, comma.at(1, 0));
        assertEquals("matrix-celsius", comma.decoding().profile());
        assertEquals("csv", comma.decoding().container());
    }

    @Test
    void commentsBlankLinesTrailingSeparatorsQuotesAndNaNAreHandled() throws IOException {
        Frame f = read("x.csv", "\uFEFF# exported matrix\n\n\"21,5\";22;\nNaN;23;\n");
        assertEquals(2, f.width());
        assertEquals(21.5f, f.at(0, 0));
        assertTrue(Float.isNaN(f.at(0, 1))); // a pixel without a reading stays NaN
    }

    @Test
    void kelvinMatrixProfileConverts() throws IOException {
        Path p = Files.writeString(dir.resolve("mk.json"), """
                {"name": "matrix-kelvin", "encoding": "matrix", "unit": "K", "netd_k": 0.05,
                 "band_um": [7.5, 14], "default_emissivity": 0.95}""");
        Path f = Files.writeString(dir.resolve("k.csv"), "273.15;298.15\n");
        Frame frame = FrameReaders.read(f, ReadContext.of(Profiles.load(p.toString())));
        assertEquals(0.0, frame.at(0, 0), 1e-4); // 273.15 K = 0 degC (SI)
        assertEquals(25.0, frame.at(1, 0), 1e-4);
    }

    @Test
    void rowsOfUnequalLengthAreRejectedNamingTheLine() throws IOException {
        InputRejected e = assertThrows(InputRejected.class, () -> read("u.csv", "1;2;3\n4;5;6\n7;8\n"));
        assertTrue(e.getMessage().contains("u.csv") && e.getMessage().contains("line 3 has 2 values")
                && e.getMessage().contains("line 1 has 3"), e.getMessage());
    }

    @Test
    void commaSeparatedWithDecimalCommaIsCaughtByUnequalRows() throws IOException {
        // "23,5,24" is ambiguous; commas always separate, so a row whose values lose the split differently fails
        InputRejected e = assertThrows(InputRejected.class, () -> read("a.csv", "23,5,24,5\n23,24\n"));
        assertTrue(e.getMessage().contains("line 2 has 2 values"), e.getMessage());
    }

    @Test
    void textThatIsNotANumberIsRejectedNamingLineAndColumn() throws IOException {
        InputRejected e = assertThrows(InputRejected.class, () -> read("n.csv", "1;2\n3;warm\n"));
        assertTrue(e.getMessage().contains("'warm' at line 2, column 2"), e.getMessage());
        InputRejected empty = assertThrows(InputRejected.class, () -> read("e.csv", "1;;2\n"));
        assertTrue(empty.getMessage().contains("empty value at line 1, column 2"), empty.getMessage());
    }
}
