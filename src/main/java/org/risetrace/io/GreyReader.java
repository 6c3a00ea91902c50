package org.risetrace.io;

import java.nio.file.Path;

/**
 * 8-bit greyscale JPEG or BMP (one instance per container) read with a temperature span. These containers hold
 * no radiometric counts, only grey levels a camera rendered between a low and a high temperature. 8-bit grey PNG
 * and TIFF take the same span mapping through {@link PngReader} and {@link TiffReader}.
 */
public final class GreyReader implements FrameReader {
    private static final byte[] JPEG = {(byte) 0xFF, (byte) 0xD8, (byte) 0xFF};
    private static final byte[] BMP = {'B', 'M'};
    /** Grey levels by which JPEG's lossy colour conversion may leave the channels of a grey pixel apart. */
    private static final int JPEG_CHANNEL_TOLERANCE = 2;

    private final String container;

    private GreyReader(String container) {
        this.container = container;
    }

    public static GreyReader jpeg() {
        return new GreyReader("jpeg");
    }

    public static GreyReader bmp() {
        return new GreyReader("bmp");
    }

    @Override
    public String container() {
        return container;
    }

    @Override
    public boolean accepts(Path file, byte[] head) {
        return FrameReaders.startsWith(head, container.equals("jpeg") ? JPEG : BMP);
    }

    @Override
    public RawSamples decode(Path file, byte[] bytes, ReadContext context) {
        String label = container.equals("jpeg") ? "JPEG" : "BMP";
        ImageIoDecoding.Decoded d = ImageIoDecoding.decode(file, bytes, container, label, context, false);
        return ImageIoDecoding.samples(file, d.image(), container.equals("jpeg") ? JPEG_CHANNEL_TOLERANCE : 0,
                label);
    }
}
