package org.risetrace.io;

import org.risetrace.frame.InputRejected;

import java.nio.file.Path;

/**
 * Netpbm PGM: binary P5 and plain P2. Per the netpbm format description, the header is the magic number, width,
 * height and maxval as ASCII decimals separated by whitespace (with {@code #} comments to end of line), then a
 * single whitespace character, then the raster; each sample is 1 byte when maxval < 256, else 2 bytes with the
 * most significant byte first. maxval above 255 gives counts (linear profile); up to 255 gives grey levels whose
 * full scale is maxval (span profile).
 */
public final class PgmReader implements FrameReader {

    @Override
    public String container() {
        return "pgm";
    }

    @Override
    public boolean accepts(Path file, byte[] head) {
        return head.length >= 3 && head[0] == 'P' && (head[1] == '5' || head[1] == '2') && whitespace(head[2]);
    }

    private static boolean whitespace(int c) {
        return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == 0x0B || c == 0x0C;
    }

    /** A cursor over the header. */
    private static final class Cursor {
        final byte[] b;
        int pos;

        Cursor(byte[] b, int pos) {
            this.b = b;
            this.pos = pos;
        }

        void skipSpaceAndComments() {
            while (pos < b.length) {
                int c = b[pos];
                if (c == '#') {
                    while (pos < b.length && b[pos] != '\n' && b[pos] != '\r') pos++;
                } else if (whitespace(c)) {
                    pos++;
                } else {
                    return;
                }
            }
        }

        long number(Path file, String what) {
            skipSpaceAndComments();
            int start = pos;
            long v = 0;
            while (pos < b.length && b[pos] >= '0' && b[pos] <= '9') {
                v = v * 10 + (b[pos] - '0');
                if (v > Integer.MAX_VALUE) throw new InputRejected(file, "PGM " + what + " is too large");
                pos++;
            }
            if (pos == start)
                throw new InputRejected(file, pos >= b.length ? "truncated PGM header: no " + what
                        : "malformed PGM header: expected the " + what + " at byte " + pos);
            return v;
        }
    }

    @Override
    public RawSamples decode(Path file, byte[] bytes, ReadContext context) {
        boolean plain = bytes[1] == '2';
        Cursor c = new Cursor(bytes, 2);
        long w = c.number(file, "width");
        long h = c.number(file, "height");
        long maxval = c.number(file, "maxval");
        if (maxval < 1 || maxval > 65535)
            throw new InputRejected(file, "PGM maxval " + maxval + " is outside 1..65535 (netpbm)");
        ImageIoDecoding.checkPixels(file, "PGM", w, h, context.maxPixels());
        int n = (int) (w * h);
        boolean wide = maxval > 255;
        String detail = (plain ? "P2 plain" : "P5 binary") + ", maxval " + maxval;
        if (plain) return plain(file, c, (int) w, (int) h, (int) maxval, wide, detail);
        if (c.pos >= bytes.length || !whitespace(bytes[c.pos]))
            throw new InputRejected(file, "truncated PGM file: no raster after the header");
        int start = c.pos + 1; // exactly one whitespace character ends the header
        long need = (long) n * (wide ? 2 : 1);
        if (bytes.length - start < need)
            throw new InputRejected(file, "truncated PGM file: the raster needs " + need + " bytes, the file has "
                    + (bytes.length - start) + " after the header");
        if (wide) {
            short[] out = new short[n];
            for (int i = 0, p = start; i < n; i++, p += 2) {
                int v = ((bytes[p] & 0xFF) << 8) | (bytes[p + 1] & 0xFF);
                if (v > maxval) throw overMax(file, i, (int) w, v, maxval);
                out[i] = (short) v;
            }
            return RawSamples.counts((int) w, (int) h, 16, out, detail);
        }
        byte[] out = new byte[n];
        System.arraycopy(bytes, start, out, 0, n);
        if (maxval < 255)
            for (int i = 0; i < n; i++) if ((out[i] & 0xFF) > maxval) throw overMax(file, i, (int) w, out[i] & 0xFF, maxval);
        return RawSamples.grey((int) w, (int) h, (int) maxval, out, detail);
    }

    private static RawSamples plain(Path file, Cursor c, int w, int h, int maxval, boolean wide, String detail) {
        int n = w * h;
        short[] out16 = wide ? new short[n] : null;
        byte[] out8 = wide ? null : new byte[n];
        for (int i = 0; i < n; i++) {
            long v;
            try {
                v = c.number(file, "sample " + i);
            } catch (InputRejected e) {
                throw new InputRejected(file, "truncated or malformed PGM raster at sample " + i + " of " + n);
            }
            if (v > maxval) throw overMax(file, i, w, v, maxval);
            if (wide) out16[i] = (short) v;
            else out8[i] = (byte) v;
        }
        return wide ? RawSamples.counts(w, h, 16, out16, detail) : RawSamples.grey(w, h, maxval, out8, detail);
    }

    private static InputRejected overMax(Path file, int i, int w, long v, long maxval) {
        return new InputRejected(file, "PGM sample " + v + " at pixel (" + (i % w) + ", " + (i / w)
                + ") exceeds maxval " + maxval);
    }
}
