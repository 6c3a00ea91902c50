package org.risetrace.io;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.InputRejected;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import java.awt.image.BufferedImage;
import java.awt.image.DataBufferByte;
import java.awt.image.DataBufferUShort;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.Set;
import java.util.TreeSet;
import java.util.zip.CRC32;
import java.util.zip.DataFormatException;
import java.util.zip.Deflater;
import java.util.zip.Inflater;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The direct grey decoder against the reference, the JDK's ImageIO PNG plug-in: the same samples, kind and detail
 * for files written by ImageIO's writer, by libpng (the fixtures) and by a small encoder here that forces each
 * filter type of ISO/IEC 15948 section 9.2; null (so ImageIO decodes) for every other kind of PNG; InputRejected
 * for damage.
 */
class PngGreyTest {
    private static final int[][] SIZES = {{1, 1}, {1, 29}, {29, 1}, {37, 23}, {640, 480}};

    @TempDir
    Path dir;

    // ---- reference and comparison

    /** What PngReader gave before the direct decoder: the JDK plug-in's image, through ImageIoDecoding.samples. */
    private static RawSamples viaImageIo(Path file, byte[] b) {
        ImageIoDecoding.Decoded d = ImageIoDecoding.decode(file, b, "png", "PNG", ReadContext.defaults(), false);
        return ImageIoDecoding.samples(file, d.image(), 0, PngReader.detail(b));
    }

    private static RawSamples direct(Path file) throws IOException {
        byte[] b = Files.readAllBytes(file);
        PngReader.checkChunks(file, b);
        return PngGrey.decode(file, b, ReadContext.defaults());
    }

    private static void assertSameAsImageIo(Path file) throws IOException {
        RawSamples fast = direct(file);
        assertNotNull(fast, file + " is the simple case");
        RawSamples ref = viaImageIo(file, Files.readAllBytes(file));
        String what = file.getFileName().toString();
        assertEquals(ref.width(), fast.width(), what);
        assertEquals(ref.height(), fast.height(), what);
        assertEquals(ref.kind(), fast.kind(), what);
        assertEquals(ref.bitDepth(), fast.bitDepth(), what);
        assertEquals(ref.maxValue(), fast.maxValue(), what);
        assertEquals(ref.detail(), fast.detail(), what);
        assertArrayEquals(ref.u16(), fast.u16(), what);
        assertArrayEquals(ref.u8(), fast.u8(), what);
        assertNull(fast.values(), what);
    }

    // ---- images

    /** Random (incompressible, every filter about equal) or smooth (a gradient and a warm spot: Sub/Up/Paeth win). */
    private static int[] samples(int w, int h, int depth, boolean smooth, long seed) {
        Random rnd = new Random(seed);
        int max = (1 << depth) - 1;
        int[] v = new int[w * h];
        for (int y = 0; y < h; y++)
            for (int x = 0; x < w; x++) {
                double s = smooth ? 0.3 * max + 0.2 * max * (x + 0.5 * y) / (w + h)
                        + 0.3 * max * Math.exp(-((x - 0.6 * w) * (x - 0.6 * w) + (y - 0.4 * h) * (y - 0.4 * h))
                        / (0.02 * (w * w + h * h) + 1)) + rnd.nextGaussian() * max / 2000.0
                        : rnd.nextInt(max + 1);
                v[y * w + x] = (int) Math.max(0, Math.min(max, Math.round(s)));
            }
        return v;
    }

    private static BufferedImage image(int w, int h, int depth, int[] v) {
        BufferedImage img = new BufferedImage(w, h, depth == 16 ? BufferedImage.TYPE_USHORT_GRAY : BufferedImage.TYPE_BYTE_GRAY);
        if (depth == 16) {
            short[] d = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
            for (int i = 0; i < v.length; i++) d[i] = (short) v[i];
        } else {
            byte[] d = ((DataBufferByte) img.getRaster().getDataBuffer()).getData();
            for (int i = 0; i < v.length; i++) d[i] = (byte) v[i];
        }
        return img;
    }

    private Path imageIoPng(BufferedImage img, String name, boolean interlaced) throws IOException {
        Path f = dir.resolve(name);
        ImageWriter w = ImageIO.getImageWritersByFormatName("png").next();
        try (ImageOutputStream out = ImageIO.createImageOutputStream(f.toFile())) {
            w.setOutput(out);
            ImageWriteParam p = w.getDefaultWriteParam();
            // the JDK writer writes Adam7 when asked for progressive mode
            p.setProgressiveMode(interlaced ? ImageWriteParam.MODE_DEFAULT : ImageWriteParam.MODE_DISABLED);
            w.write(null, new IIOImage(img, null, null), p);
        } finally {
            w.dispose();
        }
        return f;
    }

    // ---- a minimal PNG encoder (ISO/IEC 15948): grey, one forced filter type per row

    /** A chunk: length, type, data, CRC-32 over type and data (section 5.3). */
    private static void chunk(ByteArrayOutputStream out, String type, byte[] data) {
        byte[] t = type.getBytes(StandardCharsets.ISO_8859_1);
        CRC32 crc = new CRC32();
        crc.update(t);
        crc.update(data);
        writeInt(out, data.length);
        out.writeBytes(t);
        out.writeBytes(data);
        writeInt(out, (int) crc.getValue());
    }

    private static void writeInt(ByteArrayOutputStream out, int v) {
        out.write(v >>> 24);
        out.write(v >>> 16);
        out.write(v >>> 8);
        out.write(v);
    }

    /** Scanlines with a filter byte each (section 9.2), filter type filters[y % filters.length] on row y. */
    static byte[] filtered(int w, int h, int depth, int[] v, int... filters) {
        int bpp = depth / 8, n = w * bpp;
        byte[] raw = new byte[n * h];
        for (int i = 0; i < v.length; i++) {
            if (depth == 16) {
                raw[2 * i] = (byte) (v[i] >>> 8); // most significant byte first (section 7.1)
                raw[2 * i + 1] = (byte) v[i];
            } else {
                raw[i] = (byte) v[i];
            }
        }
        byte[] out = new byte[h * (1 + n)];
        for (int y = 0; y < h; y++) {
            int type = filters[y % filters.length];
            out[y * (1 + n)] = (byte) type;
            for (int i = 0; i < n; i++) {
                // section 9.2: a left, b above, c above-left, all original (unfiltered) bytes; 0 outside the image
                int x = raw[y * n + i] & 0xFF;
                int a = i >= bpp ? raw[y * n + i - bpp] & 0xFF : 0;
                int b = y > 0 ? raw[(y - 1) * n + i] & 0xFF : 0;
                int c = y > 0 && i >= bpp ? raw[(y - 1) * n + i - bpp] & 0xFF : 0;
                int predictor = switch (type) {
                    case 0 -> 0;
                    case 1 -> a;
                    case 2 -> b;
                    case 3 -> (a + b) / 2;
                    case 4 -> paeth(a, b, c);
                    default -> throw new IllegalArgumentException("filter type " + type);
                };
                out[y * (1 + n) + 1 + i] = (byte) (x - predictor);
            }
        }
        return out;
    }

    /** Section 9.2, written out as the spec's pseudo-code, independently of PngGrey.paeth. */
    private static int paeth(int a, int b, int c) {
        int p = a + b - c;
        int pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
        if (pa <= pb && pa <= pc) return a;
        else if (pb <= pc) return b;
        else return c;
    }

    static byte[] zlib(byte[] data) {
        Deflater d = new Deflater();
        d.setInput(data);
        d.finish();
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        byte[] buf = new byte[8192];
        while (!d.finished()) out.write(buf, 0, d.deflate(buf));
        d.end();
        return out.toByteArray();
    }

    /** A grey PNG: IHDR, the extra chunks (type, data pairs), the zlib stream cut into idatParts IDAT chunks, IEND. */
    static byte[] png(int w, int h, int depth, int interlace, byte[] zlib, int idatParts, Object... extra) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.writeBytes(new byte[]{(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'});
        ByteArrayOutputStream ihdr = new ByteArrayOutputStream();
        writeInt(ihdr, w);
        writeInt(ihdr, h);
        ihdr.writeBytes(new byte[]{(byte) depth, 0, 0, 0, (byte) interlace}); // grey, deflate, method 0
        chunk(out, "IHDR", ihdr.toByteArray());
        for (int i = 0; i < extra.length; i += 2) chunk(out, (String) extra[i], (byte[]) extra[i + 1]);
        for (int k = 0; k < idatParts; k++)
            chunk(out, "IDAT", Arrays.copyOfRange(zlib, k * zlib.length / idatParts, (k + 1) * zlib.length / idatParts));
        chunk(out, "IEND", new byte[0]);
        return out.toByteArray();
    }

    private Path write(String name, byte[] b) throws IOException {
        return Files.write(dir.resolve(name), b);
    }

    // ---- cross-checks against ImageIO

    /** The filter type byte of each row of a non-interlaced grey PNG, found independently of PngGrey. */
    private static Set<Integer> filterTypes(byte[] b) throws DataFormatException {
        ByteArrayOutputStream z = new ByteArrayOutputStream();
        int w = 0, h = 0, bpp = 0;
        for (int p = 8; p + 12 <= b.length; ) {
            int n = ByteBuffer.wrap(b, p, 4).getInt();
            String type = new String(b, p + 4, 4, StandardCharsets.ISO_8859_1);
            if (type.equals("IHDR")) {
                w = ByteBuffer.wrap(b, p + 8, 4).getInt();
                h = ByteBuffer.wrap(b, p + 12, 4).getInt();
                bpp = b[p + 16] / 8;
            }
            if (type.equals("IDAT")) z.write(b, p + 8, n);
            p += 12 + n;
        }
        Inflater inf = new Inflater();
        inf.setInput(z.toByteArray());
        byte[] rows = new byte[h * (1 + w * bpp)];
        int got = 0;
        while (got < rows.length) got += inf.inflate(rows, got, rows.length - got);
        inf.end();
        Set<Integer> types = new TreeSet<>();
        for (int y = 0; y < h; y++) types.add((int) rows[y * (1 + w * bpp)]);
        return types;
    }

    @Test
    void imageIoWrittenGreyFilesDecodeToTheSamplesImageIoReads() throws Exception {
        Set<Integer> filtersSeen = new TreeSet<>();
        int files = 0;
        for (int depth : new int[]{8, 16})
            for (boolean smooth : new boolean[]{false, true})
                for (int[] s : SIZES) {
                    int[] v = samples(s[0], s[1], depth, smooth, 31L * files + 1);
                    String name = String.format("imageio-%d-%s-%dx%d.png", depth, smooth ? "smooth" : "random", s[0], s[1]);
                    Path f = imageIoPng(image(s[0], s[1], depth, v), name, false);
                    assertSameAsImageIo(f);
                    filtersSeen.addAll(filterTypes(Files.readAllBytes(f)));
                    files++;
                }
        assertEquals(20, files);
        // JDK 17's writer filters only palette images adaptively (RowFilter.filterRow returns type 0 for every
        // other colour type), so these files hold filter type None; the forced-filter files below and the
        // libpng-written fixtures cover the other four
        assertTrue(filtersSeen.contains(0), "filter types in ImageIO's files: " + filtersSeen);
    }

    @Test
    void greyFixturesFromOtherEncodersDecodeToTheSamplesImageIoReads() throws Exception {
        // ImageMagick and netpbm (libpng) files, see fixtures/import/README.md; the colour one falls back
        Set<Integer> filtersSeen = new TreeSet<>();
        int direct = 0;
        for (Path f : FixtureTest.fixtures("")) {
            if (!f.toString().endsWith(".png")) continue;
            if (f.getFileName().toString().startsWith("colour")) {
                assertNull(direct(f), f.toString());
                continue;
            }
            assertSameAsImageIo(f);
            filtersSeen.addAll(filterTypes(Files.readAllBytes(f)));
            direct++;
        }
        assertEquals(3, direct, "grey8-imagemagick, u16-imagemagick, u16-netpbm");
        assertEquals(Set.of(1, 4), filtersSeen, "libpng's adaptive choice: Sub and Paeth");
    }

    @Test
    void everyFilterTypeDecodesToTheSamplesImageIoReads() throws IOException {
        int[][] filterSets = {{0}, {1}, {2}, {3}, {4}, {4, 0, 3, 1, 2}};
        for (int depth : new int[]{8, 16})
            for (int[] s : SIZES)
                for (int[] filters : filterSets) {
                    int w = s[0], h = s[1];
                    int[] v = samples(w, h, depth, w * h % 2 == 0, w * 1000L + h);
                    byte[] b = png(w, h, depth, 0, zlib(filtered(w, h, depth, v, filters)), 1);
                    Path f = write(String.format("filter%s-%d-%dx%d.png", Arrays.toString(filters), depth, w, h), b);
                    assertSameAsImageIo(f);
                    // and the samples are the ones encoded, not merely the same mistake in both decoders
                    RawSamples r = direct(f);
                    int[] got = new int[v.length];
                    for (int i = 0; i < v.length; i++) got[i] = depth == 16 ? r.u16()[i] & 0xFFFF : r.u8()[i] & 0xFF;
                    assertArrayEquals(v, got, f.toString());
                }
    }

    @Test
    void imageDataSplitOverSeveralIdatChunksAndAncillaryChunksAreRead() throws IOException {
        int w = 37, h = 23;
        int[] v = samples(w, h, 16, true, 5);
        byte[] z = zlib(filtered(w, h, 16, v, 4, 1, 2));
        byte[] text = "Software\0risetrace test".getBytes(StandardCharsets.ISO_8859_1);
        byte[] gama = {0, 0, (byte) 0xB1, (byte) 0x8F}; // 45455: gamma 1/2.2
        byte[] sbit = {14};
        Path f = write("split.png", png(w, h, 16, 0, z, 7, "tEXt", text, "gAMA", gama, "sBIT", sbit, "prVt", new byte[3]));
        assertSameAsImageIo(f);
        Path g = write("split-with-empty.png", png(w, h, 16, 0, z, z.length + 3)); // some IDAT chunks are empty
        assertSameAsImageIo(g);
        assertEquals("16-bit grey", direct(g).detail());
    }

    // ---- fallback to ImageIO

    @Test
    void interlacedRgbAndTransparentGreyFallBackToImageIo() throws IOException {
        int w = 37, h = 23;
        int[] v = samples(w, h, 16, true, 9);
        Path interlaced = imageIoPng(image(w, h, 16, v), "interlaced.png", true);
        assertEquals(1, Files.readAllBytes(interlaced)[28], "IHDR interlace method: Adam7");

        BufferedImage rgbImage = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        for (int y = 0; y < h; y++) for (int x = 0; x < w; x++) rgbImage.setRGB(x, y, 0x010101 * ((x + y) & 0xFF));
        Path rgb = imageIoPng(rgbImage, "rgb.png", false);

        int[] v8 = samples(w, h, 8, true, 10);
        byte[] z = zlib(filtered(w, h, 8, v8, 1));
        Path trns = write("trns.png", png(w, h, 8, 0, z, 1, "tRNS", new byte[]{0, (byte) 0xFF}));
        Path palette = write("plte.png", png(w, h, 8, 0, z, 1, "PLTE", new byte[]{1, 2, 3}));

        for (Path f : List.of(interlaced, rgb, trns)) {
            assertNull(direct(f), f.toString());
            // PngReader still decodes it, through ImageIO, exactly as before
            byte[] b = Files.readAllBytes(f);
            RawSamples read = new PngReader().decode(f, b, ReadContext.defaults());
            RawSamples ref = viaImageIo(f, b);
            assertEquals(ref.detail(), read.detail(), f.toString());
            assertArrayEquals(ref.u16(), read.u16(), f.toString());
            assertArrayEquals(ref.u8(), read.u8(), f.toString());
        }
        assertNull(direct(palette), "a PLTE chunk in a grey file is ImageIO's to judge");
    }

    // ---- damage

    private static InputRejected rejected(Path f) {
        return assertThrows(InputRejected.class, () -> direct(f), f.toString());
    }

    private static void assertNamesFileAnd(InputRejected e, Path f, String problem) {
        assertTrue(e.getMessage().contains(f.getFileName().toString()), e.getMessage());
        assertTrue(e.getMessage().contains(problem), e.getMessage());
        // and the same through the public reader
        InputRejected viaReader = assertThrows(InputRejected.class, () -> FrameReaders.read(f, ReadContext.defaults()));
        assertEquals(e.getMessage(), viaReader.getMessage());
    }

    @Test
    void corruptDeflateStreamIsRejected() throws IOException {
        int w = 37, h = 23;
        byte[] z = zlib(filtered(w, h, 16, samples(w, h, 16, true, 3), 2));
        z[2] = (byte) 0xFF; // first deflate block header: BFINAL 1, BTYPE 11, which RFC 1951 section 3.2.3 reserves
        Path f = write("bad-deflate.png", png(w, h, 16, 0, z, 1));
        assertNamesFileAnd(rejected(f), f, "damaged PNG data: invalid block type");
    }

    @Test
    void truncatedImageDataIsRejected() throws IOException {
        int w = 37, h = 23, n = h * (1 + 2 * w);
        byte[] rows = filtered(w, h, 16, samples(w, h, 16, true, 4), 1);
        // a whole zlib stream of too few rows, and a stream cut off in the middle (CRCs still right)
        Path shortStream = write("short-stream.png", png(w, h, 16, 0, zlib(Arrays.copyOf(rows, 1000)), 1));
        assertNamesFileAnd(rejected(shortStream), shortStream,
                "truncated PNG image data: expected " + n + " bytes, got 1000");
        byte[] z = zlib(rows);
        Path cut = write("cut-stream.png", png(w, h, 16, 0, Arrays.copyOf(z, z.length / 2), 1));
        assertNamesFileAnd(rejected(cut), cut, "truncated PNG image data: expected " + n + " bytes, got ");
    }

    @Test
    void unknownFilterTypeIsRejectedWithItsRow() throws IOException {
        int w = 37, h = 23;
        byte[] rows = filtered(w, h, 8, samples(w, h, 8, true, 6), 3);
        rows[12 * (1 + w)] = 7;
        Path f = write("bad-filter.png", png(w, h, 8, 0, zlib(rows), 1));
        assertNamesFileAnd(rejected(f), f, "damaged PNG data: filter type 7 on row 12");
    }

    @Test
    void missingImageDataIsRejected() throws IOException {
        Path f = write("no-idat.png", png(4, 3, 8, 0, new byte[0], 0));
        assertNamesFileAnd(rejected(f), f, "no IDAT chunk");
    }

    @Test
    void pixelLimitIsCheckedBeforeDecoding() throws IOException {
        // the header claims far more rows than the (empty) data holds: the limit speaks first
        Path f = write("huge.png", png(100_000, 100_000, 16, 0, zlib(new byte[10]), 1));
        byte[] b = Files.readAllBytes(f);
        InputRejected e = assertThrows(InputRejected.class, () -> PngGrey.decode(f, b, ReadContext.defaults()));
        assertTrue(e.getMessage().contains("more than the limit"), e.getMessage());
    }

    @Test
    void paethPredictorMatchesTheSpecPseudoCode() {
        // section 9.2: p = a + b - c, nearest of a, b, c to p, ties broken in the order a, b, c; every byte triple
        long wrong = 0;
        String first = "";
        for (int a = 0; a < 256; a++)
            for (int b = 0; b < 256; b++)
                for (int c = 0; c < 256; c++)
                    if (PngGrey.paeth(a, b, c) != paeth(a, b, c) && wrong++ == 0) first = a + "," + b + "," + c;
        assertEquals(0, wrong, "first wrong triple: " + first);
    }
}
