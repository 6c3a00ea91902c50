package org.risetrace.io;

import javax.imageio.ImageIO;
import javax.imageio.ImageTypeSpecifier;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import java.awt.image.BufferedImage;
import java.awt.image.ComponentColorModel;
import java.awt.image.DataBuffer;
import java.awt.image.DataBufferFloat;
import java.awt.image.DataBufferUShort;
import java.awt.image.PixelInterleavedSampleModel;
import java.awt.image.Raster;
import java.awt.image.WritableRaster;
import java.awt.color.ColorSpace;
import java.awt.Point;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Hashtable;

/** Test images written by the JDK's ImageIO writers (an implementation outside risetrace). */
final class TestImages {
    private TestImages() {
    }

    /** The fixture pattern: count(x, y) = 27315 + 37 x + 101 y (0 degC plus a ramp, in centikelvin). */
    static int count(int x, int y) {
        return 27315 + 37 * x + 101 * y;
    }

    static BufferedImage ushortGrey(int w, int h) {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_USHORT_GRAY);
        short[] d = ((DataBufferUShort) img.getRaster().getDataBuffer()).getData();
        for (int y = 0; y < h; y++) for (int x = 0; x < w; x++) d[y * w + x] = (short) count(x, y);
        return img;
    }

    static BufferedImage byteGrey(int w, int h) {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_BYTE_GRAY);
        WritableRaster r = img.getRaster();
        for (int y = 0; y < h; y++) for (int x = 0; x < w; x++) r.setSample(x, y, 0, (3 * x + 5 * y) & 0xFF);
        return img;
    }

    /** A one-band float image (what a float TIFF holds). */
    static BufferedImage floatGrey(float[] values, int w, int h) {
        ColorSpace cs = ColorSpace.getInstance(ColorSpace.CS_GRAY);
        ComponentColorModel cm = new ComponentColorModel(cs, false, false, java.awt.Transparency.OPAQUE,
                DataBuffer.TYPE_FLOAT);
        PixelInterleavedSampleModel sm = new PixelInterleavedSampleModel(DataBuffer.TYPE_FLOAT, w, h, 1, w, new int[]{0});
        WritableRaster r = Raster.createWritableRaster(sm, new DataBufferFloat(values, values.length), new Point(0, 0));
        return new BufferedImage(cm, r, false, new Hashtable<>());
    }

    static Path write(BufferedImage img, String format, Path file) throws IOException {
        if (!ImageIO.write(img, format, file.toFile())) throw new IOException("no " + format + " writer");
        return file;
    }

    /** TIFF with a given compression type name ("LZW", "Deflate", "PackBits", or null for none). */
    static Path writeTiff(BufferedImage img, String compression, Path file) throws IOException {
        ImageWriter w = ImageIO.getImageWritersByFormatName("tiff").next();
        Files.deleteIfExists(file);
        try (ImageOutputStream out = ImageIO.createImageOutputStream(file.toFile())) {
            w.setOutput(out);
            ImageWriteParam p = w.getDefaultWriteParam();
            if (compression != null) {
                p.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
                p.setCompressionType(compression);
            }
            w.write(null, new javax.imageio.IIOImage(img, null, null), p);
        } finally {
            w.dispose();
        }
        return file;
    }

    static ImageTypeSpecifier spec(BufferedImage img) {
        return new ImageTypeSpecifier(img);
    }
}
