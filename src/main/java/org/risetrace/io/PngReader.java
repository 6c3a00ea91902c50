package org.risetrace.io;

import java.nio.file.Path;

/**
 * PNG (ISO/IEC 15948): 16-bit grey counts for a linear profile, 8-bit (or fewer bits) grey for a span profile.
 * Decoded by the JDK's PNG plug-in from the bytes already read.
 */
public final class PngReader implements FrameReader {
    private static final byte[] SIGNATURE = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'};

    @Override
    public String container() {
        return "png";
    }

    @Override
    public boolean accepts(Path file, byte[] head) {
        return FrameReaders.startsWith(head, SIGNATURE);
    }

    @Override
    public RawSamples decode(Path file, byte[] bytes, ReadContext context) {
        ImageIoDecoding.Decoded d = ImageIoDecoding.decode(file, bytes, "png", "PNG", context, false);
        return ImageIoDecoding.samples(file, d.image(), 0, detail(bytes));
    }

    /** Bit depth, colour type and interlacing from the IHDR chunk (bytes 24, 25, 28 of the file). */
    private static String detail(byte[] b) {
        if (b.length < 29) return "";
        int depth = b[24], colour = b[25], interlace = b[28];
        String type = switch (colour) {
            case 0 -> "grey";
            case 2 -> "RGB";
            case 3 -> "palette";
            case 4 -> "grey+alpha";
            case 6 -> "RGBA";
            default -> "colour type " + colour;
        };
        return depth + "-bit " + type + (interlace == 1 ? ", interlaced" : "");
    }
}
