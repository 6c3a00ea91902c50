package org.risetrace.io.write;

import org.risetrace.calibration.Profile;

import org.apache.commons.imaging.ImagingException;
import org.apache.commons.imaging.Imaging;
import org.apache.commons.imaging.common.ImageMetadata;
import org.apache.commons.imaging.formats.tiff.TiffImageMetadata;
import org.apache.commons.imaging.formats.tiff.constants.ExifTagConstants;
import org.apache.commons.imaging.formats.tiff.write.TiffImageWriterLossless;
import org.apache.commons.imaging.formats.tiff.write.TiffOutputDirectory;
import org.apache.commons.imaging.formats.tiff.write.TiffOutputSet;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import java.awt.Transparency;
import java.awt.color.ColorSpace;
import java.awt.image.BufferedImage;
import java.awt.image.ColorModel;
import java.awt.image.ComponentColorModel;
import java.awt.image.DataBuffer;
import java.awt.image.DataBufferByte;
import java.awt.image.DataBufferFloat;
import java.awt.image.DataBufferUShort;
import java.awt.image.PixelInterleavedSampleModel;
import java.awt.image.Raster;
import java.awt.image.SampleModel;
import java.awt.image.WritableRaster;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.Iterator;
import java.util.Locale;

/**
 * Writes temperature rasters (degrees Celsius, row-major) in the supported encodings through the JDK's ImageIO
 * PNG and TIFF plugins (single grey channel; TIFF uncompressed, one strip per image; float TIFF with
 * SampleFormat = 3 IEEE floating point, TIFF 6.0 section 19). Output bytes depend only on the input samples.
 */
public final class FrameWriters {
    private FrameWriters() {
    }

    /** Centikelvin count for a temperature, rounded to nearest and clamped to 0..65535. */
    public static int centikelvin(double celsius) {
        long c = Math.round((celsius + Profile.KELVIN_AT_ZERO_CELSIUS) * 100.0);
        return (int) Math.max(0, Math.min(65535, c));
    }

    /** 8-bit grey level of a temperature over the span [lowC, highC], rounded to nearest and clamped. */
    public static int spanLevel(double celsius, double lowC, double highC) {
        long v = Math.round((celsius - lowC) / (highC - lowC) * 255.0);
        return (int) Math.max(0, Math.min(255, v));
    }

    /**
     * Writes {@code celsius} to {@code file} in the encoding. {@code spanC} is required for {@link FrameEncoding#U8_SPAN_PNG}
     * and ignored otherwise.
     */
    public static void write(Path file, FrameEncoding encoding, int width, int height, float[] celsius, double[] spanC) {
        if (celsius.length != width * height) throw new IllegalArgumentException("raster size");
        switch (encoding) {
            case U16_CENTIKELVIN_PNG, U16_CENTIKELVIN_TIFF -> {
                short[] counts = new short[celsius.length];
                for (int i = 0; i < counts.length; i++) counts[i] = (short) centikelvin(celsius[i]);
                writeImage(file, grey16(width, height, counts), encoding == FrameEncoding.U16_CENTIKELVIN_PNG ? "png" : "tiff");
            }
            case F32_TIFF -> writeImage(file, greyFloat(width, height, celsius.clone()), "tiff");
            case U8_SPAN_PNG -> {
                if (spanC == null || spanC.length != 2 || !(spanC[1] > spanC[0]))
                    throw new IllegalArgumentException("8-bit span encoding needs [low, high]");
                byte[] levels = new byte[celsius.length];
                for (int i = 0; i < levels.length; i++) levels[i] = (byte) spanLevel(celsius[i], spanC[0], spanC[1]);
                writeImage(file, grey8(width, height, levels), "png");
            }
            default -> throw new IllegalArgumentException(encoding.toString());
        }
    }

    /** EXIF date-time layout "YYYY:MM:DD HH:MM:SS" (CIPA DC-008, DateTimeOriginal). */
    private static final DateTimeFormatter EXIF_DATE = DateTimeFormatter.ofPattern("yyyy:MM:dd HH:mm:ss", Locale.ROOT)
            .withZone(ZoneOffset.UTC);

    /**
     * Adds EXIF DateTimeOriginal (in UTC) and SubSecTimeOriginal (milliseconds, three digits) to a TIFF file written
     * by {@link #write}, through Apache Commons Imaging's lossless TIFF rewriter (the image data is kept as it is;
     * CIPA DC-008 tags 0x9003 and 0x9291).
     */
    public static void addExifTime(Path tiffFile, Instant instant) {
        try {
            byte[] original = Files.readAllBytes(tiffFile);
            ImageMetadata md = Imaging.getMetadata(original);
            if (!(md instanceof TiffImageMetadata tiff)) throw new IllegalArgumentException("not a TIFF: " + tiffFile);
            TiffOutputSet set = tiff.getOutputSet();
            TiffOutputDirectory exif = set.getOrCreateExifDirectory();
            long millis = Math.floorMod(instant.toEpochMilli(), 1000L);
            exif.removeField(ExifTagConstants.EXIF_TAG_DATE_TIME_ORIGINAL);
            exif.add(ExifTagConstants.EXIF_TAG_DATE_TIME_ORIGINAL, EXIF_DATE.format(instant));
            exif.removeField(ExifTagConstants.EXIF_TAG_SUB_SEC_TIME_ORIGINAL);
            exif.add(ExifTagConstants.EXIF_TAG_SUB_SEC_TIME_ORIGINAL, String.format(Locale.ROOT, "%03d", millis));
            ByteArrayOutputStream out = new ByteArrayOutputStream(original.length + 512);
            new TiffImageWriterLossless(set.byteOrder, original).write(out, set);
            Files.write(tiffFile, out.toByteArray());
        } catch (ImagingException e) {
            throw new IllegalStateException("cannot add EXIF to " + tiffFile + ": " + e.getMessage(), e);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot add EXIF to " + tiffFile, e);
        }
    }

    /** A 16-bit grey image over the given counts (unsigned in the short). */
    public static BufferedImage grey16(int width, int height, short[] counts) {
        BufferedImage img = new BufferedImage(width, height, BufferedImage.TYPE_USHORT_GRAY);
        short[] data = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
        System.arraycopy(counts, 0, data, 0, counts.length);
        return img;
    }

    public static BufferedImage grey8(int width, int height, byte[] levels) {
        BufferedImage img = new BufferedImage(width, height, BufferedImage.TYPE_BYTE_GRAY);
        byte[] data = ((DataBufferByte) img.getRaster().getDataBuffer()).getData();
        System.arraycopy(levels, 0, data, 0, levels.length);
        return img;
    }

    public static BufferedImage greyFloat(int width, int height, float[] samples) {
        DataBufferFloat db = new DataBufferFloat(samples, samples.length);
        SampleModel sm = new PixelInterleavedSampleModel(DataBuffer.TYPE_FLOAT, width, height, 1, width, new int[]{0});
        WritableRaster raster = Raster.createWritableRaster(sm, db, null);
        ColorModel cm = new ComponentColorModel(ColorSpace.getInstance(ColorSpace.CS_GRAY), false, false,
                Transparency.OPAQUE, DataBuffer.TYPE_FLOAT);
        return new BufferedImage(cm, raster, false, null);
    }

    private static void writeImage(Path file, BufferedImage img, String format) {
        Iterator<ImageWriter> it = ImageIO.getImageWritersByFormatName(format);
        if (!it.hasNext()) throw new IllegalStateException("no ImageIO writer for " + format);
        ImageWriter writer = it.next();
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) Files.createDirectories(parent);
            Files.deleteIfExists(file);
            try (ImageOutputStream out = ImageIO.createImageOutputStream(file.toFile())) {
                writer.setOutput(out);
                ImageWriteParam param = writer.getDefaultWriteParam();
                if ("tiff".equals(format) && param.canWriteCompressed()) {
                    // uncompressed: every TIFF reader handles it (TIFF 6.0 baseline)
                    param.setCompressionMode(ImageWriteParam.MODE_DISABLED);
                }
                writer.write(null, new IIOImage(img, null, null), param);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        } finally {
            writer.dispose();
        }
    }
}
