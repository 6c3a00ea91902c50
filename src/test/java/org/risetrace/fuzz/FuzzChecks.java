package org.risetrace.fuzz;

import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.board.PlacementImport;
import org.risetrace.calibration.Profile;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.FrameReaders;
import org.risetrace.io.ReadContext;
import org.risetrace.io.Sidecar;
import org.risetrace.io.Sidecars;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.function.Supplier;

/**
 * The property every fuzz target checks: a reader given any bytes returns a frame or a document, or throws
 * {@link InputRejected} with a one-line message; any other exception or error (including OutOfMemoryError, with the
 * fuzz profile's 1 GB heap), or a single input taking over {@link #MAX_MILLIS} of CPU time, is a finding. In fuzzing
 * mode libFuzzer's {@code -timeout} (wall clock) also stops an input that never returns.
 */
final class FuzzChecks {
    /** Longest one input may take. */
    static final long MAX_MILLIS = 2000;
    /** Pixel limit for the frame targets: small enough that the 1 GB heap is never the limit that decides. */
    static final ReadContext CONTEXT = new ReadContext(null, null, 1L << 22);

    private static final Path DIR;

    static {
        try {
            DIR = Files.createTempDirectory("risetrace-fuzz");
            DIR.toFile().deleteOnExit();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private FuzzChecks() { }

    /**
     * Inputs a JVM runs before the time limit applies: the first ones load and instrument the decoders' classes (up
     * to seconds on a loaded machine), which says nothing about the input.
     */
    static final int WARM_UP_INPUTS = 50;
    private static final java.lang.management.ThreadMXBean THREADS = java.lang.management.ManagementFactory.getThreadMXBean();
    private static int inputs;

    static <T> void check(Supplier<T> read) {
        // CPU time of this thread, not wall time: other processes on the machine do not make an input slow
        long t0 = THREADS.getCurrentThreadCpuTime();
        try {
            T result = read.get();
            if (result == null) throw new AssertionError("a reader returned null");
        } catch (InputRejected e) {
            if (e.getMessage() == null || e.getMessage().isBlank()) throw new AssertionError("a refusal without a message", e);
            if (e.getMessage().contains("\n")) throw new AssertionError("a refusal of more than one line: " + e.getMessage(), e);
        }
        long ms = (THREADS.getCurrentThreadCpuTime() - t0) / 1_000_000;
        if (++inputs > WARM_UP_INPUTS && ms > MAX_MILLIS)
            throw new AssertionError("one input took " + ms + " ms of CPU time");
    }

    /** A frame decoded from bytes as if from a file of that name. */
    static void frame(String name, byte[] data) {
        check(() -> {
            Frame f = FrameReaders.read(Path.of(name), data, CONTEXT);
            if (f.width() <= 0 || f.height() <= 0 || f.celsius().length != f.width() * f.height())
                throw new AssertionError("inconsistent frame " + f.width() + " x " + f.height());
            return f;
        });
    }

    /** Writes the bytes to a file of that name (documents are read from files) and returns it. */
    static Path file(String name, byte[] data) {
        try {
            return Files.write(DIR.resolve(name), data);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static void board(byte[] data) {
        Path f = file("board.json", data);
        check(() -> {
            Board b = BoardFile.read(f, null);
            if (!(b.widthMm() > 0 && b.heightMm() > 0)) throw new AssertionError("a board without a size");
            return b;
        });
    }

    static void sidecar(byte[] data) {
        Path f = file("series.json", data);
        check(() -> {
            Sidecar s = Sidecars.load(f);
            return s;
        });
    }

    static void profile(byte[] data) {
        Path f = file("profile.json", data);
        check(() -> {
            Profile p = Profiles.load(f.toString(), null);
            return p;
        });
    }

    static void placement(byte[] data) {
        Path f = file("placement.csv", data);
        check(() -> PlacementImport.read(f, PlacementImport.Options.defaults()));
    }
}
