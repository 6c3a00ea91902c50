package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;

import java.awt.image.BufferedImage;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

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

    @Test
    void floatTiffFromImageIoKeepsTemperaturesAndNaN() throws Exception {
        int w = 16, h = 12;
        float[] v = new float[w * h];
        for (int i = 0; i < v.length; i++) v[i] = 20.0f + 0.125f * i;
        v[5] = Float.NaN; // a pixel without a reading
        Path file = TestImages.writeTiff(TestImages.floatGrey(v, w, h), "Deflate", dir.resolve("f.tif"));
        Frame f = FrameReaders.read(file, ReadContext.defaults());
        assertEquals("f32-celsius", f.decoding().profile());
        assertEquals(32, f.decoding().bitDepth());
        for (int i = 0; i < v.length; i++) if (i != 5) assertEquals(v[i], f.celsius()[i], 0f);
        assertTrue(Float.isNaN(f.celsius()[5]));
        // the same samples in kelvin: T(degC) = T(K) - 273.15 (SI)
        Frame k = FrameReaders.read(file, ReadContext.of(Profiles.load("f32-kelvin")));
        assertEquals(v[0] - 273.15, k.celsius()[0], 1e-4);
    }

    @Test
    void rgbWithEqualChannelsIsGreyAndBmpPaletteGreyToo() throws Exception {
        BufferedImage rgb = new BufferedImage(16, 12, BufferedImage.TYPE_3BYTE_BGR);
        for (int y = 0; y < 12; y++) for (int x = 0; x < 16; x++) {
            int g = (3 * x + 5 * y) & 0xFF;
            rgb.setRGB(x, y, (g << 16) | (g << 8) | g);
        }
        ReadContext span = new ReadContext(Profiles.load("u8-span"), new double[]{0, 255}, ReadContext.DEFAULT_MAX_PIXELS);
        Frame png = FrameReaders.read(TestImages.write(rgb, "png", dir.resolve("rgb.png")), span);
        Frame bmp = FrameReaders.read(TestImages.write(TestImages.byteGrey(16, 12), "bmp", dir.resolve("g.bmp")), span);
        for (int y = 0; y < 12; y++) for (int x = 0; x < 16; x++) {
            assertEquals((3 * x + 5 * y) & 0xFF, png.at(x, y), 1e-5); // span [0, 255]: degC = grey level
            assertEquals((3 * x + 5 * y) & 0xFF, bmp.at(x, y), 1e-5);
        }
        assertEquals("bmp", bmp.decoding().container());
    }

    @Test
    void truncatedTiffStripIsRejectedNotReadAsZeros() throws Exception {
        Path good = TestImages.writeTiff(TestImages.ushortGrey(160, 128), null, dir.resolve("g.tif"));
        byte[] b = java.nio.file.Files.readAllBytes(good);
        TiffHeader ifd = TiffHeader.parse(b);
        assertTrue(ifd != null, "the JDK writer puts IFD 0 before the strips");
        Path cut = java.nio.file.Files.write(dir.resolve("cut.tif"), java.util.Arrays.copyOf(b, b.length - 100));
        org.risetrace.frame.InputRejected e = org.junit.jupiter.api.Assertions.assertThrows(
                org.risetrace.frame.InputRejected.class, () -> FrameReaders.read(cut, ReadContext.defaults()));
        assertTrue(e.getMessage().contains("cut.tif") && e.getMessage().contains("truncated"), e.getMessage());
    }

    @Test
    void hugeTiffHeaderIsRejectedBeforeAllocation() throws Exception {
        Path good = TestImages.writeTiff(TestImages.ushortGrey(16, 12), null, dir.resolve("s.tif"));
        byte[] b = java.nio.file.Files.readAllBytes(good);
        // TIFF 6.0: IFD entries are 12 bytes (tag, type, count, value); patch ImageWidth (256) and ImageLength (257)
        TiffHeader h = TiffHeader.parse(b);
        int ifd = (int) h.u32(b, 4);
        int n = h.u16(b, ifd);
        for (int i = 0; i < n; i++) {
            int e = ifd + 2 + 12 * i, tag = h.u16(b, e), type = h.u16(b, e + 2);
            if (tag == 256 || tag == 257) {
                java.nio.ByteBuffer buf = java.nio.ByteBuffer.wrap(b, e + 8, 4)
                        .order(h.littleEndian ? java.nio.ByteOrder.LITTLE_ENDIAN : java.nio.ByteOrder.BIG_ENDIAN);
                if (type == 3) buf.putShort((short) 60000); else buf.putInt(60000);
            }
        }
        Path huge = java.nio.file.Files.write(dir.resolve("huge.tif"), b);
        org.risetrace.frame.InputRejected e = org.junit.jupiter.api.Assertions.assertThrows(
                org.risetrace.frame.InputRejected.class, () -> FrameReaders.read(huge, ReadContext.defaults()));
        assertTrue(e.getMessage().contains("60000 x 60000") && e.getMessage().contains("limit"), e.getMessage());
    }

    @Test
    void sameCountsInEveryContainerGiveTheSameTemperatures() throws Exception {
        BufferedImage img = TestImages.ushortGrey(32, 24);
        Frame png = FrameReaders.read(TestImages.write(img, "png", dir.resolve("s.png")), ReadContext.defaults());
        Frame tif = FrameReaders.read(TestImages.writeTiff(img, "LZW", dir.resolve("s.tif")), ReadContext.defaults());
        StringBuilder csv = new StringBuilder();
        for (int y = 0; y < 24; y++) {
            for (int x = 0; x < 32; x++) csv.append(x == 0 ? "" : ";").append(TestImages.count(x, y));
            csv.append('\n');
        }
        Path text = java.nio.file.Files.writeString(dir.resolve("s.csv"), csv);
        Frame mat = FrameReaders.read(text, ReadContext.of(Profiles.load("u16-centikelvin"))); // counts in text
        org.junit.jupiter.api.Assertions.assertArrayEquals(png.celsius(), tif.celsius());
        for (int i = 0; i < png.celsius().length; i++) assertEquals(png.celsius()[i], mat.celsius()[i], 1e-4);
    }

    @Test
    void frameHashIsTheSha256OfTheFileBytes() throws Exception {
        // FIPS 180-2 appendix B.1 example: SHA-256("abc")
        assertEquals("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad",
                FrameReaders.sha256("abc".getBytes(java.nio.charset.StandardCharsets.US_ASCII)));
        Path file = TestImages.write(TestImages.ushortGrey(16, 12), "png", dir.resolve("h.png"));
        byte[] bytes = java.nio.file.Files.readAllBytes(file);
        String expected = java.util.HexFormat.of().formatHex(java.security.MessageDigest.getInstance("SHA-256").digest(bytes));
        assertEquals(expected, FrameReaders.read(file, ReadContext.defaults()).sha256());
    }
}
