package org.risetrace.io;

import org.risetrace.frame.InputRejected;

import java.nio.file.Path;

/**
 * PNG (ISO/IEC 15948): 16-bit grey counts for a linear profile, 8-bit (or fewer bits) grey for a span profile.
 * Plain 8- and 16-bit grey files are decoded by {@link PngGrey}; every other kind by the JDK's PNG plug-in, from
 * the bytes already read.
 */
public final class PngReader implements FrameReader {
    private static final byte[] SIGNATURE = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'};

    private final boolean directGrey;

    public PngReader() {
        this(true);
    }

    /** {@code directGrey} false sends every file through the JDK plug-in: the reference for tests and benchmarks. */
    PngReader(boolean directGrey) {
        this.directGrey = directGrey;
    }

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
        checkChunks(file, bytes);
        if (directGrey) {
            RawSamples s = PngGrey.decode(file, bytes, context);
            if (s != null) return s;
        }
        ImageIoDecoding.Decoded d = ImageIoDecoding.decode(file, bytes, "png", "PNG", context, false);
        return ImageIoDecoding.samples(file, d.image(), 0, detail(bytes));
    }

    /**
     * Walks the chunks and checks each CRC-32 (ISO/IEC 15948 section 5.3: over chunk type and data), which the
     * JDK plug-in skips: a damaged byte in the image data is refused instead of becoming a wrong temperature.
     */
    static void checkChunks(Path file, byte[] b) {
        java.util.zip.CRC32 crc = new java.util.zip.CRC32();
        int p = SIGNATURE.length;
        while (p + 12 <= b.length) {
            long length = ((b[p] & 0xFFL) << 24) | ((b[p + 1] & 0xFF) << 16) | ((b[p + 2] & 0xFF) << 8) | (b[p + 3] & 0xFF);
            String type = chunkName(b, p + 4);
            if (length > b.length - p - 12L)
                throw new InputRejected(file, "truncated PNG file: chunk " + type + " at byte " + p + " runs past the end");
            int n = (int) length;
            crc.reset();
            crc.update(b, p + 4, 4 + n);
            int q = p + 8 + n;
            long stored = ((b[q] & 0xFFL) << 24) | ((b[q + 1] & 0xFF) << 16) | ((b[q + 2] & 0xFF) << 8) | (b[q + 3] & 0xFF);
            if (stored != crc.getValue())
                throw new InputRejected(file, "damaged PNG file: CRC mismatch in chunk " + type + " at byte " + p);
            if (type.equals("IEND")) return;
            p = q + 4;
        }
        throw new InputRejected(file, "truncated PNG file: no IEND chunk");
    }

    /**
     * A chunk type for messages: its four letters when it is one (ISO/IEC 15948 section 5.4: ASCII letters only),
     * else its bytes in hex, so a damaged file's bytes never reach the message (a line feed split it; fuzzing found).
     */
    static String chunkName(byte[] b, int at) {
        boolean letters = true;
        for (int i = 0; i < 4; i++) {
            int c = b[at + i] & 0xFF;
            letters &= (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z');
        }
        if (letters) return new String(b, at, 4, java.nio.charset.StandardCharsets.US_ASCII);
        return String.format(java.util.Locale.ROOT, "0x%02x%02x%02x%02x", b[at], b[at + 1], b[at + 2], b[at + 3]);
    }

    /** Bit depth, colour type and interlacing from the IHDR chunk (bytes 24, 25, 28 of the file). */
    static String detail(byte[] b) {
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
