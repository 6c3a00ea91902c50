package org.risetrace.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.awt.image.DataBufferUShort;
import java.awt.image.WritableRaster;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.zip.CRC32;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code risetrace inspect} end to end through {@link Main#run}: output, exit codes (0 ok, 1 input rejected,
 * 2 usage) and one test per kind of bad input, each asserting a one-line message that names the file and the
 * problem.
 */
class InspectCommandTest {
    @TempDir
    Path dir;

    record Result(int code, String out, String err) {
    }

    static Result run(String... args) {
        PrintStream oldOut = System.out, oldErr = System.err;
        ByteArrayOutputStream out = new ByteArrayOutputStream(), err = new ByteArrayOutputStream();
        try {
            System.setOut(new PrintStream(out, true, StandardCharsets.UTF_8));
            System.setErr(new PrintStream(err, true, StandardCharsets.UTF_8));
            int code = Main.run(args);
            System.out.flush();
            System.err.flush();
            return new Result(code, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
        } finally {
            System.setOut(oldOut);
            System.setErr(oldErr);
        }
    }

    /** A 16-bit grey PNG written by the JDK's ImageIO with every count = {@code count}. */
    Path png16(String name, int w, int h, int count) throws IOException {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_USHORT_GRAY);
        Arrays.fill(((DataBufferUShort) img.getRaster().getDataBuffer()).getData(), (short) count);
        Path p = dir.resolve(name);
        ImageIO.write(img, "png", p.toFile());
        return p;
    }

    Path png8(String name, int w, int h, int grey) throws IOException {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_BYTE_GRAY);
        WritableRaster r = img.getRaster();
        for (int y = 0; y < h; y++) for (int x = 0; x < w; x++) r.setSample(x, y, 0, grey);
        Path p = dir.resolve(name);
        ImageIO.write(img, "png", p.toFile());
        return p;
    }

    /** Exit code 1 and exactly one stderr line naming the file and containing the problem. */
    static void assertRejected(Result r, Path file, String... problem) {
        assertEquals(Main.EXIT_INPUT_REJECTED, r.code(), r.err());
        String[] lines = r.err().strip().split("\n");
        assertEquals(1, lines.length, "one line on stderr: " + r.err());
        assertTrue(lines[0].startsWith("risetrace: "), lines[0]);
        if (file != null) assertTrue(lines[0].contains(file.getFileName().toString()), lines[0]);
        for (String p : problem) assertTrue(lines[0].contains(p), "'" + p + "' in: " + lines[0]);
        assertFalse(r.err().contains("\tat "), "no stack trace");
    }

    @Test
    void printsOneRowPerFrameWithTemperatures() throws IOException {
        Path f = png16("a.png", 160, 128, 29815); // 298.15 K = 25 degC (0.01 K per count, 0 degC = 273.15 K, SI)
        Result r = run("inspect", f.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("a.png"), r.out());
        assertTrue(r.out().contains("160x128"), r.out());
        assertTrue(r.out().contains("25.00"), r.out());
        assertTrue(r.out().contains("u16-centikelvin"), r.out());
        assertTrue(r.err().contains("assumed u16-centikelvin"), "default profile is announced: " + r.err());
    }

    @Test
    void jsonModePrintsOnlyOneJsonDocumentOnStdout() throws IOException {
        png16("f1.png", 160, 128, 29815);
        png16("f2.png", 160, 128, 30315); // 303.15 K = 30 degC
        Files.writeString(dir.resolve("series.json"), "{\"frame_interval_s\": 0.5}");
        Files.writeString(dir.resolve("notes.md"), "bench notes");
        Result r = run("inspect", "--json", dir.toString());
        assertEquals(0, r.code(), r.err());
        JsonNode doc = new ObjectMapper().readTree(r.out()); // throws if stdout holds anything but JSON
        JsonNode frames = doc.get("frames");
        assertEquals(2, frames.size());
        JsonNode second = frames.get(1);
        assertTrue(second.get("file").asText().endsWith("f2.png"));
        assertEquals(160, second.get("width").asInt());
        assertEquals(128, second.get("height").asInt());
        assertEquals(16, second.get("bit_depth").asInt());
        assertEquals("png", second.get("container").asText());
        assertEquals("u16-centikelvin", second.get("profile").asText());
        assertEquals(30.0, second.get("min_c").asDouble(), 1e-4);
        assertEquals(30.0, second.get("mean_c").asDouble(), 1e-4);
        assertEquals(30.0, second.get("max_c").asDouble(), 1e-4);
        assertEquals(0.5, second.get("t_s").asDouble(), 1e-12);
        assertEquals(64, second.get("sha256").asText().length());
        String warnings = doc.get("warnings").toString();
        assertTrue(warnings.contains("notes.md"), warnings);
        assertTrue(r.err().contains("notes.md"), "warnings also go to stderr");
    }

    @Test
    void versionAndHelpExitZero() {
        Result v = run("--version");
        assertEquals(0, v.code());
        assertTrue(v.out().contains("risetrace"));
        Result h = run("inspect", "--help");
        assertEquals(0, h.code());
        assertTrue(h.out().contains("--max-pixels") && h.out().contains("--profile") && h.out().contains("--json"));
    }

    @Test
    void usageErrorsExitTwo() {
        assertEquals(Main.EXIT_USAGE, run("inspect").code(), "missing FILE_OR_FOLDER");
        assertEquals(Main.EXIT_USAGE, run("inspect", "--no-such-option", "x.png").code());
        assertEquals(Main.EXIT_USAGE, run("inspect", "--max-pixels", "0", "x.png").code());
    }

    @Test
    void missingFileIsRejected() {
        Path f = dir.resolve("nothing-here.png");
        assertRejected(run("inspect", f.toString()), f, "no such file or folder");
    }

    @Test
    void zeroByteFileIsRejected() throws IOException {
        Path f = Files.write(dir.resolve("empty.png"), new byte[0]);
        assertRejected(run("inspect", f.toString()), f, "empty file");
    }

    @Test
    void truncatedPngIsRejected() throws IOException {
        Path good = png16("whole.png", 160, 128, 29815);
        byte[] b = Files.readAllBytes(good);
        Path f = Files.write(dir.resolve("cut.png"), Arrays.copyOf(b, b.length / 2));
        assertRejected(run("inspect", f.toString()), f, "truncated PNG");
    }

    @Test
    void corruptPngDataIsRejected() throws IOException {
        Path good = png16("whole.png", 160, 128, 29815);
        byte[] b = Files.readAllBytes(good);
        for (int i = 60; i < b.length - 20; i++) b[i] = (byte) (i * 7919);
        Path f = Files.write(dir.resolve("garbled.png"), b);
        assertRejected(run("inspect", f.toString()), f, "damaged PNG");
    }

    @Test
    void oneFlippedBitInPngImageDataIsRejectedByItsCrc() throws IOException {
        Path good = png16("whole.png", 160, 128, 29815);
        byte[] b = Files.readAllBytes(good);
        b[b.length - 30] ^= 0x01; // inside the last IDAT chunk's data (IEND is the last 12 bytes)
        Path f = Files.write(dir.resolve("flipped.png"), b);
        assertRejected(run("inspect", f.toString()), f, "CRC mismatch", "IDAT");
    }

    @Test
    void unknownContainerIsRejected() throws IOException {
        Path f = Files.writeString(dir.resolve("frame.png"), "this is not an image at all");
        assertRejected(run("inspect", f.toString()), f, "not a frame format");
    }

    @Test
    void eightBitFrameUnderSixteenBitProfileIsRejected() throws IOException {
        Path f = png8("grey.png", 160, 128, 100);
        assertRejected(run("inspect", "--profile", "u16-centikelvin", f.toString()), f,
                "8-bit grey levels", "u16-centikelvin");
    }

    @Test
    void sixteenBitFrameUnderSpanProfileIsRejected() throws IOException {
        Path f = png16("counts.png", 160, 128, 29815);
        assertRejected(run("inspect", "--profile", "u8-span", f.toString()), f, "16-bit integer counts", "u8-span");
    }

    @Test
    void eightBitFrameWithoutSpanIsRejectedSayingWhereToPutIt() throws IOException {
        Path f = png8("grey.png", 160, 128, 100);
        Path profile = Files.writeString(dir.resolve("nospan.json"), """
                {"name": "nospan", "encoding": "span", "unit": "C", "netd_k": 0.1, "band_um": [8, 14],
                 "default_emissivity": 0.95}""");
        assertRejected(run("inspect", "--profile", profile.toString(), f.toString()), f,
                "without a temperature span", "span_c", "series.json");
    }

    @Test
    void colourImageIsRejected() throws IOException {
        BufferedImage img = new BufferedImage(160, 128, BufferedImage.TYPE_3BYTE_BGR);
        img.setRGB(10, 10, 0xFF3020);
        Path f = dir.resolve("palette.png");
        ImageIO.write(img, "png", f.toFile());
        assertRejected(run("inspect", f.toString()), f, "colour palette image: export radiometric or greyscale frames");
    }

    @Test
    void mixedResolutionsAreRejectedNamingFrameAndSizes() throws IOException {
        png16("f1.png", 160, 128, 29815);
        Path odd = png16("f2.png", 80, 64, 29815);
        assertRejected(run("inspect", dir.toString()), odd, "80 x 64", "f1.png", "160 x 128");
    }

    @Test
    void temperatureBelowAbsoluteZeroIsRejected() throws IOException {
        Path f = png16("cold.png", 160, 128, 1000);
        // counts in 0.01 degC from -400 degC: count 1000 = -390 degC, below -273.15 degC (SI absolute zero)
        Path profile = Files.writeString(dir.resolve("offset.json"), """
                {"name": "offset", "encoding": "linear", "gain": 0.01, "offset": -400, "unit": "C",
                 "netd_k": 0.05, "band_um": [7.5, 14], "default_emissivity": 0.95}""");
        assertRejected(run("inspect", "--profile", profile.toString(), f.toString()), f,
                "pixel (0, 0)", "-390.00", "below absolute zero");
    }

    @Test
    void temperatureAbove2000CIsRejected() throws IOException {
        Path f = png16("hot.png", 160, 128, 65000); // u16-decikelvin: 6500 K = 6226.85 degC
        assertRejected(run("inspect", "--profile", "u16-decikelvin", f.toString()), f, "6226.85", "above 2000");
    }

    /** A PNG whose IHDR (ISO/IEC 15948 section 11.2.2) claims a size, with valid CRCs and no image data. */
    static byte[] pngHeaderOnly(int w, int h) {
        ByteBuffer ihdr = ByteBuffer.allocate(17);
        ihdr.put("IHDR".getBytes(StandardCharsets.US_ASCII)).putInt(w).putInt(h)
                .put((byte) 16).put((byte) 0).put((byte) 0).put((byte) 0).put((byte) 0);
        CRC32 crc = new CRC32();
        crc.update(ihdr.array());
        ByteBuffer b = ByteBuffer.allocate(8 + 4 + 17 + 4 + 12);
        b.put(new byte[]{(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'});
        b.putInt(13).put(ihdr.array()).putInt((int) crc.getValue());
        CRC32 end = new CRC32();
        end.update("IEND".getBytes(StandardCharsets.US_ASCII));
        b.putInt(0).put("IEND".getBytes(StandardCharsets.US_ASCII)).putInt((int) end.getValue());
        return b.array();
    }

    @Test
    void hugeHeaderIsRejectedBeforeAllocation() throws IOException {
        Path f = Files.write(dir.resolve("huge.png"), pngHeaderOnly(60000, 60000));
        assertRejected(run("inspect", f.toString()), f, "60000 x 60000", "limit");
    }

    @Test
    void pixelLimitIsConfigurable() throws IOException {
        Path f = png16("a.png", 160, 128, 29815); // 20480 pixels
        assertRejected(run("inspect", "--max-pixels", "20000", f.toString()), f, "160 x 128", "20000");
        assertEquals(0, run("inspect", "--max-pixels", "20480", f.toString()).code());
    }

    @Test
    void malformedSidecarNamesLineAndColumn() throws IOException {
        png16("f1.png", 160, 128, 29815);
        Path sidecar = Files.writeString(dir.resolve("series.json"), "{\n  \"frame_interval_s\": 0.5,\n  \"profile\" \"u16-centikelvin\"\n}");
        assertRejected(run("inspect", dir.toString()), sidecar, "malformed JSON", "line 3", "column");
    }

    @Test
    void unknownSidecarFieldIsRejected() throws IOException {
        png16("f1.png", 160, 128, 29815);
        Path sidecar = Files.writeString(dir.resolve("series.json"),
                "{\n  \"profile\": \"u16-centikelvin\",\n  \"frame_intervall_s\": 0.5\n}");
        assertRejected(run("inspect", dir.toString()), sidecar, "unknown field 'frame_intervall_s'", "line 3, column 3");
    }

    @Test
    void unknownProfileNameListsTheKnownOnes() throws IOException {
        Path f = png16("a.png", 160, 128, 29815);
        Result r = run("inspect", "--profile", "u16-millikelvin", f.toString());
        assertRejected(r, null, "unknown calibration profile 'u16-millikelvin'", "u16-centikelvin", "u16-decikelvin",
                "f32-celsius", "u8-span");
    }

    @Test
    void backwardsTimesAreRejectedNamingBothFrames() throws IOException {
        png16("f1.png", 160, 128, 29815);
        png16("f2.png", 160, 128, 29815);
        Path sidecar = Files.writeString(dir.resolve("series.json"),
                "{\"frames\": {\"f1.png\": {\"t_s\": 2.0}, \"f2.png\": {\"t_s\": 1.0}}}");
        assertRejected(run("inspect", dir.toString()), sidecar, "f2.png", "f1.png", "goes back in time");
    }
}
