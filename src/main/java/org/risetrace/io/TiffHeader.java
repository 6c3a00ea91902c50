package org.risetrace.io;

import java.util.HashMap;
import java.util.Map;

/**
 * The first image file directory (IFD) of a TIFF, read straight from the bytes per TIFF 6.0 section 2: header
 * (byte order "II"/"MM", 42, offset of IFD 0), then a 2-byte entry count and 12-byte entries (tag, type, count,
 * value or offset). Only scalar SHORT/LONG values are kept, which is what choosing a decoding path needs.
 */
final class TiffHeader {
    static final int TAG_IMAGE_WIDTH = 256;
    static final int TAG_BITS_PER_SAMPLE = 258;
    static final int TAG_PREDICTOR = 317;
    static final int TAG_TILE_WIDTH = 322;
    static final int TAG_SAMPLE_FORMAT = 339;
    static final int TAG_IMAGE_LENGTH = 257;
    static final int TAG_SAMPLES_PER_PIXEL = 277;
    static final int TAG_ROWS_PER_STRIP = 278;
    static final int TAG_PLANAR_CONFIGURATION = 284;
    static final int TAG_TILE_LENGTH = 323;
    static final int TAG_COMPRESSION = 259;
    static final int TAG_PHOTOMETRIC = 262;
    static final int TAG_STRIP_OFFSETS = 273;
    static final int TAG_STRIP_BYTE_COUNTS = 279;
    static final int TAG_TILE_OFFSETS = 324;
    static final int TAG_TILE_BYTE_COUNTS = 325;

    final boolean littleEndian;
    /** tag -> first value, for SHORT (3) and LONG (4) entries. */
    private final Map<Integer, Long> values = new HashMap<>();
    /** tag -> byte position of the entry's value field. */
    private final Map<Integer, Integer> valuePositions = new HashMap<>();
    /** tag -> {type, count} of SHORT/LONG entries. */
    private final Map<Integer, long[]> shapes = new HashMap<>();

    private TiffHeader(boolean littleEndian) {
        this.littleEndian = littleEndian;
    }

    /** Parses IFD 0, or returns null when the bytes are too short or the offsets point outside (the decoder reports it). */
    static TiffHeader parse(byte[] b) {
        if (b.length < 8) return null;
        TiffHeader h = new TiffHeader(b[0] == 'I');
        long ifd = h.u32(b, 4);
        if (ifd < 8 || ifd + 2 > b.length) return null;
        int n = h.u16(b, (int) ifd);
        for (int i = 0; i < n; i++) {
            int e = (int) ifd + 2 + 12 * i;
            if (e + 12 > b.length) return null;
            int tag = h.u16(b, e), type = h.u16(b, e + 2);
            long count = h.u32(b, e + 4);
            if (count < 1) continue;
            if (type == 3) h.values.put(tag, (long) h.u16(b, e + 8));
            else if (type == 4) h.values.put(tag, h.u32(b, e + 8));
            else continue;
            h.valuePositions.put(tag, e + 8);
            h.shapes.put(tag, new long[]{type, count});
        }
        return h;
    }

    boolean has(int tag) {
        return values.containsKey(tag);
    }

    /**
     * All values of a SHORT/LONG entry: in the entry when they fit in 4 bytes, else at the offset it holds
     * (TIFF 6.0 section 2). Null when the tag is absent or its values lie outside the file.
     */
    long[] values(byte[] b, int tag) {
        long[] shape = shapes.get(tag);
        if (shape == null) return null;
        int size = shape[0] == 3 ? 2 : 4;
        long count = shape[1];
        long start = count * size <= 4 ? valuePositions.get(tag) : u32(b, valuePositions.get(tag));
        if (count > Integer.MAX_VALUE / 4 || start + count * size > b.length) return null;
        long[] out = new long[(int) count];
        for (int i = 0; i < count; i++) {
            int p = (int) start + i * size;
            out[i] = size == 2 ? u16(b, p) : u32(b, p);
        }
        return out;
    }

    long value(int tag, long fallback) {
        return values.getOrDefault(tag, fallback);
    }

    /** A copy of the bytes with a SHORT tag's value replaced (the tag must be present). */
    byte[] withShort(byte[] b, int tag, int newValue) {
        byte[] copy = b.clone();
        int p = valuePositions.get(tag);
        if (littleEndian) {
            copy[p] = (byte) newValue;
            copy[p + 1] = (byte) (newValue >> 8);
        } else {
            copy[p] = (byte) (newValue >> 8);
            copy[p + 1] = (byte) newValue;
        }
        return copy;
    }

    int u16(byte[] b, int p) {
        return littleEndian ? (b[p] & 0xFF) | (b[p + 1] & 0xFF) << 8 : (b[p] & 0xFF) << 8 | (b[p + 1] & 0xFF);
    }

    long u32(byte[] b, int p) {
        long v = littleEndian
                ? (b[p] & 0xFFL) | (b[p + 1] & 0xFFL) << 8 | (b[p + 2] & 0xFFL) << 16 | (b[p + 3] & 0xFFL) << 24
                : (b[p] & 0xFFL) << 24 | (b[p + 1] & 0xFFL) << 16 | (b[p + 2] & 0xFFL) << 8 | (b[p + 3] & 0xFFL);
        return v;
    }
}
