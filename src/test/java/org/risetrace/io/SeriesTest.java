package org.risetrace.io;

import org.apache.commons.imaging.formats.jpeg.exif.ExifRewriter;
import org.apache.commons.imaging.formats.tiff.constants.ExifTagConstants;
import org.apache.commons.imaging.formats.tiff.constants.TiffDirectoryType;
import org.apache.commons.imaging.formats.tiff.taginfos.TagInfoAscii;
import org.apache.commons.imaging.formats.tiff.write.TiffOutputDirectory;
import org.apache.commons.imaging.formats.tiff.write.TiffOutputSet;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageTypeSpecifier;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.metadata.IIOMetadata;
import javax.imageio.plugins.tiff.BaselineTIFFTagSet;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFField;
import javax.imageio.plugins.tiff.TIFFTag;
import javax.imageio.stream.ImageOutputStream;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.lang.ref.WeakReference;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Series discovery, ordering, times, sidecar, profile choice and streaming. */
class SeriesTest {
    @TempDir
    Path dir;

    /** A 16-bit P5 PGM (netpbm: maxval 65535, two bytes per sample, most significant first), all samples = count. */
    Path pgm16(String name, int w, int h, int count) throws IOException {
        byte[] head = ("P5\n" + w + " " + h + "\n65535\n").getBytes();
        byte[] b = new byte[head.length + 2 * w * h];
        System.arraycopy(head, 0, b, 0, head.length);
        for (int i = head.length; i < b.length; i += 2) {
            b[i] = (byte) (count >> 8);
            b[i + 1] = (byte) count;
        }
        return Files.write(dir.resolve(name), b);
    }

    @Test
    void framesComeInNaturalFileNameOrderWithTheSidecarInterval() throws IOException {
        pgm16("f10.pgm", 4, 3, 27315);
        pgm16("f2.pgm", 4, 3, 27315);
        pgm16("f1.pgm", 4, 3, 27315);
        Files.writeString(dir.resolve("series.json"), "{\"frame_interval_s\": 0.5, \"profile\": \"u16-centikelvin\"}");
        Series s = Series.open(dir);
        assertEquals(List.of("f1.pgm", "f2.pgm", "f10.pgm"), List.of(s.fileName(0), s.fileName(1), s.fileName(2)));
        assertEquals(1.0, s.tSeconds(2), 1e-12);
        assertEquals(1.0, s.read(2).tSeconds(), 1e-12);
        assertEquals("file-name order", s.timeSource());
        assertTrue(s.warnings().isEmpty(), s.warnings().toString());
    }

    @Test
    void sidecarTimesWinAndFramesCarryThem() throws IOException {
        pgm16("a.pgm", 4, 3, 27315);
        pgm16("b.pgm", 4, 3, 27315);
        Files.writeString(dir.resolve("series.json"), """
                {"frame_interval_s": 9, "frames": {"a.pgm": {"t_s": 3.0}, "b.pgm": {"t_s": 4.25}},
                 "injection": {"start_s": 3.5, "from_rail": "VCORE", "to_rail": "GND", "volts": 0.9,
                               "current_limit_a": 2.0, "supply": "bench supply", "notes": "probe on TP4"}}""");
        Series s = Series.open(dir);
        assertEquals(3.0, s.read(0).tSeconds(), 1e-12);
        assertEquals(4.25, s.read(1).tSeconds(), 1e-12);
        assertEquals("VCORE", s.sidecar().injection().fromRail());
        assertEquals(2.0, s.sidecar().injection().currentLimitA(), 0);
    }

    @Test
    void repeatedTimesAreRejectedNamingBothFrames() throws IOException {
        pgm16("a.pgm", 4, 3, 27315);
        pgm16("b.pgm", 4, 3, 27315);
        Files.writeString(dir.resolve("series.json"), "{\"frames\": {\"a.pgm\": {\"t_s\": 1}, \"b.pgm\": {\"t_s\": 1}}}");
        InputRejected e = assertThrows(InputRejected.class, () -> Series.open(dir));
        assertTrue(e.getMessage().contains("b.pgm") && e.getMessage().contains("a.pgm")
                && e.getMessage().contains("repeats"), e.getMessage());
    }

    @Test
    void partialSidecarTimesAreRejected() throws IOException {
        pgm16("a.pgm", 4, 3, 27315);
        pgm16("b.pgm", 4, 3, 27315);
        Files.writeString(dir.resolve("series.json"), "{\"frames\": {\"a.pgm\": {\"t_s\": 1}}}");
        InputRejected e = assertThrows(InputRejected.class, () -> Series.open(dir));
        assertTrue(e.getMessage().contains("b.pgm has no t_s"), e.getMessage());
    }

    @Test
    void nonFramesAreSkippedAndOnlyNonJsonOnesWarned() throws IOException {
        pgm16("a.pgm", 4, 3, 27315);
        Files.writeString(dir.resolve("board.json"), "{}");
        Files.writeString(dir.resolve("truth.json"), "{}");
        Files.writeString(dir.resolve("README.md"), "notes");
        Series s = Series.open(dir, "u16-centikelvin", ReadContext.DEFAULT_MAX_PIXELS);
        assertEquals(1, s.size());
        assertEquals(1, s.warnings().size(), s.warnings().toString());
        assertTrue(s.warnings().get(0).contains("README.md"));
    }

    @Test
    void defaultProfileFollowsTheSamplesAndIsAnnounced() throws IOException {
        pgm16("a.pgm", 4, 3, 29815);
        Series s = Series.open(dir);
        assertEquals("u16-centikelvin", s.profile().name());
        assertTrue(s.warnings().stream().anyMatch(w -> w.contains("assumed u16-centikelvin")), s.warnings().toString());
        // 29815 counts * 0.01 K = 298.15 K = 25 degC (0 degC = 273.15 K, SI)
        assertEquals(25.0, s.read(0).at(1, 1), 1e-4);

        Path grey = Files.createDirectory(dir.resolve("grey"));
        ImageIO.write(TestImages.byteGrey(8, 6), "png", grey.resolve("g.png").toFile());
        Series g = Series.open(grey);
        assertEquals("u8-span", g.profile().name());
    }

    @Test
    void aFrameWithoutItsOwnSpanAmongFramesWithOneIsRefused() throws IOException {
        // an auto-ranging camera changes its span frame by frame (common practice): a frame without its own span
        // among frames with one was read on the profile's placeholder span, silently (20.2 degC among 22.9 degC)
        BufferedImage img = new BufferedImage(4, 3, BufferedImage.TYPE_BYTE_GRAY);
        ImageIO.write(img, "png", dir.resolve("a.png").toFile());
        ImageIO.write(img, "png", dir.resolve("b.png").toFile());
        Files.writeString(dir.resolve("series.json"), """
                {"profile": "u8-span", "frames": {"b.png": {"span_c": [25, 60]}}}""");
        InputRejected e = assertThrows(InputRejected.class, () -> Series.open(dir));
        assertTrue(e.getMessage().contains("series.json") && e.getMessage().contains("frame a.png has no span_c while 1"
                + " other frames have one"), e.getMessage());
        // with no span anywhere but the profile's, the series opens and says which span it assumed
        Files.writeString(dir.resolve("series.json"), "{\"profile\": \"u8-span\"}");
        Series s = Series.open(dir);
        assertTrue(s.warnings().stream().anyMatch(w -> w.contains("profile u8-span's span 20.00 to 40.00")),
                s.warnings().toString());
    }

    @Test
    void perFrameSpanOverridesTheSeriesSpan() throws IOException {
        BufferedImage img = new BufferedImage(4, 3, BufferedImage.TYPE_BYTE_GRAY);
        img.getRaster().setSample(0, 0, 0, 255);
        ImageIO.write(img, "png", dir.resolve("a.png").toFile());
        ImageIO.write(img, "png", dir.resolve("b.png").toFile());
        Files.writeString(dir.resolve("series.json"), """
                {"profile": "u8-span", "span_c": [20, 30], "frames": {"b.png": {"span_c": [25, 60]}}}""");
        Series s = Series.open(dir);
        assertEquals(30.0, s.read(0).at(0, 0), 1e-5); // grey 255 = high end of the span, by definition
        assertEquals(20.0, s.read(0).at(1, 0), 1e-5);
        assertEquals(60.0, s.read(1).at(0, 0), 1e-5);
        assertEquals(25.0, s.read(1).at(1, 0), 1e-5);
    }

    @Test
    void sidecarProfilePathIsRelativeToTheSeriesFolder() throws IOException {
        pgm16("a.pgm", 4, 3, 2500);
        Files.writeString(dir.resolve("cam.json"), """
                {"name": "cam", "encoding": "linear", "gain": 0.01, "offset": 0, "unit": "C",
                 "netd_k": 0.04, "band_um": [8, 14], "default_emissivity": 0.95}""");
        Files.writeString(dir.resolve("series.json"), "{\"profile\": \"cam.json\"}");
        Series s = Series.open(dir);
        assertEquals("cam", s.profile().name());
        assertEquals(25.0, s.read(0).at(0, 0), 1e-4);
    }

    /** DateTimeOriginal with optional SubSecTimeOriginal and OffsetTimeOriginal (CIPA DC-008 tags 0x9003, 0x9291, 0x9011). */
    static TiffOutputSet exifTimes(String dateTimeOriginal, String subSec, String offset) throws Exception {
        TiffOutputSet set = new TiffOutputSet();
        TiffOutputDirectory exif = set.getOrCreateExifDirectory();
        exif.add(ExifTagConstants.EXIF_TAG_DATE_TIME_ORIGINAL, dateTimeOriginal);
        if (subSec != null) exif.add(ExifTagConstants.EXIF_TAG_SUB_SEC_TIME_ORIGINAL, subSec);
        if (offset != null)
            exif.add(new TagInfoAscii("OffsetTimeOriginal", 0x9011, 7, TiffDirectoryType.EXIF_DIRECTORY_EXIF_IFD), offset);
        return set;
    }

    /** A JPEG written by ImageIO, then given EXIF tags by Commons Imaging's ExifRewriter. */
    Path jpegWithExif(String name, String dateTimeOriginal, String subSec, String offset) throws Exception {
        ByteArrayOutputStream jpeg = new ByteArrayOutputStream();
        ImageIO.write(TestImages.byteGrey(16, 12), "jpeg", jpeg);
        TiffOutputSet set = exifTimes(dateTimeOriginal, subSec, offset);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        new ExifRewriter().updateExifMetadataLossless(jpeg.toByteArray(), out, set);
        return Files.write(dir.resolve(name), out.toByteArray());
    }

    @Test
    void exifDateTimeOriginalWithSubSecondsGivesTheTimes() throws Exception {
        // CIPA DC-008 (EXIF 2.32): DateTimeOriginal "YYYY:MM:DD HH:MM:SS", SubSecTimeOriginal = fraction digits,
        // OffsetTimeOriginal "+HH:MM" from UTC
        jpegWithExif("c1.jpg", "2026:11:30 14:05:07", "25", "+02:00");
        jpegWithExif("c2.jpg", "2026:11:30 14:05:07", "75", "+02:00");
        jpegWithExif("c3.jpg", "2026:11:30 14:05:08", "5", "+02:00");
        Files.writeString(dir.resolve("series.json"), "{\"span_c\": [20, 40]}");
        Series s = Series.open(dir);
        assertEquals("EXIF DateTimeOriginal", s.timeSource());
        assertEquals(0.0, s.tSeconds(0), 1e-9);
        assertEquals(0.5, s.tSeconds(1), 1e-9);
        assertEquals(1.25, s.tSeconds(2), 1e-9);
        assertEquals(Instant.parse("2026-11-30T12:05:07.25Z"), s.instant(0));
        assertEquals(Instant.parse("2026-11-30T12:05:08.5Z"), s.read(2).instant());
    }

    /**
     * An 8-bit grey PNG written by ImageIO with an eXIf chunk inserted after IHDR (PNG extensions 1.5.0 / PNG third
     * edition: the chunk's data is an EXIF block in TIFF layout; CRC-32 over type and data, ISO/IEC 15948 5.3).
     * The EXIF block is written by Commons Imaging's TIFF writer, as for a JPEG's APP1 segment.
     */
    Path pngWithExif(String name, String dateTimeOriginal, String subSec, String offset) throws Exception {
        ByteArrayOutputStream png = new ByteArrayOutputStream();
        ImageIO.write(TestImages.byteGrey(16, 12), "png", png);
        TiffOutputSet set = exifTimes(dateTimeOriginal, subSec, offset);
        ByteArrayOutputStream block = new ByteArrayOutputStream();
        new org.apache.commons.imaging.formats.tiff.write.TiffImageWriterLossy().write(block, set);
        byte[] data = block.toByteArray(), p = png.toByteArray();
        ByteArrayOutputStream chunk = new ByteArrayOutputStream();
        java.io.DataOutputStream c = new java.io.DataOutputStream(chunk);
        c.writeInt(data.length);
        byte[] typeAndData = new byte[4 + data.length];
        System.arraycopy("eXIf".getBytes(java.nio.charset.StandardCharsets.US_ASCII), 0, typeAndData, 0, 4);
        System.arraycopy(data, 0, typeAndData, 4, data.length);
        c.write(typeAndData);
        java.util.zip.CRC32 crc = new java.util.zip.CRC32();
        crc.update(typeAndData);
        c.writeInt((int) crc.getValue());
        int afterIhdr = 8 + 8 + 13 + 4; // signature, IHDR length + type, 13 data bytes, CRC
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.write(p, 0, afterIhdr);
        out.write(chunk.toByteArray());
        out.write(p, afterIhdr, p.length - afterIhdr);
        return Files.write(dir.resolve(name), out.toByteArray());
    }

    @Test
    void pngExifDateTimeOriginalGivesTheTimesAndThePixelsStillDecode() throws Exception {
        // CIPA DC-008 (EXIF 2.32) tags as in the JPEG test above, carried in a PNG eXIf chunk
        pngWithExif("p1.png", "2026:11:30 14:05:07", "25", "+02:00");
        pngWithExif("p2.png", "2026:11:30 14:05:07", "75", "+02:00");
        pngWithExif("p3.png", "2026:11:30 14:05:09", null, "+02:00");
        Files.writeString(dir.resolve("series.json"), "{\"span_c\": [20, 40]}");
        Series s = Series.open(dir);
        assertEquals("EXIF DateTimeOriginal", s.timeSource());
        assertEquals(0.0, s.tSeconds(0), 1e-9);
        assertEquals(0.5, s.tSeconds(1), 1e-9);
        assertEquals(1.75, s.tSeconds(2), 1e-9);
        assertEquals(Instant.parse("2026-11-30T12:05:07.25Z"), s.instant(0));
        // the chunk is ancillary (lower-case first letter, ISO/IEC 15948 5.4): both decoders skip it
        BufferedImage ref = TestImages.byteGrey(16, 12);
        Frame f = s.read(1);
        for (int i = 0; i < 16 * 12; i++)
            assertEquals(20 + 20.0 * ref.getRaster().getSample(i % 16, i / 16, 0) / 255, f.celsius()[i], 1e-4);
    }

    @Test
    void exifTimesThatGoBackwardsAreRejected() throws Exception {
        jpegWithExif("c1.jpg", "2026:11:30 14:05:09", null, null);
        jpegWithExif("c2.jpg", "2026:11:30 14:05:08", null, null);
        InputRejected e = assertThrows(InputRejected.class, () -> Series.open(dir));
        assertTrue(e.getMessage().contains("c2.jpg") && e.getMessage().contains("c1.jpg")
                && e.getMessage().contains("goes back in time"), e.getMessage());
    }

    /** A 16-bit TIFF written by the JDK's writer with TIFF 6.0 DateTime (tag 306, ASCII "YYYY:MM:DD HH:MM:SS"). */
    Path tiffWithDateTime(String name, String dateTime) throws IOException {
        BufferedImage img = TestImages.ushortGrey(8, 6);
        ImageWriter w = ImageIO.getImageWritersByFormatName("tiff").next();
        ImageWriteParam p = w.getDefaultWriteParam();
        IIOMetadata md = w.getDefaultImageMetadata(new ImageTypeSpecifier(img), p);
        TIFFDirectory d = TIFFDirectory.createFromMetadata(md);
        TIFFTag tag = BaselineTIFFTagSet.getInstance().getTag(BaselineTIFFTagSet.TAG_DATE_TIME);
        d.addTIFFField(new TIFFField(tag, TIFFTag.TIFF_ASCII, 1, new String[]{dateTime}));
        Path file = dir.resolve(name);
        try (ImageOutputStream out = ImageIO.createImageOutputStream(file.toFile())) {
            w.setOutput(out);
            w.write(null, new IIOImage(img, null, d.getAsMetadata()), p);
        } finally {
            w.dispose();
        }
        return file;
    }

    @Test
    void tiffDateTimeGivesTheTimes() throws IOException {
        tiffWithDateTime("t1.tif", "2026:11:30 23:59:59");
        tiffWithDateTime("t2.tif", "2026:12:01 00:00:01");
        Series s = Series.open(dir);
        assertEquals("TIFF DateTime", s.timeSource());
        assertEquals(2.0, s.tSeconds(1), 1e-9);
        assertEquals(Instant.parse("2026-11-30T23:59:59Z"), s.instant(0)); // no offset tag: taken as UTC
    }

    @Test
    void repeatedWholeSecondTimesFallBackToTheSidecarIntervalWithAWarning() throws IOException {
        tiffWithDateTime("t1.tif", "2026:11:30 10:00:00");
        tiffWithDateTime("t2.tif", "2026:11:30 10:00:00");
        assertThrows(InputRejected.class, () -> Series.open(dir));
        Files.writeString(dir.resolve("series.json"), "{\"frame_interval_s\": 0.111}");
        Series s = Series.open(dir);
        assertEquals(0.111, s.tSeconds(1), 1e-12);
        assertNull(s.instant(1));
        assertTrue(s.warnings().stream().anyMatch(w -> w.contains("do not rise")), s.warnings().toString());
    }

    @Test
    void readingFromTwoThreadsGivesTheSameFrames() throws Exception {
        for (int i = 0; i < 20; i++) pgm16("f" + i + ".pgm", 16, 12, 27315 + 10 * i);
        Series s = Series.open(dir, "u16-centikelvin", ReadContext.DEFAULT_MAX_PIXELS);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            List<Future<Frame>> futures = new ArrayList<>();
            for (int i = 0; i < s.size(); i++) {
                int k = i;
                futures.add(pool.submit(() -> s.read(k)));
            }
            for (int i = 0; i < s.size(); i++) {
                Frame f = futures.get(i).get();
                assertEquals(s.fileName(i), f.fileName());
                assertEquals(0.1 * i, f.at(3, 3), 1e-4); // 10 counts = 0.1 K per frame
                assertArrayEquals(s.read(i).celsius(), f.celsius());
            }
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void iteratingALongSeriesDoesNotRetainFrames() throws IOException {
        int n = 2000;
        for (int i = 0; i < n; i++) pgm16(String.format("frame%04d.pgm", i), 32, 24, 27315 + i);
        Series s = Series.open(dir, "u16-centikelvin", ReadContext.DEFAULT_MAX_PIXELS);
        List<WeakReference<float[]>> seen = new ArrayList<>();
        Iterator<Frame> it = s.iterator();
        int count = 0;
        while (it.hasNext()) {
            Frame f = it.next();
            assertEquals((27315 + count) * 0.01 - 273.15, f.at(0, 0), 1e-4);
            seen.add(new WeakReference<>(f.celsius()));
            count++;
        }
        assertEquals(n, count);
        // the series and its iterator are still reachable; frames they retained would survive collection
        long alive = n;
        for (int attempt = 0; attempt < 20 && alive > 1; attempt++) {
            System.gc();
            alive = seen.stream().filter(r -> r.get() != null).count();
        }
        assertTrue(alive <= 1, alive + " of " + n + " frames still reachable after iteration");
        assertTrue(s.size() == n && !it.hasNext());
    }
}
