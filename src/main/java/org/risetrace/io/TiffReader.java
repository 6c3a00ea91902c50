package org.risetrace.io;

import org.risetrace.frame.InputRejected;

import javax.imageio.metadata.IIOInvalidTreeException;
import javax.imageio.plugins.tiff.BaselineTIFFTagSet;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFField;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * TIFF 6.0: 16-bit unsigned counts (linear profile), 32-bit IEEE float temperatures (SampleFormat 3, float
 * profile) and 8-bit grey (span profile); uncompressed, LZW, Deflate or PackBits; strips or tiles; either byte
 * order. Decoded by the JDK's TIFF plug-in; the strip and tile extents are checked against the file length so a
 * truncated file is refused rather than read as zeros.
 */
public final class TiffReader implements FrameReader {
    private static final byte[] LITTLE = {'I', 'I', 42, 0};
    private static final byte[] BIG = {'M', 'M', 0, 42};

    @Override
    public String container() {
        return "tiff";
    }

    @Override
    public boolean accepts(Path file, byte[] head) {
        return FrameReaders.startsWith(head, LITTLE) || FrameReaders.startsWith(head, BIG);
    }

    @Override
    public RawSamples decode(Path file, byte[] bytes, ReadContext context) {
        ImageIoDecoding.Decoded d = ImageIoDecoding.decode(file, bytes, "tiff", "TIFF", context, true);
        TIFFDirectory dir;
        try {
            dir = TIFFDirectory.createFromMetadata(d.metadata());
        } catch (IIOInvalidTreeException e) {
            throw ImageIoDecoding.damaged(file, "TIFF", e);
        }
        int photometric = intTag(dir, BaselineTIFFTagSet.TAG_PHOTOMETRIC_INTERPRETATION, -1);
        if (photometric == BaselineTIFFTagSet.PHOTOMETRIC_INTERPRETATION_WHITE_IS_ZERO)
            throw new InputRejected(file, "TIFF stores grey as WhiteIsZero (PhotometricInterpretation 0)",
                    "export BlackIsZero greyscale or radiometric frames");
        checkExtents(file, dir, bytes.length);
        return ImageIoDecoding.samples(file, d.image(), 0, detail(dir, bytes[0] == 'I'));
    }

    private static int intTag(TIFFDirectory dir, int tag, int fallback) {
        TIFFField f = dir.getTIFFField(tag);
        return f == null ? fallback : f.getAsInt(0);
    }

    /** Every strip or tile must lie inside the file (TIFF 6.0, StripOffsets/StripByteCounts, tags 273/279, 324/325). */
    private static void checkExtents(Path file, TIFFDirectory dir, long length) {
        boolean tiled = dir.getTIFFField(BaselineTIFFTagSet.TAG_TILE_OFFSETS) != null;
        TIFFField offsets = dir.getTIFFField(tiled ? BaselineTIFFTagSet.TAG_TILE_OFFSETS
                : BaselineTIFFTagSet.TAG_STRIP_OFFSETS);
        TIFFField counts = dir.getTIFFField(tiled ? BaselineTIFFTagSet.TAG_TILE_BYTE_COUNTS
                : BaselineTIFFTagSet.TAG_STRIP_BYTE_COUNTS);
        if (offsets == null) throw new InputRejected(file, "TIFF without strip or tile offsets");
        if (counts == null) return;
        int n = Math.min(offsets.getCount(), counts.getCount());
        for (int i = 0; i < n; i++) {
            long end = offsets.getAsLong(i) + counts.getAsLong(i);
            if (end > length)
                throw new InputRejected(file, "truncated TIFF file: " + (tiled ? "tile " : "strip ") + i
                        + " ends at byte " + end + " but the file has " + length + " bytes");
        }
    }

    private static String detail(TIFFDirectory dir, boolean little) {
        List<String> parts = new ArrayList<>();
        int bits = intTag(dir, BaselineTIFFTagSet.TAG_BITS_PER_SAMPLE, 1);
        int format = intTag(dir, BaselineTIFFTagSet.TAG_SAMPLE_FORMAT, 1);
        parts.add(bits + "-bit " + (format == 3 ? "float" : format == 2 ? "signed" : "unsigned"));
        int compression = intTag(dir, BaselineTIFFTagSet.TAG_COMPRESSION, 1);
        parts.add(switch (compression) {
            case 1 -> "uncompressed";
            case 5 -> "LZW";
            case 8, 32946 -> "Deflate";
            case 32773 -> "PackBits";
            case 7 -> "JPEG";
            default -> "compression " + compression;
        });
        if (intTag(dir, BaselineTIFFTagSet.TAG_PREDICTOR, 1) == 2) parts.add("horizontal predictor");
        parts.add(dir.getTIFFField(BaselineTIFFTagSet.TAG_TILE_OFFSETS) != null ? "tiled" : "striped");
        parts.add(little ? "little-endian" : "big-endian");
        return String.join(", ", parts);
    }
}
