package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * PGM built byte by byte from the netpbm format description (netpbm.sourceforge.net/doc/pgm.html): "P5",
 * whitespace, width, whitespace, height, whitespace, maxval, one whitespace character, raster; each sample one
 * byte if maxval < 256, else two bytes, most significant first; "#" starts a comment to end of line in the header.
 */
class PgmReaderTest {
    @TempDir
    Path dir;

    private Path write(String name, String header, byte[] raster) throws IOException {
        ByteArrayOutputStream b = new ByteArrayOutputStream();
        b.write(header.getBytes(StandardCharsets.US_ASCII));
        b.write(raster);
        return Files.write(dir.resolve(name), b.toByteArray());
    }

    @Test
    void twoByteSamplesAreBigEndian() throws IOException {
        // 0x6AB3 = 27315 counts = 0 degC; 0x7477 = 29815 = 25 degC (u16-centikelvin, 0 degC = 273.15 K, SI)
        Path f = write("a.pgm", "P5\n2 1\n65535\n", new byte[]{0x6A, (byte) 0xB3, 0x74, 0x77});
        Frame frame = FrameReaders.read(f, ReadContext.of(Profiles.load("u16-centikelvin")));
        assertEquals(0.0, frame.at(0, 0), 1e-4);
        assertEquals(25.0, frame.at(1, 0), 1e-4);
        assertEquals(16, frame.decoding().bitDepth());
        assertEquals("pgm", frame.decoding().container());
    }

    @Test
    void commentsAndAnyWhitespaceInTheHeaderAreAllowed() throws IOException {
        Path f = write("c.pgm", "P5 # camera export\n# another comment\n2\t1\r\n4095 ", new byte[]{0x0F, (byte) 0xFF, 0, 1});
        RawSamples s = FrameReaders.samples(f, ReadContext.defaults());
        assertEquals(2, s.width());
        assertEquals(4095, s.u16()[0]); // a 12-bit camera's full scale
        assertEquals(1, s.u16()[1]);
        assertEquals(RawSamples.Kind.COUNTS, s.kind()); // maxval > 255: counts
    }

    @Test
    void oneByteSamplesScaleTheSpanByMaxval() throws IOException {
        Path f = write("g.pgm", "P5\n3 1\n100\n", new byte[]{0, 50, 100});
        Frame frame = FrameReaders.read(f, new ReadContext(Profiles.load("u8-span"), new double[]{20, 40},
                ReadContext.DEFAULT_MAX_PIXELS));
        // maxval is full scale: 50 of 100 is half way along the span
        assertEquals(20.0, frame.at(0, 0), 1e-5);
        assertEquals(30.0, frame.at(1, 0), 1e-5);
        assertEquals(40.0, frame.at(2, 0), 1e-5);
    }

    @Test
    void plainP2ReadsTheSameAsBinaryP5() throws IOException {
        Path plain = write("p.pgm", "P2\n2 2\n65535\n27315 29815\n 100 65535\n", new byte[0]);
        Path binary = write("b.pgm", "P5\n2 2\n65535\n",
                new byte[]{0x6A, (byte) 0xB3, 0x74, 0x77, 0x00, 0x64, (byte) 0xFF, (byte) 0xFF});
        ReadContext ctx = ReadContext.of(Profiles.load("u16-centikelvin"));
        assertTrue(Arrays.equals(FrameReaders.read(plain, ctx).celsius(), FrameReaders.read(binary, ctx).celsius()));
    }

    @Test
    void truncatedRasterIsRejected() throws IOException {
        Path f = write("t.pgm", "P5\n4 4\n65535\n", new byte[20]);
        InputRejected e = assertThrows(InputRejected.class, () -> FrameReaders.read(f, ReadContext.defaults()));
        assertTrue(e.getMessage().contains("t.pgm") && e.getMessage().contains("truncated PGM")
                && e.getMessage().contains("32 bytes"), e.getMessage());
    }

    @Test
    void sampleAboveMaxvalIsRejected() throws IOException {
        Path f = write("m.pgm", "P5\n2 1\n1000\n", new byte[]{0x03, (byte) 0xE8, 0x03, (byte) 0xE9});
        InputRejected e = assertThrows(InputRejected.class, () -> FrameReaders.read(f, ReadContext.defaults()));
        assertTrue(e.getMessage().contains("1001") && e.getMessage().contains("pixel (1, 0)"), e.getMessage());
    }

    @Test
    void hugeHeaderIsRejectedBeforeAllocation() throws IOException {
        Path f = write("h.pgm", "P5\n60000 60000\n65535\n", new byte[16]);
        InputRejected e = assertThrows(InputRejected.class, () -> FrameReaders.read(f, ReadContext.defaults()));
        assertTrue(e.getMessage().contains("60000 x 60000") && e.getMessage().contains("limit"), e.getMessage());
    }
}
