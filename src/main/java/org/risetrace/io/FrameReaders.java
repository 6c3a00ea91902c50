package org.risetrace.io;

import org.risetrace.calibration.Profile;
import org.risetrace.frame.Decoding;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Picks the reader for a file by its first bytes, reads the file once, hashes those bytes (SHA-256), decodes them
 * and maps the samples to degrees Celsius. Adding a container is one class and one line in {@link #READERS}.
 */
public final class FrameReaders {
    /** Every reader, tried in order; the first that accepts the file reads it. */
    public static final List<FrameReader> READERS = List.of(
            new PngReader(), new TiffReader(), new PgmReader(), GreyReader.jpeg(), GreyReader.bmp(),
            new MatrixReader());

    /** File name extensions a series folder treats as frames. */
    public static final Set<String> FRAME_EXTENSIONS = Set.of(
            "png", "tif", "tiff", "pgm", "pnm", "jpg", "jpeg", "bmp", "csv", "tsv");

    private static final String SUPPORTED = "frames must be PNG, TIFF, PGM, JPEG, BMP, or a CSV/TSV matrix";

    private FrameReaders() {
    }

    /** Reads one frame, choosing the reader by the file's first bytes (and extension for text). */
    public static Frame read(Path file, ReadContext context) {
        byte[] bytes = bytes(file, context);
        return read(readerFor(file, bytes), file, bytes, context);
    }

    /**
     * Decodes bytes already in memory as if read from {@code name} (its extension picks the text readers), with
     * every check of {@link #read(Path, ReadContext)} but the file system's; for tests and fuzzing.
     */
    public static Frame read(Path name, byte[] bytes, ReadContext context) {
        if (bytes.length == 0) throw new InputRejected(name, "empty file (0 bytes)");
        return read(readerFor(name, bytes), name, bytes, context);
    }

    /** True when the file's extension marks it as a frame (what a series folder picks up). */
    public static boolean isImageFile(Path file) {
        String name = file.getFileName().toString();
        int dot = name.lastIndexOf('.');
        return dot > 0 && FRAME_EXTENSIONS.contains(name.substring(dot + 1).toLowerCase(Locale.ROOT));
    }

    /** The reader that accepts the file. */
    public static FrameReader readerFor(Path file, byte[] head) {
        for (FrameReader r : READERS) if (r.accepts(file, head)) return r;
        throw new InputRejected(file, "not a frame format risetrace reads", SUPPORTED);
    }

    /** Reads the file with a given reader (what {@link FrameReader#read} does). */
    static Frame read(FrameReader reader, Path file, ReadContext context) {
        byte[] bytes = bytes(file, context);
        if (!reader.accepts(file, bytes))
            throw new InputRejected(file, "not a " + reader.container().toUpperCase(Locale.ROOT) + " file", SUPPORTED);
        return read(reader, file, bytes, context);
    }

    private static Frame read(FrameReader reader, Path file, byte[] bytes, ReadContext context) {
        String sha = sha256(bytes);
        RawSamples s = reader.decode(file, bytes, context);
        Profile profile = context.profile() != null ? context.profile() : SampleMapping.defaultProfile(s.kind());
        float[] celsius = SampleMapping.toCelsius(file, s, profile, context.spanC());
        return new Frame(s.width(), s.height(), celsius, 0.0, null, file, sha,
                new Decoding(reader.container(), s.bitDepth(), profile.name(), s.detail()));
    }

    /** Decodes the stored samples without mapping them (for the sample kind and size). */
    public static RawSamples samples(Path file, ReadContext context) {
        byte[] bytes = bytes(file, context);
        return readerFor(file, bytes).decode(file, bytes, context);
    }

    /**
     * The file's bytes. Refuses missing, empty and implausibly large files before reading: no frame within the
     * pixel limit needs more than 32 bytes per pixel even as text.
     */
    static byte[] bytes(Path file, ReadContext context) {
        try {
            org.risetrace.frame.InputFiles.requireRegularFile(file, "frame file");
            long size = Files.size(file);
            if (size == 0) throw new InputRejected(file, "empty file (0 bytes)");
            long limit = Math.min(Integer.MAX_VALUE - 16L, context.maxPixels() * 32L + (1L << 20));
            String lower = file.getFileName().toString().toLowerCase(Locale.ROOT);
            if (lower.endsWith(".csv") || lower.endsWith(".tsv")) limit = Math.min(limit, MatrixReader.MAX_BYTES);
            if (size > limit)
                throw new InputRejected(file, "file of " + size + " bytes is larger than any frame within the pixel limit",
                        "raise the limit with --max-pixels if the frame is real");
            // the size may change between the check and the read: read no more than the limit
            return org.risetrace.frame.InputFiles.read(file, "frame file", limit);
        } catch (NoSuchFileException e) {
            throw new InputRejected(file, "file not found");
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read: " + e.getMessage(), null, e);
        }
    }

    /** Lower-case hex SHA-256 (FIPS 180-4) of the bytes. */
    public static String sha256(byte[] bytes) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every Java platform has SHA-256", e);
        }
    }

    static boolean startsWith(byte[] head, byte[] magic) {
        if (head.length < magic.length) return false;
        for (int i = 0; i < magic.length; i++) if (head[i] != magic[i]) return false;
        return true;
    }
}
