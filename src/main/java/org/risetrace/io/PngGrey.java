package org.risetrace.io;

import org.risetrace.frame.InputRejected;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.zip.DataFormatException;
import java.util.zip.Inflater;

/**
 * A direct decoder for the commonest frame: non-interlaced 8- or 16-bit grey PNG without palette or transparency
 * (ISO/IEC 15948). The JDK plug-in spends most of its time in per-pixel Raster calls; here the image data is
 * inflated into one buffer and unfiltered in place in plain loops over it. Any other file gives null and goes
 * through ImageIO, which stays the reference for everything this class does not handle.
 */
final class PngGrey {
    private static final int SIGNATURE_LENGTH = 8;
    private static final int IHDR = type("IHDR"), IDAT = type("IDAT"), IEND = type("IEND");
    private static final int PLTE = type("PLTE"), TRNS = type("tRNS");

    private PngGrey() {
    }

    /**
     * The samples of {@code bytes}, or null when the file is not the simple case. Call after
     * {@link PngReader#checkChunks}, which has already checked the chunk lengths and CRCs.
     */
    static RawSamples decode(Path file, byte[] bytes, ReadContext ctx) {
        Header h = header(bytes);
        if (h == null) return null;
        ImageIoDecoding.checkPixels(file, "PNG", h.width, h.height, ctx.maxPixels());
        if (h.idat.length == 0) throw new InputRejected(file, "damaged PNG data: no IDAT chunk (image data)");
        int w = (int) h.width, rows = (int) h.height;
        if (rows * (1 + w * (h.depth / 8L)) > Integer.MAX_VALUE - 8) return null; // too big for one Java array
        return h.depth == 16
                ? RawSamples.counts(w, rows, 16, sixteen(file, bytes, h), PngReader.detail(bytes))
                : RawSamples.grey(w, rows, 255, eight(file, bytes, h), PngReader.detail(bytes));
    }

    /**
     * What the chunks say, when they describe the simple case. {@code idat} holds offset and length of each IDAT
     * chunk's data, in file order (sections 10 and 11.2.4: the zlib stream is their concatenation).
     */
    private record Header(long width, long height, int depth, int[] idat) {
    }

    private static Header header(byte[] b) {
        int p = SIGNATURE_LENGTH;
        Header ihdr = null;
        int[] idat = new int[8];
        int n = 0;
        while (p + 12 <= b.length) {
            int length = readInt(b, p);
            if (length < 0 || length > b.length - p - 12) return null; // checkChunks refuses this first
            int type = readInt(b, p + 4);
            int data = p + 8;
            if ((p == SIGNATURE_LENGTH) != (type == IHDR)) return null; // IHDR must come first, once
            if (type == IHDR) {
                ihdr = simpleIhdr(b, data, length);
                if (ihdr == null) return null;
            } else if (type == IDAT) {
                if (n + 2 > idat.length) idat = Arrays.copyOf(idat, 2 * idat.length);
                idat[n++] = data;
                idat[n++] = length;
            } else if (type == IEND) {
                return new Header(ihdr.width, ihdr.height, ihdr.depth, Arrays.copyOf(idat, n));
            } else if (type == PLTE || type == TRNS || (b[p + 4] & 0x20) == 0) {
                // a palette or transparency changes the samples ImageIO gives; an unknown critical chunk
                // (upper-case first letter, section 5.4) may change their meaning: leave all to ImageIO
                return null;
            }
            // other ancillary chunks (tEXt, zTXt, iTXt, tIME, pHYs, gAMA, sBIT, ...) do not change the samples
            p = data + length + 4;
        }
        return null; // no IEND: checkChunks refuses this first
    }

    /** The IHDR fields (section 11.2.2) when they are grey 8 or 16 bits, deflate, filter method 0, no interlace. */
    private static Header simpleIhdr(byte[] b, int d, int length) {
        if (length != 13) return null;
        long w = readInt(b, d) & 0xFFFFFFFFL, h = readInt(b, d + 4) & 0xFFFFFFFFL;
        int depth = b[d + 8], colour = b[d + 9], compression = b[d + 10], filter = b[d + 11], interlace = b[d + 12];
        if (w > Integer.MAX_VALUE || h > Integer.MAX_VALUE) return null; // outside the spec's 2^31 - 1
        if (colour != 0 || (depth != 8 && depth != 16) || compression != 0 || filter != 0 || interlace != 0)
            return null;
        return new Header(w, h, depth, null);
    }

    private static byte[] eight(Path file, byte[] b, Header h) {
        int w = (int) h.width, rows = (int) h.height;
        byte[] d = scanlines(file, b, h, 1);
        byte[] out = new byte[w * rows];
        for (int y = 0; y < rows; y++) System.arraycopy(d, y * (1 + w) + 1, out, y * w, w);
        return out;
    }

    private static short[] sixteen(Path file, byte[] b, Header h) {
        int w = (int) h.width, rows = (int) h.height;
        byte[] d = scanlines(file, b, h, 2);
        short[] out = new short[w * rows];
        for (int y = 0; y < rows; y++) {
            // samples are stored most significant byte first (section 7.1)
            for (int x = 0, i = y * (1 + 2 * w) + 1, o = y * w; x < w; x++, i += 2)
                out[o + x] = (short) (((d[i] & 0xFF) << 8) | (d[i + 1] & 0xFF));
        }
        return out;
    }

    /**
     * The image data inflated in one piece, then unfiltered in place row by row: each scanline is its filter type
     * byte and the row's bytes, and the row above is still there, already unfiltered, for Up, Average and Paeth.
     * One whole-image inflate call is markedly faster than one per row (zlib's fast path needs room to write).
     */
    private static byte[] scanlines(Path file, byte[] b, Header h, int bytesPerPixel) {
        int length = 1 + (int) h.width * bytesPerPixel;
        byte[] d = new byte[length * (int) h.height];
        inflate(file, b, h.idat, d);
        byte[] zeros = new byte[length]; // the row above the first one (section 9.2)
        for (int y = 0, o = 0; y < h.height; y++, o += length) {
            if (y == 0) unfilter(file, d, o, zeros, 0, length, bytesPerPixel, y);
            else unfilter(file, d, o, d, o - length, length, bytesPerPixel, y);
        }
        return d;
    }

    /**
     * Fills {@code out} from the zlib stream in the IDAT chunks (section 10). Data after the image is ignored,
     * as the JDK plug-in does.
     */
    private static void inflate(Path file, byte[] b, int[] idat, byte[] out) {
        Inflater inflater = new Inflater();
        int off = 0, next = 0;
        try {
            while (off < out.length) {
                int n = inflater.inflate(out, off, out.length - off);
                off += n;
                if (n > 0) continue;
                if (inflater.needsInput() && next < idat.length) {
                    inflater.setInput(b, idat[next], idat[next + 1]);
                    next += 2;
                } else if (inflater.needsDictionary()) {
                    throw new InputRejected(file, "damaged PNG data: the zlib stream asks for a preset dictionary");
                } else {
                    // the stream ended, or the IDAT chunks ran out, before the last row
                    throw new InputRejected(file,
                            "truncated PNG image data: expected " + out.length + " bytes, got " + off);
                }
            }
        } catch (DataFormatException e) {
            throw new InputRejected(file, "damaged PNG data: " + (e.getMessage() != null ? e.getMessage()
                    : "invalid deflate stream") + " (after " + off + " bytes)", null, e);
        } finally {
            inflater.end(); // frees zlib's native memory now rather than at garbage collection
        }
    }

    /**
     * Reverses the filter of the scanline at {@code d[o]} (section 9.2), with the unfiltered row above at
     * {@code up[u]}; both start with the filter type byte. a, b and c are the bytes left, above and above-left.
     */
    private static void unfilter(Path file, byte[] d, int o, byte[] up, int u, int length, int bpp, int y) {
        int end = o + length, k = bpp, du = u - o;
        switch (d[o]) {
            case 0 -> {
            }
            case 1 -> {
                for (int i = o + 1 + k; i < end; i++) d[i] += d[i - k];
            }
            case 2 -> {
                for (int i = o + 1; i < end; i++) d[i] += up[i + du];
            }
            case 3 -> {
                for (int i = o + 1; i <= o + k; i++) d[i] += (up[i + du] & 0xFF) >>> 1;
                for (int i = o + 1 + k; i < end; i++) d[i] += ((d[i - k] & 0xFF) + (up[i + du] & 0xFF)) >>> 1;
            }
            case 4 -> {
                for (int i = o + 1; i <= o + k; i++) d[i] += up[i + du]; // a = c = 0: the predictor is b
                for (int i = o + 1 + k; i < end; i++)
                    d[i] += paeth(d[i - k] & 0xFF, up[i + du] & 0xFF, up[i + du - k] & 0xFF);
            }
            default -> throw new InputRejected(file, "damaged PNG data: filter type " + (d[o] & 0xFF) + " on row " + y);
        }
    }

    /** The Paeth predictor (section 9.2): whichever of a, b, c is closest to a + b - c, ties to a, then b. */
    static int paeth(int a, int b, int c) {
        int pa = Math.abs(b - c), pb = Math.abs(a - c), pc = Math.abs(a + b - 2 * c);
        // chosen by sign masks, not branches: on noisy rows the branches mispredict about half the time
        int notA = ((pb - pa) | (pc - pa)) >> 31; // all ones unless pa <= pb and pa <= pc
        int notB = (pc - pb) >> 31; // all ones unless pb <= pc
        int bOrC = b ^ ((b ^ c) & notB);
        return a ^ ((a ^ bOrC) & notA);
    }

    private static int readInt(byte[] b, int p) {
        return ((b[p] & 0xFF) << 24) | ((b[p + 1] & 0xFF) << 16) | ((b[p + 2] & 0xFF) << 8) | (b[p + 3] & 0xFF);
    }

    private static int type(String name) {
        return (name.charAt(0) << 24) | (name.charAt(1) << 16) | (name.charAt(2) << 8) | name.charAt(3);
    }
}
