package org.risetrace.frame;

import java.nio.file.Path;
import java.time.Instant;
import java.util.Objects;

/**
 * One decoded thermal frame: a row-major temperature raster in degrees Celsius plus its time and provenance.
 *
 * <p>{@code celsius[y * width + x]} is the apparent temperature of pixel (x, y). The array is owned by the frame;
 * callers must not modify it. {@code Float.NaN} marks a pixel without a reading.
 *
 * @param width       pixels per row
 * @param height      rows
 * @param celsius     temperatures, row-major, length width * height
 * @param tSeconds    seconds from the start of the series (0 for the first frame)
 * @param instant     absolute capture instant when the file or sidecar says so, else null
 * @param source      the file the frame was read from
 * @param sha256      lower-case hex SHA-256 of the source file's bytes
 * @param decoding    how the file was decoded
 */
public record Frame(int width, int height, float[] celsius, double tSeconds, Instant instant,
                    Path source, String sha256, Decoding decoding) {

    public Frame {
        if (width <= 0 || height <= 0) throw new IllegalArgumentException("frame size " + width + "x" + height);
        Objects.requireNonNull(celsius, "celsius");
        if (celsius.length != width * height)
            throw new IllegalArgumentException("raster length " + celsius.length + " != " + width + "x" + height);
    }

    /** Temperature of pixel (x, y) in degrees Celsius. */
    public float at(int x, int y) {
        return celsius[y * width + x];
    }

    /** The same raster with another time (series ordering assigns times after decoding). */
    public Frame withTime(double newTSeconds, Instant newInstant) {
        return new Frame(width, height, celsius, newTSeconds, newInstant, source, sha256, decoding);
    }

    /** File name of the source, as the board file and reports refer to frames. */
    public String fileName() {
        return source == null ? "" : source.getFileName().toString();
    }
}
