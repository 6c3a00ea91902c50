package org.risetrace.io;

import org.risetrace.frame.Frame;

import java.nio.file.Path;

/**
 * One container format. Readers decode the container into {@link RawSamples}; {@link FrameReaders} hashes the
 * file bytes, applies the calibration profile and builds the {@link Frame}, so every container gives the same
 * temperatures for the same samples.
 */
public interface FrameReader {
    /** Short container name as {@code Decoding.container()} reports it, e.g. "png". */
    String container();

    /** True when this reader handles the file, judged by its first bytes (magic) and, for text, its extension. */
    boolean accepts(Path file, byte[] head);

    /**
     * Decodes the file's bytes. Checks the header's pixel count against {@code context.maxPixels()} before
     * allocating the raster.
     *
     * @throws org.risetrace.frame.InputRejected on any problem with the data
     */
    RawSamples decode(Path file, byte[] bytes, ReadContext context);

    /** Reads, hashes and maps the file. Throws {@link org.risetrace.frame.InputRejected} on any user-data problem. */
    default Frame read(Path file, ReadContext context) {
        return FrameReaders.read(this, file, context);
    }
}
