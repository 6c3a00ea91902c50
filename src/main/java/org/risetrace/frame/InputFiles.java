package org.risetrace.frame;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.AccessDeniedException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;

/**
 * Opening an input file safely: only a regular file (a FIFO would block the open forever, a device such as
 * /dev/zero never ends, a folder cannot be read), and never more than a stated number of bytes, whatever the file
 * system says its size is.
 */
public final class InputFiles {
    /** Limit for the JSON and CSV documents the tool reads (board file, series.json, profile, placement list). */
    public static final long MAX_DOCUMENT_BYTES = 16L << 20;

    private InputFiles() { }

    /**
     * Refuses a path that is not a regular file: missing, a folder, a FIFO, a device or a socket.
     *
     * @param what what the file should be, for the message ("board file", "calibration profile", ...)
     */
    public static void requireRegularFile(Path file, String what) {
        if (Files.isRegularFile(file)) return;
        if (!Files.exists(file)) throw new InputRejected(file, what + " not found");
        if (Files.isDirectory(file)) throw new InputRejected(file, "is a folder, not a " + what);
        throw new InputRejected(file, "is not a regular file (a FIFO, device or socket), not a " + what);
    }

    /** The file's bytes, at most {@code maxBytes} (refused beyond: the read stops there). */
    public static byte[] read(Path file, String what, long maxBytes) {
        requireRegularFile(file, what);
        try (InputStream in = Files.newInputStream(file)) {
            long limit = Math.min(Integer.MAX_VALUE - 16L, maxBytes + 1);
            // the size the file system states sizes the array (one array, no copies for a file read whole); it is
            // only a hint: the read goes on to the end of the file or the limit, whichever comes first
            byte[] b = new byte[(int) Math.max(0, Math.min(Files.size(file), limit - 1))];
            int n = in.readNBytes(b, 0, b.length);
            if (n < b.length) b = java.util.Arrays.copyOf(b, n); // shorter than stated
            byte[] rest = in.readNBytes((int) (limit - n));        // longer than stated (or stated 0)
            if (rest.length > 0) {
                b = java.util.Arrays.copyOf(b, n + rest.length);
                System.arraycopy(rest, 0, b, n, rest.length);
            }
            if (b.length > maxBytes)
                throw new InputRejected(file, what + " is larger than " + sizeText(maxBytes), "is it the right file?");
            return b;
        } catch (NoSuchFileException e) {
            throw new InputRejected(file, what + " not found");
        } catch (AccessDeniedException e) {
            throw new InputRejected(file, "no permission to read the " + what);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read the " + what + ": " + e.getClass().getSimpleName()
                    + (e.getMessage() == null ? "" : " " + e.getMessage()), null, e);
        }
    }

    /** A JSON or CSV document of at most {@link #MAX_DOCUMENT_BYTES}. */
    public static byte[] readDocument(Path file, String what) {
        return read(file, what, MAX_DOCUMENT_BYTES);
    }

    static String sizeText(long bytes) {
        return bytes % (1 << 20) == 0 ? (bytes >> 20) + " MiB" : bytes + " bytes";
    }
}
