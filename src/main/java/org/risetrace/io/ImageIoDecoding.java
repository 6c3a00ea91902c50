package org.risetrace.io;

import org.risetrace.frame.InputRejected;

import javax.imageio.IIOException;
import javax.imageio.ImageIO;
import javax.imageio.ImageReader;
import javax.imageio.metadata.IIOMetadata;
import java.awt.image.BufferedImage;
import java.awt.image.ColorModel;
import java.awt.image.ComponentSampleModel;
import java.awt.image.DataBuffer;
import java.awt.image.DataBufferByte;
import java.awt.image.DataBufferFloat;
import java.awt.image.DataBufferUShort;
import java.awt.image.IndexColorModel;
import java.awt.image.Raster;
import java.awt.image.SampleModel;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;

/**
 * Decoding through the JDK's ImageIO plug-ins (PNG, TIFF, JPEG, BMP), shared by the readers of those containers:
 * header-first pixel limit, warnings treated as damage, and raster-to-sample extraction without per-pixel calls.
 */
final class ImageIoDecoding {
    /** The message for colour images, which hold a palette rendering and not temperatures. */
    static final String COLOUR_REFUSED = "colour palette image: export radiometric or greyscale frames";

    record Decoded(BufferedImage image, IIOMetadata metadata) {
    }

    private ImageIoDecoding() {
    }

    private static ImageReader reader(String format) {
        Iterator<ImageReader> it = ImageIO.getImageReadersByFormatName(format);
        ImageReader fallback = null;
        while (it.hasNext()) {
            ImageReader r = it.next();
            // prefer the JDK's own plug-in: its behaviour is what the tests and the benchmark measure
            if (r.getClass().getName().startsWith("com.sun.imageio.")) return r;
            if (fallback == null) fallback = r;
        }
        if (fallback == null) throw new IllegalStateException("no ImageIO reader for " + format);
        return fallback;
    }

    /**
     * Decodes image 0 of the bytes. The size comes from the header first and is checked against the pixel limit
     * before the raster is allocated.
     */
    static Decoded decode(Path file, byte[] bytes, String format, String label, ReadContext ctx, boolean metadata) {
        ImageReader reader = reader(format);
        List<String> warnings = new ArrayList<>();
        try (ByteArrayImageInputStream in = new ByteArrayImageInputStream(bytes)) {
            reader.setInput(in, true, !metadata);
            int w = reader.getWidth(0);
            int h = reader.getHeight(0);
            checkPixels(file, label, w, h, ctx.maxPixels());
            // a Java array holds at most 2^31 - 1 samples: beyond, the plug-in fails with a message that reads
            // like damage, which the file need not have
            if ((long) w * h > Integer.MAX_VALUE - 8)
                throw new InputRejected(file, String.format(Locale.ROOT, "%s of %d x %d pixels is too large to decode"
                        + " (at most %d pixels in one raster)", label, w, h, Integer.MAX_VALUE - 8));
            reader.addIIOReadWarningListener((source, warning) -> warnings.add(warning));
            IIOMetadata md = metadata ? reader.getImageMetadata(0) : null;
            BufferedImage img;
            try {
                img = reader.read(0);
            } catch (OutOfMemoryError e) {
                // the raster did not fit; nothing of it is kept, so the program can go on and say so
                throw new InputRejected(file, String.format(Locale.ROOT, "not enough memory to decode a %d x %d %s",
                        w, h, label), "run java with a larger heap (java -Xmx8g -jar risetrace.jar ...)");
            }
            if (!warnings.isEmpty())
                throw new InputRejected(file, "damaged " + label + " data: " + warnings.get(0));
            return new Decoded(img, md);
        } catch (InputRejected e) {
            throw e;
        } catch (IIOException e) {
            throw damaged(file, label, e);
        } catch (IOException | RuntimeException e) {
            throw damaged(file, label, e);
        } finally {
            reader.dispose();
        }
    }

    static InputRejected damaged(Path file, String label, Exception e) {
        Throwable root = e;
        while (root.getCause() != null && root.getCause() != root) root = root.getCause();
        boolean eof = root instanceof java.io.EOFException;
        String msg = e.getMessage() != null ? e.getMessage() : eof ? "unexpected end of file" : e.getClass().getSimpleName();
        if (root != e && root.getMessage() != null && !msg.contains(root.getMessage())) msg += ": " + root.getMessage();
        if (eof && !msg.contains("end of file")) msg += " (unexpected end of file)";
        return new InputRejected(file, "truncated or damaged " + label + " file: " + msg, null, e);
    }

    static void checkPixels(Path file, String label, long w, long h, long maxPixels) {
        if (w <= 0 || h <= 0)
            throw new InputRejected(file, label + " header gives an empty size " + w + " x " + h);
        if (w * h > maxPixels)
            throw new InputRejected(file, String.format(Locale.ROOT,
                    "%s header claims %d x %d pixels (%d), more than the limit of %d", label, w, h, w * h, maxPixels),
                    "raise the limit with --max-pixels if the frame is real");
    }

    /** For readers that learn the size as they go (text): refuse as soon as the rows read exceed the limit. */
    static void checkPixelsSoFar(Path file, long w, long rows, long maxPixels) {
        if (w * rows > maxPixels)
            throw new InputRejected(file, "text matrix exceeds the limit of " + maxPixels + " pixels at row " + rows,
                    "raise the limit with --max-pixels if the frame is real");
    }

    /**
     * The samples of a decoded image. Single-band images are taken as they are; images with three equal colour
     * channels (within {@code tolerance} levels, for lossy JPEG) are grey; palette images are grey when every
     * used entry is; anything else is refused as a colour rendering.
     */
    static RawSamples samples(Path file, BufferedImage img, int tolerance, String detail) {
        Raster r = img.getRaster();
        ColorModel cm = img.getColorModel();
        int w = r.getWidth(), h = r.getHeight(), nb = r.getNumBands();
        DataBuffer db = r.getDataBuffer();
        int type = db.getDataType();
        int bits = r.getSampleModel().getSampleSize(0);
        if (cm instanceof IndexColorModel icm) return palette(file, r, icm, detail);
        switch (type) {
            case DataBuffer.TYPE_FLOAT -> {
                if (nb != 1) throw new InputRejected(file, "float image with " + nb + " channels",
                        "export one channel of temperatures");
                float[] direct = directFloat(r);
                if (direct != null) return RawSamples.floats(w, h, direct, detail);
                float[] v = new float[w * h];
                r.getSamples(0, 0, w, h, 0, v);
                return RawSamples.floats(w, h, v, detail);
            }
            case DataBuffer.TYPE_SHORT -> throw new InputRejected(file, "signed 16-bit samples are not supported",
                    "export unsigned 16-bit counts or float temperatures");
            case DataBuffer.TYPE_INT -> throw new InputRejected(file, "32-bit integer samples are not supported",
                    "export unsigned 16-bit counts or float temperatures");
            case DataBuffer.TYPE_DOUBLE -> throw new InputRejected(file, "64-bit float samples are not supported",
                    "export 32-bit float temperatures");
            case DataBuffer.TYPE_USHORT, DataBuffer.TYPE_BYTE -> {
                // handled below
            }
            default -> throw new InputRejected(file, "unsupported sample type " + type);
        }
        int colourBands = nb - (cm.hasAlpha() ? 1 : 0);
        if (colourBands != 1 && colourBands != 3)
            throw new InputRejected(file, "image with " + nb + " channels is not greyscale", COLOUR_REFUSED);
        boolean sixteen = bits > 8;
        if (nb == 1) {
            if (sixteen) {
                short[] direct = directUShort(r);
                if (direct != null) return RawSamples.counts(w, h, bits, direct, detail);
                short[] out = new short[w * h];
                int[] row = new int[w];
                for (int y = 0; y < h; y++) {
                    r.getSamples(0, y, w, 1, 0, row);
                    for (int x = 0; x < w; x++) out[y * w + x] = (short) row[x];
                }
                return RawSamples.counts(w, h, bits, out, detail);
            }
            byte[] direct = bits == 8 ? directByte(r) : null;
            if (direct != null) return RawSamples.grey(w, h, 255, direct, detail);
            byte[] out = new byte[w * h];
            int[] row = new int[w];
            for (int y = 0; y < h; y++) {
                r.getSamples(0, y, w, 1, 0, row);
                for (int x = 0; x < w; x++) out[y * w + x] = (byte) row[x];
            }
            return RawSamples.grey(w, h, (1 << bits) - 1, out, detail + (bits < 8 ? ", " + bits + "-bit grey" : ""));
        }
        // several bands: grey only if the colour channels agree and alpha is opaque
        int[][] band = new int[nb][w];
        int opaque = (1 << r.getSampleModel().getSampleSize(nb - 1)) - 1;
        short[] out16 = sixteen ? new short[w * h] : null;
        byte[] out8 = sixteen ? null : new byte[w * h];
        for (int y = 0; y < h; y++) {
            for (int b = 0; b < nb; b++) r.getSamples(0, y, w, 1, b, band[b]);
            for (int x = 0; x < w; x++) {
                if (cm.hasAlpha() && band[nb - 1][x] != opaque)
                    throw new InputRejected(file, "transparent pixel at (" + x + ", " + y + ")",
                            "export opaque greyscale or radiometric frames");
                int v;
                if (colourBands == 3) {
                    int a = band[0][x], b = band[1][x], c = band[2][x];
                    int spread = Math.max(a, Math.max(b, c)) - Math.min(a, Math.min(b, c));
                    if (spread > tolerance)
                        throw new InputRejected(file, COLOUR_REFUSED,
                                "red, green and blue differ at pixel (" + x + ", " + y + ")");
                    v = (a + b + c + 1) / 3;
                } else {
                    v = band[0][x];
                }
                if (sixteen) out16[y * w + x] = (short) v;
                else out8[y * w + x] = (byte) v;
            }
        }
        String d = detail + (colourBands == 3 ? ", RGB with equal channels" : ", grey with alpha");
        return sixteen ? RawSamples.counts(w, h, bits, out16, d) : RawSamples.grey(w, h, 255, out8, d);
    }

    private static RawSamples palette(Path file, Raster r, IndexColorModel icm, String detail) {
        int n = icm.getMapSize();
        byte[] red = new byte[n], green = new byte[n], blue = new byte[n];
        icm.getReds(red);
        icm.getGreens(green);
        icm.getBlues(blue);
        int w = r.getWidth(), h = r.getHeight();
        byte[] out = new byte[w * h];
        int[] row = new int[w];
        for (int y = 0; y < h; y++) {
            r.getSamples(0, y, w, 1, 0, row);
            for (int x = 0; x < w; x++) {
                int i = row[x];
                if (i >= n || red[i] != green[i] || green[i] != blue[i])
                    throw new InputRejected(file, COLOUR_REFUSED,
                            "the palette entry at pixel (" + x + ", " + y + ") is not grey");
                if (icm.getAlpha(i) != 255)
                    throw new InputRejected(file, "transparent pixel at (" + x + ", " + y + ")",
                            "export opaque greyscale or radiometric frames");
                out[y * w + x] = red[i];
            }
        }
        return RawSamples.grey(w, h, 255, out, detail + ", grey palette");
    }

    /** True when the raster's one band is stored as one tight row-major array starting at index 0. */
    private static boolean tight(Raster r, int arrayLength) {
        SampleModel sm = r.getSampleModel();
        if (!(sm instanceof ComponentSampleModel csm)) return false;
        return r.getNumBands() == 1 && csm.getPixelStride() == 1 && csm.getScanlineStride() == r.getWidth()
                && csm.getBandOffsets()[0] == 0 && r.getDataBuffer().getNumBanks() == 1
                && r.getDataBuffer().getOffset() == 0 && r.getSampleModelTranslateX() == 0
                && r.getSampleModelTranslateY() == 0 && arrayLength == r.getWidth() * r.getHeight();
    }

    private static short[] directUShort(Raster r) {
        if (!(r.getDataBuffer() instanceof DataBufferUShort d)) return null;
        short[] a = d.getData();
        return tight(r, a.length) ? a : null;
    }

    private static byte[] directByte(Raster r) {
        if (!(r.getDataBuffer() instanceof DataBufferByte d)) return null;
        byte[] a = d.getData();
        return tight(r, a.length) ? a : null;
    }

    private static float[] directFloat(Raster r) {
        if (!(r.getDataBuffer() instanceof DataBufferFloat d)) return null;
        float[] a = d.getData();
        return tight(r, a.length) ? a : null;
    }
}
