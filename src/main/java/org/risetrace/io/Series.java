package org.risetrace.io;

import org.risetrace.calibration.Profile;
import org.risetrace.calibration.Profiles;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.NoSuchElementException;
import java.util.stream.Stream;

/**
 * An ordered, lazily read sequence of frames with its sidecar and calibration profile.
 *
 * <p>Opening a series lists the frame files, reads the sidecar, chooses the profile and assigns every frame its
 * time, without decoding pixels (except the first frame's, when the profile must be inferred from its samples).
 * Frames are decoded only by {@link #read(int)} and the iterator, which keep no reference to them: a
 * 10,000-frame series costs the memory of the frames the caller holds. {@link #read(int)} is thread-safe.
 *
 * <p>Times: per-frame {@code t_s} from the sidecar; else capture times from image metadata (see
 * {@link CaptureTimes}), relative to the first frame; else the file-name order ({@link NaturalOrder}) with the
 * sidecar's {@code frame_interval_s} (1 s assumed, with a warning, when it is missing). Times must rise strictly
 * in file-name order; a time that goes backwards or repeats is refused naming both frames.
 *
 * <p>Profile: the override (command line), else the sidecar's {@code profile}, else a default by the first
 * frame's samples (16-bit counts: u16-centikelvin, float: f32-celsius, 8-bit grey: u8-span, text:
 * matrix-celsius) with a warning saying so.
 */
public final class Series implements Iterable<Frame> {
    /** The bench meter readings beside the frames (read by the planning stage); never taken as a CSV frame. */
    public static final String BENCH_READINGS_FILE = "readings.csv";

    private final Path folder;
    private final Path sidecarFile;
    private final Sidecar sidecar;
    private final Profile profile;
    private final List<String> warnings;
    private final List<Path> files;
    private final double[] tSeconds;
    private final Instant[] instants;
    private final String timeSource;
    private final long maxPixels;
    /** Width and height of the first frame, learnt when it is first decoded or probed. */
    private volatile int[] referenceSize;

    private Series(Path folder, Path sidecarFile, Sidecar sidecar, Profile profile, List<String> warnings,
                   List<Path> files, double[] tSeconds, Instant[] instants, String timeSource, long maxPixels,
                   int[] referenceSize) {
        this.folder = folder;
        this.sidecarFile = sidecarFile;
        this.sidecar = sidecar;
        this.profile = profile;
        this.warnings = List.copyOf(warnings);
        this.files = List.copyOf(files);
        this.tSeconds = tSeconds;
        this.instants = instants;
        this.timeSource = timeSource;
        this.maxPixels = maxPixels;
        this.referenceSize = referenceSize;
    }

    /** The frames in a folder, with the folder's {@code series.json} when there is one. */
    public static Series open(Path folder) {
        return open(folder, null, ReadContext.DEFAULT_MAX_PIXELS);
    }

    public static Series open(Path folder, String profileOverrideOrNull, long maxPixels) {
        if (!Files.exists(folder)) throw new InputRejected(folder, "folder not found");
        if (!Files.isDirectory(folder)) throw new InputRejected(folder, "not a folder");
        List<Path> entries;
        try (Stream<Path> s = Files.list(folder)) {
            entries = new ArrayList<>(s.toList());
        } catch (IOException e) {
            throw new InputRejected(folder, "cannot list the folder: " + e.getMessage(), null, e);
        }
        Path sidecar = folder.resolve(Sidecars.FILE_NAME);
        if (Files.exists(sidecar) || Files.isSymbolicLink(sidecar))
            org.risetrace.frame.InputFiles.requireRegularFile(sidecar, "sidecar file");
        return build(folder, entries, Files.isRegularFile(sidecar) ? sidecar : null, profileOverrideOrNull,
                maxPixels, true);
    }

    /** Frames named one by one; a file named series.json among them is taken as the sidecar. */
    public static Series open(List<Path> files, Path sidecarOrNull, String profileOverrideOrNull) {
        return open(files, sidecarOrNull, profileOverrideOrNull, ReadContext.DEFAULT_MAX_PIXELS);
    }

    public static Series open(List<Path> files, Path sidecarOrNull, String profileOverrideOrNull, long maxPixels) {
        if (files.isEmpty()) throw new InputRejected(null, "no frame files named");
        Path folder = sidecarOrNull != null ? sidecarOrNull.toAbsolutePath().getParent()
                : files.get(0).toAbsolutePath().getParent();
        for (Path f : files) org.risetrace.frame.InputFiles.requireRegularFile(f, "frame file");
        if (sidecarOrNull != null) org.risetrace.frame.InputFiles.requireRegularFile(sidecarOrNull, "sidecar file");
        return build(folder, files, sidecarOrNull, profileOverrideOrNull, maxPixels, false);
    }

    private static Series build(Path folder, List<Path> entries, Path sidecarFile, String override, long maxPixels,
                                boolean listed) {
        if (maxPixels <= 0) throw new IllegalArgumentException("maxPixels must be positive");
        List<String> warnings = new ArrayList<>();
        List<Path> frames = new ArrayList<>();
        for (Path p : entries) {
            String name = p.getFileName().toString();
            String lower = name.toLowerCase(Locale.ROOT);
            if (Files.isDirectory(p)) {
                if (!listed) warnings.add("skipped " + p + ": a folder (name the folder alone to read it as a series)");
                continue;
            }
            if (name.startsWith(".")) continue;
            if (!Files.isRegularFile(p)) {
                // a FIFO would block the first read forever, a device never ends
                if (lower.equals(Sidecars.FILE_NAME))
                    org.risetrace.frame.InputFiles.requireRegularFile(p, "sidecar file");
                warnings.add("skipped " + name + ": not a regular file (a FIFO, device, socket or broken link)");
                continue;
            }
            if (lower.equals(Sidecars.FILE_NAME)) {
                if (sidecarFile == null) sidecarFile = p;
                continue;
            }
            if (lower.endsWith(".json")) continue; // board, truth and registration files belong to other stages
            if (lower.equals(BENCH_READINGS_FILE)) continue; // meter readings (planning stage), not a CSV frame
            if (FrameReaders.isImageFile(p)) frames.add(p);
            else warnings.add("skipped " + name + ": not a frame file");
        }
        if (frames.isEmpty())
            throw new InputRejected(folder, "no frame files", "frames must be PNG, TIFF, PGM, JPEG, BMP, CSV or TSV");
        frames.sort((a, b) -> NaturalOrder.INSTANCE.compare(a.getFileName().toString(), b.getFileName().toString()));

        Sidecar sidecar = sidecarFile == null ? Sidecar.empty() : Sidecars.load(sidecarFile);
        Map<String, Sidecar.FrameEntry> entriesByName = sidecar.frames() == null ? Map.of() : sidecar.frames();
        // one line for all absent entries of a folder; frames named one by one (compare, frame-view, inspect) are
        // picked from a capture, so the sidecar's entries for the other frames are expected to be left out
        List<String> absent = new ArrayList<>();
        java.util.Set<String> present = new java.util.HashSet<>();
        for (Path f : frames) present.add(f.getFileName().toString());
        if (listed)
            for (String name : entriesByName.keySet()) if (!present.contains(name)) absent.add(name);
        absent.sort(NaturalOrder.INSTANCE);
        if (absent.size() == 1)
            warnings.add(Sidecars.FILE_NAME + " lists frame '" + absent.get(0) + "', which is not in the series");
        else if (absent.size() > 1)
            warnings.add(Sidecars.FILE_NAME + " lists " + absent.size() + " frames that are not among the frames read ('"
                    + absent.get(0) + "' to '" + absent.get(absent.size() - 1) + "'); their entries are not used");

        Profile profile;
        int[] reference = null;
        if (override != null && !override.isBlank()) {
            profile = Profiles.load(override, null);
        } else if (sidecar.profile() != null && !sidecar.profile().isBlank()) {
            profile = Profiles.load(sidecar.profile(), sidecarFile.toAbsolutePath().getParent());
        } else {
            RawSamples first = FrameReaders.samples(frames.get(0), new ReadContext(null, null, maxPixels));
            profile = SampleMapping.defaultProfile(first.kind());
            reference = new int[]{first.width(), first.height()};
            warnings.add("no calibration profile named: assumed " + profile.name() + " for the " + first.describe()
                    + " in " + frames.get(0).getFileName()
                    + " (name one with --profile or \"profile\" in series.json)");
        }

        int n = frames.size();
        checkSpans(frames, sidecar, sidecarFile, entriesByName, profile, warnings);
        double[] t = new double[n];
        Instant[] instants = new Instant[n];
        String source = times(frames, sidecar, sidecarFile, entriesByName, t, instants, warnings);
        Double start = sidecar.injection() == null ? null : sidecar.injection().startS();
        if (start != null && start < t[0])
            warnings.add(String.format(Locale.ROOT, "injection.start_s (%.3f s) is before the first frame (%.3f s):"
                    + " no frame shows the board before the injection, so the first frame is taken as the baseline",
                    start, t[0]));
        else if (start != null && start >= t[n - 1])
            warnings.add(String.format(Locale.ROOT, "injection.start_s (%.3f s) is at or after the last frame (%.3f s):"
                    + " no frame shows the board during the injection", start, t[n - 1]));
        Series series = new Series(folder, sidecarFile, sidecar, profile, warnings, frames, t, instants, source,
                maxPixels, reference);
        if (reference != null) series.checkTotal(reference);
        return series;
    }

    private static String times(List<Path> frames, Sidecar sidecar, Path sidecarFile,
                                Map<String, Sidecar.FrameEntry> entries, double[] t, Instant[] instants,
                                List<String> warnings) {
        int n = frames.size();
        PerFrame withT = PerFrame.count(frames, entries, e -> e.tS() != null);
        if (withT.with() > 0) {
            if (withT.with() < n)
                throw new InputRejected(sidecarFile, "frame " + withT.firstWithout() + " has no t_s while "
                        + withT.with() + " other frames have one", "give every frame a t_s under \"frames\", or none");
            for (int i = 0; i < n; i++) t[i] = entries.get(frames.get(i).getFileName().toString()).tS();
            checkRising(frames, t, sidecarFile, "t_s");
            // the sidecar's times rule, but the absolute capture time the files carry is still worth reporting
            // (README, "Frame order and times"): kept only when every frame has one
            for (int i = 0; i < n; i++) {
                CaptureTimes.CaptureTime c = CaptureTimes.read(frames.get(i));
                if (c == null) {
                    java.util.Arrays.fill(instants, null);
                    break;
                }
                instants[i] = c.instant();
            }
            return "series.json t_s";
        }
        CaptureTimes.CaptureTime[] ct = new CaptureTimes.CaptureTime[n];
        int withCapture = 0;
        for (int i = 0; i < n; i++) {
            ct[i] = CaptureTimes.read(frames.get(i));
            if (ct[i] != null) withCapture++;
        }
        Double interval = sidecar.frameIntervalS();
        if (withCapture == n) {
            for (int i = 0; i < n; i++) {
                instants[i] = ct[i].instant();
                t[i] = Duration.between(ct[0].instant(), ct[i].instant()).toNanos() / 1e9;
            }
            int bad = firstNotRising(t);
            if (bad < 0) return ct[0].tag();
            if (interval == null) checkRising(frames, t, frames.get(bad), ct[bad].tag());
            warnings.add("capture times in the image metadata do not rise at " + frames.get(bad).getFileName()
                    + "; using frame_interval_s from series.json instead");
            java.util.Arrays.fill(instants, null);
        } else if (withCapture > 0) {
            warnings.add("only " + withCapture + " of " + n + " frames carry a capture time in their metadata;"
                    + " using file-name order");
        }
        if (interval == null) {
            interval = 1.0;
            if (n > 1)
                warnings.add("no frame times: assumed 1 s between frames in file-name order"
                        + " (set frame_interval_s or per-frame t_s in series.json)");
        }
        for (int i = 0; i < n; i++) t[i] = i * interval;
        return "file-name order";
    }

    /** How many frames' sidecar entries give a field, and the first frame whose entry does not. */
    private record PerFrame(int with, String firstWithout) {
        static PerFrame count(List<Path> frames, Map<String, Sidecar.FrameEntry> entries,
                              java.util.function.Predicate<Sidecar.FrameEntry> gives) {
            int with = 0;
            String missing = null;
            for (Path f : frames) {
                Sidecar.FrameEntry e = entries.get(f.getFileName().toString());
                if (e != null && gives.test(e)) with++;
                else if (missing == null) missing = f.getFileName().toString();
            }
            return new PerFrame(with, missing);
        }
    }

    /**
     * Spans of greyscale frames: per frame for every frame or for none (an auto-ranging camera changes its span
     * from frame to frame, so a frame without its own would be read on another span, silently); and where they come
     * from the profile alone, a warning that names the span assumed (a bundled profile's span is a placeholder, not
     * what the camera showed).
     */
    private static void checkSpans(List<Path> frames, Sidecar sidecar, Path sidecarFile,
                                   Map<String, Sidecar.FrameEntry> entries, Profile profile, List<String> warnings) {
        PerFrame withSpan = PerFrame.count(frames, entries, e -> e.spanC() != null);
        if (withSpan.with() > 0 && withSpan.with() < frames.size() && sidecar.spanC() == null)
            throw new InputRejected(sidecarFile, "frame " + withSpan.firstWithout() + " has no span_c while "
                    + withSpan.with() + " other frames have one",
                    "give every frame its span_c under \"frames\", or a span_c for all");
        if (withSpan.with() == 0 && sidecar.spanC() == null && profile != null && "span".equals(profile.encoding())
                && profile.spanC() != null)
            warnings.add(String.format(Locale.ROOT, "no span_c in %s: greyscale frames read on the profile %s's span"
                            + " %.4g to %.4g \u00b0C (set span_c in series.json to the span the camera showed)",
                    Sidecars.FILE_NAME, profile.name(), profile.spanC()[0], profile.spanC()[1]));
    }

    private static int firstNotRising(double[] t) {
        for (int i = 1; i < t.length; i++) if (!(t[i] > t[i - 1])) return i;
        return -1;
    }

    private static void checkRising(List<Path> frames, double[] t, Path blame, String what) {
        int i = firstNotRising(t);
        if (i < 0) return;
        String verb = t[i] == t[i - 1] ? "repeats the time of" : "goes back in time from";
        throw new InputRejected(blame, String.format(Locale.ROOT,
                        "frame %s (%s %.3f s) %s %s (%.3f s)", frames.get(i).getFileName(), what, t[i], verb,
                        frames.get(i - 1).getFileName(), t[i - 1]),
                "times must rise in file-name order: fix the times or rename the files");
    }

    public Path folder() {
        return folder;
    }

    /** The sidecar file, or null when the series has none. */
    public Path sidecarFile() {
        return sidecarFile;
    }

    /** The sidecar (empty when there is none). */
    public Sidecar sidecar() {
        return sidecar;
    }

    public Profile profile() {
        return profile;
    }

    /** Messages for the user: skipped files, assumed defaults. */
    public List<String> warnings() {
        return warnings;
    }

    /** Where the times came from: "series.json t_s", "EXIF DateTimeOriginal", "TIFF DateTime", "file-name order". */
    public String timeSource() {
        return timeSource;
    }

    public int size() {
        return files.size();
    }

    public List<Path> files() {
        return files;
    }

    public Path file(int i) {
        return files.get(i);
    }

    public String fileName(int i) {
        return files.get(i).getFileName().toString();
    }

    /** Seconds from the series start (first frame 0 unless the sidecar's t_s say otherwise). */
    public double tSeconds(int i) {
        return tSeconds[i];
    }

    /**
     * Why frame {@code before} cannot be the "before" of a comparison with frame {@code after}: it was captured
     * later (by times the series knows: series.json t_s or the files' capture times; file-name order says nothing);
     * null when the order is right or unknown. Swapped, a heated part reads as cooled and a comparison finds no
     * heating with confidence.
     */
    public String orderProblem(int before, int after) {
        if ("file-name order".equals(timeSource) || !(tSeconds[before] > tSeconds[after])) return null;
        return String.format(java.util.Locale.ROOT, "the before frame %s was captured %s s after the after frame %s "
                + "(%s)", fileName(before), fixedSeconds(tSeconds[before] - tSeconds[after]), fileName(after),
                timeSource);
    }

    private static String fixedSeconds(double s) {
        return s == Math.rint(s) ? String.valueOf((long) s) : String.format(java.util.Locale.ROOT, "%.3f", s);
    }

    /** Absolute capture instant from image metadata, or null. */
    public Instant instant(int i) {
        return instants[i];
    }

    /** The span for frame i: the sidecar's per-frame span, else its series span, else null (the profile's). */
    public double[] spanC(int i) {
        Sidecar.FrameEntry e = sidecar.frames() == null ? null : sidecar.frames().get(fileName(i));
        if (e != null && e.spanC() != null) return e.spanC();
        return sidecar.spanC();
    }

    public long maxPixels() {
        return maxPixels;
    }

    /** Decodes frame i now (no caching; safe to call from several threads). */
    public Frame read(int i) {
        Path file = files.get(i);
        Frame f = FrameReaders.read(file, new ReadContext(profile, spanC(i), maxPixels));
        int[] ref = referenceSize;
        if (ref == null) {
            if (i == 0) {
                checkTotal(new int[]{f.width(), f.height()});
                referenceSize = new int[]{f.width(), f.height()};
                ref = referenceSize;
            } else {
                ref = probeReference();
            }
        }
        if (f.width() != ref[0] || f.height() != ref[1])
            throw new InputRejected(file, "frame is " + f.width() + " x " + f.height() + " pixels but the series' first frame "
                    + fileName(0) + " is " + ref[0] + " x " + ref[1], "every frame of a series must have one size");
        return f.withTime(tSeconds[i], instants[i]);
    }

    /**
     * The most pixels a series may hold over all its frames (every frame has the first one's size, so this is frames
     * x first frame's pixels): 2^33, e.g. 28,000 frames of 640 x 480. Beyond it an analysis would run for hours.
     */
    public static final long MAX_SERIES_PIXELS = 1L << 33;

    private void checkTotal(int[] size) {
        requireTotal(folder, files.size(), size[0], size[1]);
    }

    static void requireTotal(Path folder, int frames, int width, int height) {
        double total = (double) width * height * frames;
        if (total > MAX_SERIES_PIXELS)
            throw new InputRejected(folder, String.format(Locale.ROOT, "%d frames of %d x %d pixels are %.2f G pixels,"
                            + " over the limit of %.2f G pixels per series", frames, width, height, total / 1e9,
                    MAX_SERIES_PIXELS / 1e9), "split the series or bin the frames");
    }

    private synchronized int[] probeReference() {
        if (referenceSize == null) {
            RawSamples s = FrameReaders.samples(files.get(0), new ReadContext(profile, spanC(0), maxPixels));
            checkTotal(new int[]{s.width(), s.height()});
            referenceSize = new int[]{s.width(), s.height()};
        }
        return referenceSize;
    }

    /** Decodes frames one at a time, in order; holds no reference to a frame once it is returned. */
    @Override
    public Iterator<Frame> iterator() {
        return new Iterator<>() {
            private int next;

            @Override
            public boolean hasNext() {
                return next < files.size();
            }

            @Override
            public Frame next() {
                if (next >= files.size()) throw new NoSuchElementException();
                return read(next++);
            }
        };
    }

    @Override
    public String toString() {
        return "Series[" + folder + ", " + files.size() + " frames, profile " + profile.name() + ", times from "
                + timeSource + "]";
    }
}
