package org.risetrace.io.write;

import org.apache.commons.imaging.FormatCompliance;
import org.apache.commons.imaging.bytesource.ByteSource;
import org.apache.commons.imaging.formats.tiff.AbstractTiffRasterData;
import org.apache.commons.imaging.formats.tiff.TiffContents;
import org.apache.commons.imaging.formats.tiff.TiffDirectory;
import org.apache.commons.imaging.formats.tiff.TiffImagingParameters;
import org.apache.commons.imaging.formats.tiff.TiffReader;
import org.apache.commons.imaging.formats.tiff.constants.TiffTagConstants;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.awt.image.Raster;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** Quantisation round trips: write with our writers, read back with independent decoders. */
class FrameWritersTest {
    @TempDir
    Path dir;

    private static float[] raster(int w, int h) {
        SplittableRandom rnd = new SplittableRandom(7);
        float[] t = new float[w * h];
        for (int i = 0; i < t.length; i++) t[i] = (float) (18 + 30 * rnd.nextDouble());
        return t;
    }

    @Test
    void centikelvinPngRoundTripsWithinHalfACount() throws IOException {
        int w = 37, h = 21;
        float[] t = raster(w, h);
        Path f = dir.resolve("a.png");
        FrameWriters.write(f, FrameEncoding.U16_CENTIKELVIN_PNG, w, h, t, null);
        BufferedImage img = ImageIO.read(f.toFile()); // the JDK's PNG decoder (PNG spec, 16-bit greyscale, colour type 0)
        Raster r = img.getRaster();
        assertEquals(16, img.getColorModel().getComponentSize(0));
        for (int y = 0; y < h; y++)
            for (int x = 0; x < w; x++) {
                // 0.01 K per count, 27315 counts = 0 degC (common practice of radiometric exports)
                double c = r.getSample(x, y, 0) * 0.01 - 273.15;
                assertEquals(t[y * w + x], c, 0.005 + 1e-6);
            }
    }

    @Test
    void centikelvinTiffRoundTripsWithinHalfACount() throws IOException {
        int w = 16, h = 9;
        float[] t = raster(w, h);
        Path f = dir.resolve("a.tif");
        FrameWriters.write(f, FrameEncoding.U16_CENTIKELVIN_TIFF, w, h, t, null);
        Raster r = ImageIO.read(f.toFile()).getRaster();
        for (int i = 0; i < t.length; i++)
            assertEquals(t[i], r.getSample(i % w, i / w, 0) * 0.01 - 273.15, 0.005 + 1e-6);
    }

    @Test
    void floatTiffHoldsTheExactSamplesAsIeeeFloat() throws IOException {
        int w = 12, h = 7;
        float[] t = raster(w, h);
        Path f = dir.resolve("b.tif");
        FrameWriters.write(f, FrameEncoding.F32_TIFF, w, h, t, null);
        // Apache Commons Imaging's TIFF reader as the independent decoder
        TiffContents contents = new TiffReader(true).readDirectories(ByteSource.file(f.toFile()), true,
                FormatCompliance.getDefault());
        TiffDirectory d = contents.directories.get(0);
        // TIFF 6.0 section 19: SampleFormat 3 = IEEE floating point, BitsPerSample 32
        assertEquals(3, ((Number) d.getFieldValue(TiffTagConstants.TIFF_TAG_SAMPLE_FORMAT, true)[0]).intValue());
        assertEquals(32, ((Number) d.getFieldValue(TiffTagConstants.TIFF_TAG_BITS_PER_SAMPLE, true)[0]).intValue());
        AbstractTiffRasterData data = d.getRasterData(new TiffImagingParameters());
        for (int i = 0; i < t.length; i++) assertEquals(t[i], data.getData()[i], 0.0);
    }

    @Test
    void spanPngRoundTripsWithinHalfAGreyLevel() throws IOException {
        int w = 20, h = 10;
        float[] t = raster(w, h);
        double lo = 20, hi = 45;
        Path f = dir.resolve("c.png");
        FrameWriters.write(f, FrameEncoding.U8_SPAN_PNG, w, h, t, new double[]{lo, hi});
        BufferedImage img = ImageIO.read(f.toFile());
        assertEquals(8, img.getColorModel().getComponentSize(0));
        double step = (hi - lo) / 255;
        for (int i = 0; i < t.length; i++) {
            double c = lo + img.getRaster().getSample(i % w, i / w, 0) * step;
            double expected = Math.max(lo, Math.min(hi, t[i]));
            assertEquals(expected, c, step / 2 + 1e-6);
        }
        BufferedImage g8 = FrameWriters.grey8(w, h, new byte[w * h]);
        assertEquals(w, g8.getWidth());
        assertEquals(h, g8.getHeight());
        assertEquals(BufferedImage.TYPE_BYTE_GRAY, g8.getType());
        Files.deleteIfExists(f);
    }

    @Test
    void exifTimeIsReadBackByTheImportStageAndPixelsStayIntact() throws IOException {
        int w = 12, h = 7;
        float[] t = raster(w, h);
        Path f = dir.resolve("e.tif");
        FrameWriters.write(f, FrameEncoding.F32_TIFF, w, h, t, null);
        java.time.Instant when = java.time.Instant.parse("2026-11-30T14:05:30.250Z");
        FrameWriters.addExifTime(f, when);
        // the tags as an independent reader (Apache Commons Imaging) finds them: EXIF's "YYYY:MM:DD HH:MM:SS" form
        // and the milliseconds as SubSecTimeOriginal (CIPA DC-008, Exif 2.3, DateTimeOriginal and SubSecTimeOriginal)
        org.apache.commons.imaging.formats.tiff.TiffImageMetadata md =
                (org.apache.commons.imaging.formats.tiff.TiffImageMetadata) org.apache.commons.imaging.Imaging.getMetadata(f.toFile());
        assertEquals("2026:11:30 14:05:30", md.findField(
                org.apache.commons.imaging.formats.tiff.constants.ExifTagConstants.EXIF_TAG_DATE_TIME_ORIGINAL, true)
                .getStringValue().trim());
        assertEquals("250", md.findField(
                org.apache.commons.imaging.formats.tiff.constants.ExifTagConstants.EXIF_TAG_SUB_SEC_TIME_ORIGINAL, true)
                .getStringValue().trim());
        // the import stage's EXIF reader (DateTimeOriginal + SubSecTimeOriginal, CIPA DC-008)
        org.risetrace.io.CaptureTimes.CaptureTime ct = org.risetrace.io.CaptureTimes.read(f);
        assertEquals(when, ct.instant());
        assertEquals("EXIF DateTimeOriginal", ct.tag());
        Raster r = ImageIO.read(f.toFile()).getRaster();
        for (int i = 0; i < t.length; i++) assertEquals(t[i], r.getSampleFloat(i % w, i / w, 0), 0.0);
    }
}
