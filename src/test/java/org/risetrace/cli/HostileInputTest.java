package org.risetrace.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import java.util.zip.CRC32;
import java.util.zip.Deflater;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * One test per defect of the hostile-input review (issue 16, items 3-12), each through {@link Main#run} as a user
 * meets it: a one-line refusal (exit 1) or a warning, never a hang, a stack trace (exit 3) or a silent drop.
 */
class HostileInputTest {
    @TempDir
    Path dir;

    static final Path CAP_SHORT = Path.of("sample-frames", "cap-short");

    static InspectCommandTest.Result run(String... args) {
        return InspectCommandTest.run(args);
    }

    private Path copy(Path from) throws IOException {
        Path to = dir.resolve(from.getFileName().toString());
        Files.createDirectories(to);
        try (Stream<Path> s = Files.list(from)) {
            for (Path p : s.toList()) Files.copy(p, to.resolve(p.getFileName()), StandardCopyOption.REPLACE_EXISTING);
        }
        return to;
    }

    private static void assertRefused(InspectCommandTest.Result r, String... parts) {
        assertEquals(1, r.code(), r.err());
        for (String p : parts) assertTrue(r.err().contains(p), "expected '" + p + "' in: " + r.err());
        assertFalse(r.err().contains("\tat "), "a stack trace: " + r.err());
    }

    private static boolean posix() {
        return !System.getProperty("os.name").toLowerCase().startsWith("windows") && Files.isExecutable(Path.of("/usr/bin/mkfifo"));
    }

    private static void mkfifo(Path p) throws Exception {
        Process pr = new ProcessBuilder("mkfifo", p.toString()).inheritIO().start();
        assertEquals(0, pr.waitFor());
    }

    // --- item 7: a FIFO never hangs the tool ----------------------------------------------------------------------

    @Test
    void aFifoNamedLikeAFrameIsSkippedWithAWarning() throws Exception {
        assumeTrue(posix(), "needs mkfifo");
        Path s = copy(CAP_SHORT);
        mkfifo(s.resolve("f0000.png"));
        InspectCommandTest.Result r = assertTimeoutPreemptively(Duration.ofSeconds(60), () -> run("inspect", s.toString()));
        assertEquals(0, r.code(), r.err());
        assertTrue(r.err().contains("skipped f0000.png: not a regular file"), r.err());
        r = assertTimeoutPreemptively(Duration.ofSeconds(120),
                () -> run("analyze", s.toString(), "--out", dir.resolve("out").toString()));
        assertEquals(0, r.code(), r.err());
    }

    @Test
    void aFifoAsProfileOrFrameArgumentIsRefusedAtOnce() throws Exception {
        assumeTrue(posix(), "needs mkfifo");
        Path fifo = dir.resolve("frame.png");
        mkfifo(fifo);
        InspectCommandTest.Result r = assertTimeoutPreemptively(Duration.ofSeconds(20), () -> run("inspect", fifo.toString()));
        assertRefused(r, "not a regular file");
        Path s = copy(CAP_SHORT);
        Path pf = s.resolve("cam.json");
        mkfifo(pf);
        r = assertTimeoutPreemptively(Duration.ofSeconds(20), () -> run("inspect", s.toString(), "--profile", pf.toString()));
        assertRefused(r, "not a regular file");
        assertFalse(r.err().contains("not found"), r.err());
    }

    // --- item 3: memory from small inputs --------------------------------------------------------------------------

    @Test
    void aDeviceAsSeriesJsonIsRefusedWithoutReadingIt() throws Exception {
        assumeTrue(Files.exists(Path.of("/dev/zero")));
        Path s = copy(CAP_SHORT);
        Files.delete(s.resolve("series.json"));
        Files.createSymbolicLink(s.resolve("series.json"), Path.of("/dev/zero"));
        InspectCommandTest.Result r = assertTimeoutPreemptively(Duration.ofSeconds(20), () -> run("inspect", s.toString()));
        assertRefused(r, "series.json", "not a regular file");
    }

    @Test
    void aSeriesJsonThatIsAFolderIsRefused() throws Exception {
        Path s = copy(CAP_SHORT);
        Files.delete(s.resolve("series.json"));
        Files.createDirectory(s.resolve("series.json"));
        assertRefused(run("inspect", s.toString()), "series.json", "folder");
    }

    @Test
    void anOversizedBoardFileIsRefusedBeforeParsing() throws Exception {
        Path b = dir.resolve("board.json");
        byte[] big = new byte[(16 << 20) + 10];
        Arrays.fill(big, (byte) ' ');
        big[0] = '{';
        big[big.length - 1] = '}';
        Files.write(b, big);
        assertRefused(run("board", "check", b.toString()), "larger than 16 MiB");
    }

    /** A grey 8-bit PNG of w x h zero pixels: a few tens of kilobytes however large the image (ISO/IEC 15948). */
    static byte[] zeroPng(int w, int h) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.write(new byte[]{(byte) 0x89, 'P', 'N', 'G', 13, 10, 26, 10});
        ByteBuffer ihdr = ByteBuffer.allocate(13).putInt(w).putInt(h).put((byte) 8).put((byte) 0).put((byte) 0)
                .put((byte) 0).put((byte) 0);
        chunk(out, "IHDR", ihdr.array());
        Deflater d = new Deflater(9);
        byte[] row = new byte[w + 1];
        ByteArrayOutputStream z = new ByteArrayOutputStream();
        byte[] buf = new byte[1 << 16];
        for (int y = 0; y < h; y++) {
            d.setInput(row);
            while (!d.needsInput()) z.write(buf, 0, d.deflate(buf));
        }
        d.finish();
        while (!d.finished()) z.write(buf, 0, d.deflate(buf));
        d.end();
        chunk(out, "IDAT", z.toByteArray());
        chunk(out, "IEND", new byte[0]);
        return out.toByteArray();
    }

    static void chunk(ByteArrayOutputStream out, String type, byte[] data) throws IOException {
        out.write(ByteBuffer.allocate(4).putInt(data.length).array());
        byte[] t = type.getBytes(StandardCharsets.US_ASCII);
        out.write(t);
        out.write(data);
        CRC32 crc = new CRC32();
        crc.update(t);
        crc.update(data);
        out.write(ByteBuffer.allocate(4).putInt((int) crc.getValue()).array());
    }

    @Test
    void largeFramesBeyondTheHeapAreRefusedNotRunOutOfMemory() throws Exception {
        // five 7000 x 7000 frames (49 M pixels each, under the 50 M per-frame limit), about 50 KB each
        Path s = dir.resolve("huge");
        Files.createDirectories(s);
        byte[] png = zeroPng(7000, 7000);
        assertTrue(png.length < 200_000, "" + png.length);
        for (int i = 1; i <= 5; i++) Files.write(s.resolve("f" + i + ".png"), png);
        Files.writeString(s.resolve("series.json"), "{\"profile\": \"u8-span\", \"span_c\": [20, 40]}");
        Files.writeString(s.resolve("board.json"), "{\"size_mm\": [60, 40], \"outline\": {\"frame\": \"f1.png\","
                + " \"corners_px\": [[100, 100], [6100, 100], [6100, 4100], [100, 4100]]}, \"parts\": ["
                + "{\"ref\": \"Q1\", \"x_mm\": 10, \"y_mm\": 10, \"w_mm\": 4, \"h_mm\": 4}]}");
        long heap = Runtime.getRuntime().maxMemory();
        assumeTrue(heap < 7L << 30, "this test expects a heap under 7 GB (surefire gives 4 GB)");
        InspectCommandTest.Result r = run("analyze", s.toString(), "--out", dir.resolve("out").toString());
        assertRefused(r, "7000 x 7000", "memory", "-Xmx");
    }

    @Test
    void aBoardResolutionBeyondTheRasterLimitIsRefused() throws Exception {
        Path s = copy(CAP_SHORT);
        for (String ppm : List.of("1000", "150")) {
            InspectCommandTest.Result r = run("analyze", s.toString(), "--out", dir.resolve("out").toString(),
                    "--px-per-mm", ppm);
            assertRefused(r, "--px-per-mm", "M pixels");
        }
    }

    @Test
    void aTextMatrixWithAHugeLineIsRefused() throws Exception {
        Path f = dir.resolve("wide.csv");
        StringBuilder sb = new StringBuilder(2_200_000);
        for (int i = 0; i < 1_100_000; i++) sb.append("1,");
        sb.append("1\n");
        Files.writeString(f, sb);
        assertRefused(run("inspect", f.toString()), "line 1 is longer than");
    }

    // --- item 12: misleading messages -----------------------------------------------------------------------------

    @Test
    void aPngTooLargeForOneRasterIsCalledTooLargeNotDamaged() throws Exception {
        // 16-bit, interlaced (decoded by the JDK plug-in), 50000 x 50000: the header alone decides
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.write(new byte[]{(byte) 0x89, 'P', 'N', 'G', 13, 10, 26, 10});
        chunk(out, "IHDR", ByteBuffer.allocate(13).putInt(50_000).putInt(50_000).put((byte) 16).put((byte) 0)
                .put((byte) 0).put((byte) 0).put((byte) 1).array());
        chunk(out, "IDAT", zlib(new byte[1000]));
        chunk(out, "IEND", new byte[0]);
        Path f = Files.write(dir.resolve("big.png"), out.toByteArray());
        InspectCommandTest.Result r = run("inspect", f.toString(), "--max-pixels", "3000000000");
        assertRefused(r, "too large to decode");
        assertFalse(r.err().contains("damaged"), r.err());
    }

    // --- item 4: values that passed validation and then crashed ---------------------------------------------------

    private Path board(String json) throws IOException {
        return Files.writeString(dir.resolve("board.json"), json);
    }

    static final String PARTS = "\"parts\": [{\"ref\": \"Q1\", \"x_mm\": 10, \"y_mm\": 10, \"w_mm\": 4, \"h_mm\": 4}]";

    @Test
    void astronomicalBoardSizesAndCornersAreRefused() throws Exception {
        assertRefused(run("board", "check", board("{\"size_mm\": [1e308, 1e308], \"outline\": {\"frame\": \"f.png\","
                + " \"corners_px\": [[0, 0], [100, 0], [100, 100], [0, 100]]}, " + PARTS + "}").toString()), "size_mm");
        assertRefused(run("board", "check", board("{\"size_mm\": [100000, 70000], \"outline\": {\"frame\": \"f.png\","
                + " \"corners_px\": [[0, 0], [100, 0], [100, 100], [0, 100]]}, " + PARTS + "}").toString()), "size_mm");
        assertRefused(run("board", "check", board("{\"size_mm\": [60, 40], \"outline\": {\"frame\": \"f.png\","
                + " \"corners_px\": [[0, 0], [1e308, 0], [1e308, 1e308], [0, 1e308]]}, " + PARTS + "}").toString()),
                "corners_px[1]");
    }

    @Test
    void aReflectedTemperatureOf900CNeverEndsInAStackTrace() throws Exception {
        Path s = copy(CAP_SHORT);
        String sc = Files.readString(s.resolve("series.json")).replace("\"reflected_c\" : 26.0", "\"reflected_c\" : 900");
        assertNotEquals(Files.readString(s.resolve("series.json")), sc);
        Files.writeString(s.resolve("series.json"), sc);
        InspectCommandTest.Result r = run("analyze", s.toString(), "--out", dir.resolve("out").toString());
        assertRefused(r, "reflected_c");
    }

    // --- item 6 and 10: strict JSON -------------------------------------------------------------------------------

    @Test
    void aDuplicateKeyInABoardFileIsRefusedNamingKeyAndLine() throws Exception {
        Path b = board("{\"size_mm\": [60, 40],\n \"outline\": {\"frame\": \"f.png\", \"corners_px\": [[0, 0], [100, 0],"
                + " [100, 100], [0, 100]]},\n \"parts\": [{\"ref\": \"Q1\", \"x_mm\": 10, \"y_mm\": 10, \"w_mm\": 4,\n"
                + " \"h_mm\": 4, \"x_mm\": 50}]}");
        assertRefused(run("board", "check", b.toString()), "duplicate key 'x_mm'", "line 4");
    }

    @Test
    void aStringWhereANumberBelongsIsRefused() throws Exception {
        Path b = board("{\"size_mm\": [60, 40], \"outline\": {\"frame\": \"f.png\", \"corners_px\": [[0, 0], [100, 0],"
                + " [100, 100], [0, 100]]}, \"parts\": [{\"ref\": \"Q1\", \"x_mm\": \"20\", \"y_mm\": 10, \"w_mm\": 4,"
                + " \"h_mm\": 4}]}");
        assertRefused(run("board", "check", b.toString()), "x_mm", "wrong type");
    }

    @Test
    void aDuplicateKeyInSeriesJsonIsRefused() throws Exception {
        Path s = copy(CAP_SHORT);
        Files.writeString(s.resolve("series.json"), "{\"profile\": \"u8-span\",\n \"frame_interval_s\": 0.5,\n"
                + " \"frame_interval_s\": 5}");
        assertRefused(run("inspect", s.toString()), "duplicate key 'frame_interval_s'", "line 3");
    }

    // --- item 8: profile paths confined to the series folder ------------------------------------------------------

    @Test
    void aProfilePathOutOfTheSeriesFolderIsRefusedWithoutEchoingTheFile() throws Exception {
        Path s = copy(CAP_SHORT);
        Files.writeString(dir.resolve("outside.json"), "{\"name\": \"x\"}");
        for (String path : List.of("../outside.json", dir.resolve("outside.json").toAbsolutePath().toString())) {
            Files.writeString(s.resolve("series.json"), "{\"profile\": " + quote(path) + "}");
            assertRefused(run("inspect", s.toString()), "leads out of the series folder");
        }
        // a file inside that is no profile: the message names the problem, not the file's words
        Files.writeString(s.resolve("notes.json"), "SECRETWORD is not JSON");
        Files.writeString(s.resolve("series.json"), "{\"profile\": \"notes.json\"}");
        InspectCommandTest.Result r = run("inspect", s.toString());
        assertRefused(r, "not a JSON profile");
        assertFalse(r.err().contains("SECRETWORD"), r.err());
    }

    private static String quote(String s) {
        return "\"" + s.replace("\\", "\\\\") + "\"";
    }

    // --- item 9: terminal control characters -----------------------------------------------------------------------

    @Test
    void controlCharactersInADesignatorAreRefusedAndNeverPrinted() throws Exception {
        Path b = board("{\"size_mm\": [60, 40], \"outline\": {\"frame\": \"f.png\", \"corners_px\": [[0, 0], [100, 0],"
                + " [100, 100], [0, 100]]}, \"parts\": [{\"ref\": \"Q\\u001b]0;pwned\\u0007\\u001b[31m1\", \"x_mm\": 10,"
                + " \"y_mm\": 10, \"w_mm\": 4, \"h_mm\": 4}]}");
        InspectCommandTest.Result r = run("board", "check", b.toString());
        assertRefused(r, "control character");
        assertFalse(r.err().contains("\u001b") || r.err().contains("\u0007"), r.err());
        Path csv = Files.writeString(dir.resolve("pnp.csv"), "Designator,X,Y\nQ\u001b[31m1,10,10\n");
        r = run("board", "import-placement", csv.toString(), "--size-mm", "60,40", "--out", dir.resolve("b2.json").toString());
        assertEquals(1, r.code(), r.err());
        assertFalse(r.err().contains("\u001b"), r.err());
    }

    @Test
    void theTerminalWriterReplacesControlCharacters() throws IOException {
        java.io.StringWriter w = new java.io.StringWriter();
        try (TerminalSafeWriter t = new TerminalSafeWriter(w)) {
            t.write("a\u001b[31mb\u0007c\u009bd\te\r\n");
        }
        assertEquals("a\uFFFD[31mb\uFFFDc\uFFFDd\te\r\n", w.toString());
    }

    // --- item 10: dropped without a word ---------------------------------------------------------------------------

    @Test
    void framesLeftOutAndOddSettingsAreReportedOnStderr() throws Exception {
        Path s = copy(CAP_SHORT);
        // a frame of another size, a damaged frame, a negative injection start, outline.frames naming a missing frame
        byte[] small = zeroPng(20, 10);
        Files.write(s.resolve("f0009.png"), small);
        byte[] damaged = Files.readAllBytes(s.resolve("f0010.png"));
        Files.write(s.resolve("f0010.png"), Arrays.copyOf(damaged, damaged.length / 2));
        String sc = Files.readString(s.resolve("series.json")).replace("\"start_s\" : 3.0", "\"start_s\" : -2.0");
        Files.writeString(s.resolve("series.json"), sc);
        String bf = Files.readString(s.resolve("board.json")).replace("\"frame\" : \"f0001.png\",",
                "\"frame\" : \"f0001.png\", \"frames\" : {\"f9999.png\" : [[68, 67], [245.5, 61.5], [248, 186], [73.5, 193.5]]},");
        Files.writeString(s.resolve("board.json"), bf);
        InspectCommandTest.Result r = run("analyze", s.toString(), "--out", dir.resolve("out").toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.err().contains("left out f0009.png") && r.err().contains("20 x 10"), r.err());
        assertTrue(r.err().contains("left out f0010.png"), r.err());
        assertFalse(r.err().contains("cannot read: cannot read"), r.err());
        assertTrue(r.err().contains("injection.start_s (-2.000 s) is before the first frame"), r.err());
        assertTrue(r.err().contains("outline.frames names frame 'f9999.png'"), r.err());
    }

    // --- item 11: option ranges ---------------------------------------------------------------------------------------

    @Test
    void optionsOutOfRangeAreUsageErrors() throws Exception {
        Path s = copy(CAP_SHORT);
        for (String[] bad : List.of(new String[]{"--k-sigma", "Infinity"}, new String[]{"--k-sigma", "NaN"},
                new String[]{"--k-sigma", "0"}, new String[]{"--separation", "-1"}, new String[]{"--rate-window", "Infinity"},
                new String[]{"--px-per-mm", "-3"}, new String[]{"--threads", "0"})) {
            List<String> args = new ArrayList<>(List.of("analyze", s.toString(), "--out", dir.resolve("out").toString()));
            args.addAll(List.of(bad));
            InspectCommandTest.Result r = run(args.toArray(String[]::new));
            assertEquals(2, r.code(), String.join(" ", bad) + ": " + r.err());
            assertTrue(r.err().contains(bad[0]), r.err());
        }
    }

    // --- item 5: corrupt TIFF ------------------------------------------------------------------------------------------

    /**
     * A one-strip little-endian TIFF (TIFF 6.0 section 2 and 8: header, one IFD of 10 entries, then the strip) of
     * w x h samples of {@code bits} bits, with the given compression and strip bytes.
     */
    static byte[] tiff(int w, int h, int bits, int compression, byte[] strip) {
        int entries = 10, ifd = 8, data = ifd + 2 + entries * 12 + 4;
        ByteBuffer b = ByteBuffer.allocate(data + strip.length).order(ByteOrder.LITTLE_ENDIAN);
        b.put((byte) 'I').put((byte) 'I').putShort((short) 42).putInt(ifd);
        b.putShort((short) entries);
        entry(b, 256, 4, w);              // ImageWidth
        entry(b, 257, 4, h);              // ImageLength
        entry(b, 258, 3, bits);           // BitsPerSample
        entry(b, 259, 3, compression);    // Compression
        entry(b, 262, 3, 1);              // PhotometricInterpretation: BlackIsZero
        entry(b, 273, 4, data);           // StripOffsets
        entry(b, 277, 3, 1);              // SamplesPerPixel
        entry(b, 278, 4, h);              // RowsPerStrip
        entry(b, 279, 4, strip.length);   // StripByteCounts
        entry(b, 284, 3, 1);              // PlanarConfiguration
        b.putInt(0);
        b.put(strip);
        return b.array();
    }

    private static void entry(ByteBuffer b, int tag, int type, int value) {
        b.putShort((short) tag).putShort((short) type).putInt(1);
        if (type == 3) b.putShort((short) value).putShort((short) 0);
        else b.putInt(value);
    }

    /** Counts 30000 (26.85 C in centikelvin) little-endian, 16-bit, w x rows. */
    static byte[] counts(int w, int rows) {
        ByteBuffer b = ByteBuffer.allocate(w * rows * 2).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < w * rows; i++) b.putShort((short) 30000);
        return b.array();
    }

    static byte[] zlib(byte[] raw) {
        Deflater d = new Deflater();
        d.setInput(raw);
        d.finish();
        byte[] out = new byte[raw.length + 1024];
        int n = d.deflate(out);
        d.end();
        return Arrays.copyOf(out, n);
    }

    /** PackBits (TIFF 6.0 section 9) as literal runs of at most 128 bytes. */
    static byte[] packBits(byte[] raw) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        for (int p = 0; p < raw.length; p += 128) {
            int n = Math.min(128, raw.length - p);
            out.write(n - 1);
            out.write(raw, p, n);
        }
        return out.toByteArray();
    }

    @Test
    void wholeCompressedStripsAreRead() throws Exception {
        // the control: the same writer with whole strips gives a frame
        for (byte[] t : List.of(tiff(32, 16, 16, 8, zlib(counts(32, 16))), tiff(32, 16, 16, 32773, packBits(counts(32, 16))))) {
            Path f = Files.write(dir.resolve("whole.tif"), t);
            InspectCommandTest.Result r = run("inspect", f.toString());
            assertEquals(0, r.code(), r.err());
        }
    }

    @Test
    void aCompressedStripHoldingPartOfItsDataIsRefused() throws Exception {
        // a quarter and a half of the rows, each a complete, valid stream
        for (int rows : new int[]{4, 8}) {
            Path f = Files.write(dir.resolve("deflate.tif"), tiff(32, 16, 16, 8, zlib(counts(32, rows))));
            assertRefused(run("inspect", f.toString()), "damaged TIFF", "strip 0");
            f = Files.write(dir.resolve("packbits.tif"), tiff(32, 16, 16, 32773, packBits(counts(32, rows))));
            assertRefused(run("inspect", f.toString()), "damaged TIFF", "strip 0");
        }
    }

    @Test
    void twelveBitTiffIsRefusedClearly() throws Exception {
        Path f = Files.write(dir.resolve("twelve.tif"), tiff(32, 16, 12, 1, new byte[32 * 16 * 3 / 2]));
        assertRefused(run("inspect", f.toString()), "12 bits per sample");
    }
}
