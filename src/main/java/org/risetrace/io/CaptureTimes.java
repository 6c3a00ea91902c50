package org.risetrace.io;

import org.apache.commons.imaging.FormatCompliance;
import org.apache.commons.imaging.Imaging;
import org.apache.commons.imaging.bytesource.ByteSource;
import org.apache.commons.imaging.formats.tiff.TiffContents;
import org.apache.commons.imaging.formats.tiff.TiffDirectory;
import org.apache.commons.imaging.formats.tiff.TiffReader;
import org.apache.commons.imaging.common.ImageMetadata;
import org.apache.commons.imaging.formats.jpeg.JpegImageMetadata;
import org.apache.commons.imaging.formats.tiff.TiffField;
import org.apache.commons.imaging.formats.tiff.TiffImageMetadata;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.LocalDateTime;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.List;

/**
 * Capture times from image metadata (JPEG APP1, TIFF directories, a PNG's eXIf chunk), read with Commons Imaging
 * without decoding pixels: EXIF DateTimeOriginal
 * (tag 0x9003) with SubSecTimeOriginal (0x9291) and OffsetTimeOriginal (0x9011) per CIPA DC-008 (EXIF 2.32),
 * else TIFF DateTime (tag 306, TIFF 6.0) with SubSecTime (0x9290) and OffsetTime (0x9010). Both date tags are
 * ASCII "YYYY:MM:DD HH:MM:SS"; sub-seconds are the decimal digits of the fraction ("25" = 0.25 s). Without an
 * offset tag the time is taken as UTC: it sets only {@code Frame.instant()}, the series times are differences.
 */
public final class CaptureTimes {
    static final int TAG_DATE_TIME = 0x0132;
    static final int TAG_DATE_TIME_ORIGINAL = 0x9003;
    static final int TAG_SUB_SEC_TIME = 0x9290;
    static final int TAG_SUB_SEC_TIME_ORIGINAL = 0x9291;
    static final int TAG_OFFSET_TIME = 0x9010;
    static final int TAG_OFFSET_TIME_ORIGINAL = 0x9011;

    private static final DateTimeFormatter EXIF_DATE = DateTimeFormatter.ofPattern("uuuu:MM:dd HH:mm:ss");

    private CaptureTimes() {
    }

    /** A capture time and the tag it came from. */
    public record CaptureTime(Instant instant, String tag) {
    }

    /** The capture time in the file's metadata, or null when it has none (or the file is not JPEG/TIFF/PNG). */
    public static CaptureTime read(Path file) {
        byte[] head = new byte[4];
        if (!Files.isRegularFile(file)) return null; // a FIFO would block the open
        try (InputStream in = Files.newInputStream(file)) {
            if (in.readNBytes(head, 0, 4) < 4) return null;
        } catch (IOException e) {
            return null;
        }
        boolean jpeg = (head[0] & 0xFF) == 0xFF && (head[1] & 0xFF) == 0xD8;
        boolean tiff = (head[0] == 'I' && head[1] == 'I' && head[2] == 42) || (head[0] == 'M' && head[1] == 'M' && head[3] == 42);
        boolean png = (head[0] & 0xFF) == 0x89 && head[1] == 'P' && head[2] == 'N' && head[3] == 'G';
        if (!jpeg && !tiff && !png) return null;
        try {
            if (png) {
                byte[] exif = pngExif(file);
                if (exif == null) return null;
                return fromFields(fields(new TiffReader(true).readDirectories(ByteSource.array(exif), false,
                        FormatCompliance.getDefault())));
            }
            if (tiff) {
                // only the directories (IFD 0, EXIF IFD, ...), not the strips: opening a long series stays cheap
                TiffContents contents = new TiffReader(true).readDirectories(ByteSource.file(file.toFile()), false,
                        FormatCompliance.getDefault());
                return fromFields(fields(contents));
            }
            ImageMetadata md = Imaging.getMetadata(file.toFile());
            TiffImageMetadata exif = md instanceof JpegImageMetadata j ? j.getExif()
                    : md instanceof TiffImageMetadata t ? t : null;
            if (exif == null) return null;
            return fromFields(exif.getAllFields());
        } catch (IOException | RuntimeException e) {
            return null; // a damaged file is reported when its pixels are decoded
        }
    }

    private static List<TiffField> fields(TiffContents contents) {
        List<TiffField> fields = new ArrayList<>();
        for (TiffDirectory d : contents.directories) fields.addAll(d.getDirectoryEntries());
        return fields;
    }

    /** Largest eXIf payload read (EXIF in a JPEG APP1 segment is limited to 64 KiB; allow some more). */
    static final int MAX_PNG_EXIF_BYTES = 1 << 20;

    /**
     * The data of a PNG's eXIf chunk (PNG extensions 1.5.0 and the PNG third edition: an EXIF block in TIFF
     * layout, "MM\0*" or "II*\0" first), or null when it has none. Only chunk headers are read on the way; the
     * chunk CRCs are checked when the pixels are decoded.
     */
    static byte[] pngExif(Path file) throws IOException {
        try (java.nio.channels.SeekableByteChannel ch = Files.newByteChannel(file)) {
            long pos = 8, size = ch.size();
            java.nio.ByteBuffer header = java.nio.ByteBuffer.allocate(8);
            while (pos + 12 <= size) {
                header.clear();
                ch.position(pos);
                while (header.hasRemaining()) if (ch.read(header) < 0) return null;
                long length = header.getInt(0) & 0xFFFFFFFFL;
                String type = new String(header.array(), 4, 4, java.nio.charset.StandardCharsets.ISO_8859_1);
                if (type.equals("IEND") || length > size - pos - 12) return null;
                if (type.equals("eXIf")) {
                    if (length < 8 || length > MAX_PNG_EXIF_BYTES) return null;
                    java.nio.ByteBuffer data = java.nio.ByteBuffer.allocate((int) length);
                    while (data.hasRemaining()) if (ch.read(data) < 0) return null;
                    return data.array();
                }
                pos += 12 + length;
            }
            return null;
        }
    }

    static CaptureTime fromFields(List<TiffField> fields) {
        Instant original = instant(text(fields, TAG_DATE_TIME_ORIGINAL), text(fields, TAG_SUB_SEC_TIME_ORIGINAL),
                text(fields, TAG_OFFSET_TIME_ORIGINAL));
        if (original != null) return new CaptureTime(original, "EXIF DateTimeOriginal");
        Instant dateTime = instant(text(fields, TAG_DATE_TIME), text(fields, TAG_SUB_SEC_TIME),
                text(fields, TAG_OFFSET_TIME));
        return dateTime == null ? null : new CaptureTime(dateTime, "TIFF DateTime");
    }

    private static String text(List<TiffField> fields, int tag) {
        for (TiffField f : fields) {
            if (f.getTag() != tag) continue;
            try {
                Object v = f.getValue();
                String s = v instanceof String[] a ? (a.length == 0 ? null : a[0]) : v == null ? null : v.toString();
                return s == null ? null : s.replace("\0", "").strip();
            } catch (Exception e) {
                return null;
            }
        }
        return null;
    }

    /** Parses an EXIF date-time with optional sub-second digits and "+HH:MM" offset; null when blank or invalid. */
    static Instant instant(String dateTime, String subSec, String offset) {
        if (dateTime == null || dateTime.length() < 19) return null;
        LocalDateTime local;
        try {
            local = LocalDateTime.parse(dateTime.substring(0, 19), EXIF_DATE);
        } catch (DateTimeParseException e) {
            return null; // unknown dates are written as blanks or colons only (CIPA DC-008)
        }
        ZoneOffset zone = ZoneOffset.UTC;
        if (offset != null && offset.matches("[+-]\\d\\d:\\d\\d")) {
            try {
                zone = ZoneOffset.of(offset);
            } catch (RuntimeException ignored) {
                zone = ZoneOffset.UTC;
            }
        }
        Instant t = local.toInstant(zone);
        if (subSec != null && subSec.matches("\\d+")) {
            String digits = subSec.length() > 9 ? subSec.substring(0, 9) : subSec;
            long nanos = Long.parseLong(digits) * (long) Math.pow(10, 9 - digits.length());
            t = t.plusNanos(nanos);
        }
        return t;
    }
}
