package org.risetrace.bench;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.batch.BatchRunner;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.io.write.FrameEncoding;
import org.risetrace.registration.Registrar;
import org.risetrace.registration.Registrars;
import org.risetrace.registration.RegistrationConfig;
import org.risetrace.report.Reports;
import org.risetrace.sim.Scenario;
import org.risetrace.sim.Scenarios;
import org.risetrace.sim.Simulator;

import javax.imageio.ImageIO;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.lang.management.ManagementFactory;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.TimeUnit;
import java.util.function.Consumer;
import java.util.stream.Stream;

/**
 * {@code risetrace bench}: makes its own synthetic series with the simulator (16-bit PNG and TIFF, hand-held and
 * on a stand) in a temporary folder and measures in one run, so the ratios compare numbers taken under the same
 * load: the bare JDK decode ({@link ImageIO#read}, the limit for reading at all), the tool's import, import and
 * registration, the full analysis with its report (rates in frames per second, each also as a ratio to the bare
 * decode), the peak heap; batch throughput with one job against two; a cold {@code analyze} in a new JVM (plain
 * and with the launcher's settings); and, in child JVMs under one fixed heap limit, the heap and the time per frame
 * of the series against one ten times as long. The folder is removed at the end unless kept.
 */
public final class Bench {
    /** Heap limit of the child JVMs that compare a series with one ten times as long (issue 11, item 7). */
    public static final String CHILD_XMX = "-Xmx256m";
    /**
     * A heap limit near what the analysis needs on one thread at 640 x 512 ({@code MemoryBudget} asks about 118 MB
     * there and refuses 96m), so the collector has to collect instead of growing into free room.
     */
    public static final String TIGHT_XMX = "-Xmx128m";

    /**
     * @param quick   tiny sizes (160 x 128, 12 frames, 60 for the long series) for a test of the command itself;
     *                the numbers then mean nothing
     * @param workDir a folder in which a new folder for the series is made (null: the system's temporary folder)
     * @param keep    keep the generated series and outputs
     */
    public record Options(boolean quick, Path workDir, boolean keep) {
        int width() { return quick ? 160 : 640; }
        int height() { return quick ? 128 : 512; }
        int frames() { return quick ? 12 : 300; }
        int longFrames() { return 10 * frames(); }
        /** The cold start is timed on issue 11's case: 150 frames of 640 x 480, hand-held, 16-bit PNG. */
        int coldWidth() { return quick ? 160 : 640; }
        int coldHeight() { return quick ? 128 : 480; }
        int coldFrames() { return quick ? 12 : 150; }
    }

    /** One generated series: rates in frames per second, one thread unless said. */
    public record SeriesRow(String series, int frames, double decodeFps, double importFps, double registrationFps,
                            double analysisFps, double analysisAllCoresFps, long peakHeapBytes, String verdict) {
        public double importRatio() { return importFps / decodeFps; }
        public double registrationRatio() { return registrationFps / decodeFps; }
        public double analysisRatio() { return analysisFps / decodeFps; }
        public double analysisAllCoresRatio() { return analysisAllCoresFps / decodeFps; }
    }

    /** The four series as one batch, frames per second. */
    public record BatchRow(int seriesCount, int frames, double oneJobOneThreadFps, double oneJobAllThreadsFps,
                           double twoJobsFps, int warmUpBatches, Double lastWarmUpCompilerShare,
                           double timedCompilerShare) {
        public double twoJobsRatio() { return twoJobsFps / oneJobOneThreadFps; }
    }

    /** A cold {@code analyze} of the hand-held PNG series in a new JVM. */
    public record ColdRow(String settings, double wallSeconds, String timing) {
    }

    /** A child JVM's analysis of a series. */
    public record HeapRow(int frames, String heapLimit, int threads, double msPerFrame, long peakInUseBytes, long poolPeakBytes,
                          long afterGcMaxBytes, long liveMaxBytes, long retainedBytes, String verdict) {
    }

    /** A target of issue 11 and whether this run met it. */
    public record Target(String what, double value, String bound, boolean met) {
    }

    /**
     * @param warmUpRounds           untimed rounds (each decodes and analyses every series once, all cores) before
     *                               the series were measured
     * @param lastWarmUpCompilerShare the compilers' time in the last of them as a share of its wall time (null: none)
     */
    public record Result(int cores, String java, double loadAverageBefore, double loadAverageAfter, int width,
                         int height, boolean quick, int warmUpRounds, Double lastWarmUpCompilerShare,
                         List<SeriesRow> series, BatchRow batch, List<ColdRow> cold, List<HeapRow> heap,
                         List<Target> targets) {
    }

    /** Untimed rounds run, and the compilers' share of the last one's wall time (null: none ran). */
    private record WarmUp(int rounds, Double lastShare) {
    }

    /**
     * Runs untimed rounds until the compilers spent at most {@link #SETTLED} of one's wall time, at most
     * {@link #MAX_WARM_UP_BATCHES}; {@code round} runs one and returns its wall time in seconds.
     */
    private static WarmUp untilSettled(java.util.function.DoubleSupplier round) {
        int rounds = 0;
        Double share = null;
        while (rounds < MAX_WARM_UP_BATCHES) {
            double compiled0 = compilerMillis();
            double s = round.getAsDouble();
            rounds++;
            share = (compilerMillis() - compiled0) / 1000.0 / s;
            if (!(share > SETTLED)) break; // NaN: the JVM does not time its compilers; one round then
        }
        return new WarmUp(rounds, share);
    }

    /**
     * Before the series are measured: rounds of the bare decode (warmed too: a cold one would flatter the ratios) and
     * an all-cores analysis of every series, {@link #untilSettled until the compilers settle}. One pass over one
     * series, as before the seventh pass, left the optimising compiler at work through the measurements: on the
     * 640 x 512 TIFF series one thread analysed 41-75 frames/s in the first three passes of a process and 87-143
     * from the fifth on (profiled, the compiler threads still took 16-22 % of the samples in passes five to eight).
     * An analyst's batch of hundreds of series runs in the settled state; the cold row measures the other end.
     */
    private static WarmUp warmUp(List<Path> series, Path out) {
        return untilSettled(() -> {
            long t0 = System.nanoTime();
            for (Path dir : series) {
                decodeAll(Series.open(dir));
                analyse(dir, BoardFile.read(dir.resolve("board.json"), null), out, SeriesAnalyzer.defaultThreads());
            }
            return seconds(t0);
        });
    }

    private Bench() {
    }

    /** Runs every measurement; {@code log} hears what is being done. */
    public static Result run(Options o, Consumer<String> log) {
        double loadBefore = ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
        Path work;
        try {
            work = o.workDir() != null ? Files.createTempDirectory(Files.createDirectories(o.workDir()), "risetrace-bench-")
                    : Files.createTempDirectory("risetrace-bench-");
        } catch (IOException e) {
            throw new org.risetrace.frame.InputRejected(o.workDir(), "cannot make a folder for the benchmark's series: "
                    + e.getMessage(), "name a writable folder with --work-dir");
        }
        try {
            Path root = work.resolve("series");
            List<Path> series = new ArrayList<>();
            String[] names = {"hand-held-png", "hand-held-tiff", "stand-png", "stand-tiff"};
            for (String name : names) {
                log.accept("generating " + name + " (" + o.frames() + " frames of " + o.width() + " x " + o.height() + ")");
                Path dir = root.resolve(name);
                Simulator.run(scenario(o, name), dir);
                series.add(dir);
            }
            WarmUp warm = new WarmUp(0, null);
            if (!o.quick()) { // the JIT compiles the hot code before anything is timed
                log.accept("warming up (untimed decodes and analyses of the four series until the compilers settle)");
                warm = warmUp(series, work.resolve("warm-up"));
            }
            List<SeriesRow> rows = new ArrayList<>();
            for (int k = 0; k < names.length; k++) {
                log.accept("measuring " + names[k]);
                rows.add(measure(names[k], series.get(k), work.resolve("out-" + names[k])));
            }
            log.accept("batch: untimed batches until the compilers settle, then one job on one thread, one job on all "
                    + "threads, two jobs, twice");
            BatchRow batch = batch(root, work, o.frames() * names.length, names.length, o.quick() ? 1 : 2, !o.quick());
            Path coldSeries = work.resolve("cold-series");
            log.accept("generating the cold-start case (" + o.coldFrames() + " frames of " + o.coldWidth() + " x "
                    + o.coldHeight() + ", hand-held PNG)");
            Simulator.run(scenario(o, "hand-held-png").withSize(o.coldWidth(), o.coldHeight())
                    .withFrames(o.coldFrames(), 0.5, 5.0), coldSeries);
            log.accept("cold analyze in a new JVM");
            // the launcher's run three times (the fastest counts: a shared machine's load only ever adds time;
            // the three are shown), the JVM's defaults once for comparison
            List<ColdRow> cold = new ArrayList<>(List.of(
                    cold("java -jar (JVM defaults)", List.of(), coldSeries, work.resolve("cold-a"))));
            int launcherRuns = o.quick() ? 1 : 3;
            for (int k = 1; k <= launcherRuns; k++)
                cold.add(cold("launcher settings (" + String.join(" ", launcherFlags()) + ")"
                        + (launcherRuns > 1 ? ", run " + k + " of " + launcherRuns : ""), launcherFlags(), coldSeries,
                        work.resolve("cold-b" + k)));
            log.accept("heap: " + o.frames() + " and " + o.longFrames() + " frames in child JVMs");
            Path longSeries = repeated(series.get(0), work.resolve("long"), o.longFrames());
            List<HeapRow> heap = List.of(
                    child(series.get(0), work.resolve("heap-short"), CHILD_XMX),
                    child(longSeries, work.resolve("heap-long"), CHILD_XMX),
                    child(series.get(0), work.resolve("heap-default"), null),
                    child(series.get(0), work.resolve("heap-tight-short"), TIGHT_XMX, 1),
                    child(longSeries, work.resolve("heap-tight-long"), TIGHT_XMX, 1));
            double loadAfter = ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
            return new Result(Runtime.getRuntime().availableProcessors(), System.getProperty("java.version"),
                    loadBefore, loadAfter, o.width(), o.height(), o.quick(), warm.rounds(), warm.lastShare(), rows, batch, cold,
                    heap, targets(rows, batch, cold, heap));
        } finally {
            if (!o.keep()) deleteTree(work);
        }
    }

    static Scenario scenario(Options o, String name) {
        Scenario s = Scenarios.small(0.3).withSize(o.width(), o.height()).withFrames(o.frames(), 0.5, 5.0);
        s = name.startsWith("hand-held") ? s.withMotion(Scenario.Motion.handheld(0.5, 0.01, 0.01))
                : s.withMotion(Scenario.Motion.stand(0.03));
        return s.withEncoding(name.endsWith("tiff") ? FrameEncoding.U16_CENTIKELVIN_TIFF : FrameEncoding.U16_CENTIKELVIN_PNG);
    }

    /** The four rates of one series, each step over every frame on the calling thread, then all cores. */
    static SeriesRow measure(String name, Path dir, Path out) {
        Series s = Series.open(dir);
        int n = s.size();
        // bare decode: the JDK's ImageIO, file to image, nothing else
        long t0 = System.nanoTime();
        decodeAll(s);
        double decode = n / seconds(t0);
        // our import: open the series, read (hash, decode, map to Celsius) every frame
        t0 = System.nanoTime();
        Series opened = Series.open(dir);
        for (int i = 0; i < n; i++) opened.read(i);
        double imported = n / seconds(t0);
        // import and registration onto the board
        Board board = BoardFile.read(dir.resolve("board.json"), null);
        t0 = System.nanoTime();
        Series again = Series.open(dir);
        Registrar registrar = Registrars.create(again.read(0), board, RegistrationConfig.defaults());
        for (int i = 0; i < n; i++) {
            Frame f = again.read(i);
            registrar.register(f);
        }
        double registered = n / seconds(t0);
        // the full analysis with its report, one thread, then every core; peak heap of the one-thread run
        double one;
        long peak;
        String verdict;
        try (HeapWatch watch = new HeapWatch()) {
            t0 = System.nanoTime();
            verdict = analyse(dir, board, out.resolve("one-thread"), 1);
            one = n / seconds(t0);
            peak = watch.poolPeakBytes();
        }
        t0 = System.nanoTime();
        analyse(dir, board, out.resolve("all-cores"), SeriesAnalyzer.defaultThreads());
        double all = n / seconds(t0);
        return new SeriesRow(name, n, decode, imported, registered, one, all, peak, verdict);
    }

    /** Every frame of the series through the JDK's ImageIO, file to image, nothing else. */
    private static void decodeAll(Series s) {
        for (Path f : s.files()) {
            try {
                if (ImageIO.read(f.toFile()) == null) throw new IllegalStateException("ImageIO cannot read " + f);
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
    }

    private static String analyse(Path dir, Board board, Path out, int threads) {
        Series s = Series.open(dir);
        var a = SeriesAnalyzer.analyze(s, board, dir.resolve("board.json"), dir.toString(), AnalysisOptions.defaults(),
                SeriesAnalyzer.emissivity(s.profile()), threads, Analyzer.Progress.NONE);
        Reports.writeAll(a, out, s.sidecar() == null ? null : s.sidecar().notes(), true);
        return a.result().verdict().status().word() + (a.result().verdict().ref() == null ? "" : " " + a.result().verdict().ref());
    }

    /**
     * Batch throughput three ways. The optimising compiler goes on compiling the once-per-series code (the end of the
     * analysis, the report) for several batches after the per-series measurements, since each batch runs it only four
     * times: measured with the compilers' own clock, 10.8 s of compiler CPU in the first batch, then 4.4, 3.3, 1.2-2.3
     * and 0.6 s in the next ones (20 s batches). On one job with one thread that work takes the idle core, so the
     * "one thread" baseline ran on 1.2-1.3 cores and two jobs looked like 1.6-1.7 times one. So untimed batches
     * first until the compilers spent at most {@link #SETTLED} of a batch's wall time (at most
     * {@link #MAX_WARM_UP_BATCHES}; none when {@code warmUp} is false), then {@code rounds} rounds of the three ways
     * alternated, the fastest of each kept. A long batch of an analyst (hundreds of series) runs almost all of its
     * time in that settled state.
     */
    static BatchRow batch(Path root, Path work, int frames, int count, int rounds, boolean warmUp) {
        BatchRunner.Options base = BatchRunner.Options.defaults().withForce(true);
        BatchRunner.Options oneOne = new BatchRunner.Options(base.analysis(), null, 1, 1, true, base.shard());
        BatchRunner.Options oneAll = new BatchRunner.Options(base.analysis(), null, 1, null, true, base.shard());
        BatchRunner.Options two = new BatchRunner.Options(base.analysis(), null, 2, 1, true, base.shard());
        // none, or NaN as the share when the JVM does not time its compilers (one batch then)
        WarmUp settled = warmUp ? untilSettled(() -> batchSeconds(root, work.resolve("batch-warm-up"), two))
                : new WarmUp(0, null);
        double a = Double.POSITIVE_INFINITY, b = Double.POSITIVE_INFINITY, c = Double.POSITIVE_INFINITY;
        double compiled0 = compilerMillis();
        double timed = 0;
        for (int r = 0; r < rounds; r++) {
            double x = batchSeconds(root, work.resolve("batch-1x1"), oneOne);
            double y = batchSeconds(root, work.resolve("batch-1"), oneAll);
            double z = batchSeconds(root, work.resolve("batch-2"), two);
            a = Math.min(a, x);
            b = Math.min(b, y);
            c = Math.min(c, z);
            timed += x + y + z;
        }
        double timedShare = (compilerMillis() - compiled0) / 1000.0 / timed;
        return new BatchRow(count, frames, frames / a, frames / b, frames / c, settled.rounds(), settled.lastShare(),
                timedShare);
    }

    /** Untimed batches and rounds stop once the compilers' time in one is at most this share of its wall time. */
    static final double SETTLED = 0.05;
    static final int MAX_WARM_UP_BATCHES = 8;

    /** The JIT compilers' accumulated time, ms (NaN when this JVM does not measure it). */
    static double compilerMillis() {
        java.lang.management.CompilationMXBean c = ManagementFactory.getCompilationMXBean();
        return c != null && c.isCompilationTimeMonitoringSupported() ? c.getTotalCompilationTime() : Double.NaN;
    }

    private static double batchSeconds(Path root, Path out, BatchRunner.Options options) {
        long t0 = System.nanoTime();
        BatchRunner.Outcome outcome = BatchRunner.run(root, out, options, BatchRunner.Listener.NONE);
        double s = seconds(t0);
        if (outcome.summary().failed() != 0) throw new IllegalStateException("a series of the benchmark failed");
        return s;
    }

    /** The launcher's JVM settings (the script {@code risetrace}), with the class-data archive when it is found. */
    static List<String> launcherFlags() {
        List<String> flags = new ArrayList<>(List.of("-XX:TieredStopAtLevel=1", "-XX:+UseSerialGC"));
        Path jsa = archive();
        if (jsa != null) flags.addAll(List.of("-XX:SharedArchiveFile=" + jsa, "-Xshare:auto", "-Xlog:cds=off",
                "-Xlog:cds+dynamic=off"));
        return flags;
    }

    /** risetrace.jsa beside the jar this runs from (the build makes it), or null. */
    static Path archive() {
        String cp = System.getProperty("java.class.path", "");
        if (!cp.endsWith(".jar") || cp.contains(java.io.File.pathSeparator)) return null;
        Path jsa = Path.of(cp).toAbsolutePath().resolveSibling("risetrace.jsa");
        return Files.isRegularFile(jsa) ? jsa : null;
    }

    static ColdRow cold(String label, List<String> flags, Path series, Path out) {
        List<String> cmd = new ArrayList<>(List.of(javaBin()));
        cmd.addAll(flags);
        cmd.addAll(List.of("-Drisetrace.timing=true", "-cp", classPath(), "org.risetrace.cli.Main", "analyze",
                series.toString(), "--out", out.toString(), "--force"));
        long t0 = System.nanoTime();
        String output = exec(cmd);
        double wall = seconds(t0);
        String timing = output.lines().filter(l -> l.contains("timing:")).findFirst()
                .map(l -> l.substring(l.indexOf("timing:") + 7).trim()).orElse("");
        return new ColdRow(label, wall, timing);
    }

    /** Runs {@link HeapProbe} on a series in a child JVM (heap limit {@code xmx}, e.g. "-Xmx256m"; null: default). */
    public static HeapRow child(Path series, Path out, String xmx) {
        return child(series, out, xmx, 0);
    }

    /** As above on {@code threads} worker threads (0: as {@code analyze} chooses). */
    public static HeapRow child(Path series, Path out, String xmx, int threads) {
        List<String> cmd = new ArrayList<>(List.of(javaBin()));
        if (xmx != null) cmd.add(xmx);
        cmd.addAll(List.of("-cp", classPath(), HeapProbe.class.getName(), series.toString(), out.toString()));
        if (threads > 0) cmd.add(Integer.toString(threads));
        String line = exec(cmd).lines().filter(l -> l.startsWith("frames=")).reduce((a, b) -> b)
                .orElseThrow(() -> new IllegalStateException("the heap probe printed no result"));
        int frames = Integer.parseInt(field(line, "frames"));
        double s = Double.parseDouble(field(line, "seconds"));
        return new HeapRow(frames, xmx == null ? "default" : xmx.substring("-Xmx".length()), threads, 1000 * s / frames,
                Long.parseLong(field(line, "peak_in_use_bytes")), Long.parseLong(field(line, "pool_peak_bytes")), Long.parseLong(field(line, "after_gc_max_bytes")),
                Long.parseLong(field(line, "live_max_bytes")), Long.parseLong(field(line, "retained_bytes")),
                field(line, "verdict"));
    }

    private static String field(String line, String key) {
        for (String part : line.split(" ")) if (part.startsWith(key + "=")) return part.substring(key.length() + 1);
        throw new IllegalStateException("no " + key + " in " + line);
    }

    private static String javaBin() {
        return Path.of(System.getProperty("java.home"), "bin", "java").toString();
    }

    private static String classPath() {
        return System.getProperty("java.class.path");
    }

    private static String exec(List<String> cmd) {
        try {
            Process p = new ProcessBuilder(cmd).redirectErrorStream(true).start();
            byte[] bytes = p.getInputStream().readAllBytes();
            if (!p.waitFor(1, TimeUnit.HOURS)) p.destroyForcibly();
            String out = new String(bytes, StandardCharsets.UTF_8);
            if (p.exitValue() != 0)
                throw new IllegalStateException("child JVM failed (exit " + p.exitValue() + "): " + String.join(" ", cmd)
                        + "\n" + out);
            return out;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted", e);
        }
    }

    /**
     * A series {@code count} frames long made of the given one's frames (hard links, copies where links cannot be
     * made), played forward and back so no frame jumps, at the same interval and with the same injection start;
     * the board file follows the renamed reference frame.
     */
    public static Path repeated(Path source, Path target, int count) {
        try {
            Files.createDirectories(target);
            Series s = Series.open(source);
            int n = s.size(), period = Math.max(1, 2 * n - 2);
            ObjectMapper json = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
            ObjectNode sidecar = (ObjectNode) json.readTree(source.resolve("series.json").toFile());
            double interval = sidecar.path("frame_interval_s").asDouble(0.5);
            ObjectNode frames = json.createObjectNode();
            String ext = s.fileName(0).substring(s.fileName(0).lastIndexOf('.'));
            String reference = null;
            ObjectNode board = (ObjectNode) json.readTree(source.resolve("board.json").toFile());
            String marked = board.path("outline").path("frame").asText(null);
            for (int i = 0; i < count; i++) {
                int c = i % period, j = n == 1 ? 0 : c < n ? c : period - c;
                String name = String.format(Locale.ROOT, "f%06d%s", i + 1, ext);
                Path link = target.resolve(name);
                if (!Files.exists(link)) {
                    try {
                        Files.createLink(link, s.files().get(j));
                    } catch (IOException | UnsupportedOperationException e) {
                        Files.copy(s.files().get(j), link);
                    }
                }
                frames.putObject(name).put("t_s", i * interval);
                if (reference == null && s.fileName(j).equals(marked)) reference = name;
            }
            sidecar.set("frames", frames);
            json.writeValue(target.resolve("series.json").toFile(), sidecar);
            if (marked != null && reference != null) ((ObjectNode) board.get("outline")).put("frame", reference);
            JsonNode outlineFrames = board.path("outline").path("frames");
            if (outlineFrames.isObject() && outlineFrames.size() > 0) ((ObjectNode) board.get("outline")).remove("frames");
            json.writeValue(target.resolve("board.json").toFile(), board);
            return target;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static List<Target> targets(List<SeriesRow> rows, BatchRow batch, List<ColdRow> cold, List<HeapRow> heap) {
        List<Target> t = new ArrayList<>();
        double worstOne = rows.stream().mapToDouble(SeriesRow::analysisRatio).min().orElse(Double.NaN);
        double worstAll = rows.stream().mapToDouble(SeriesRow::analysisAllCoresRatio).min().orElse(Double.NaN);
        t.add(new Target("full analysis / bare decode, one thread (worst series)", worstOne, ">= 0.5", worstOne >= 0.5));
        t.add(new Target("full analysis / bare decode, all cores (worst series)", worstAll, ">= 0.5", worstAll >= 0.5));
        t.add(new Target("batch: two jobs / one job on one thread", batch.twoJobsRatio(), ">= 1.7",
                batch.twoJobsRatio() >= 1.7));
        double coldBest = cold.stream().mapToDouble(ColdRow::wallSeconds).min().orElse(Double.NaN);
        t.add(new Target("cold analyze, seconds (fastest run)", coldBest, "<= 3.7",
                coldBest <= 3.7));
        HeapRow shortRun = heap.get(0), longRun = heap.get(1), defaultHeap = heap.get(2);
        // (heap.get(2) is the same series as heap.get(0) with the JVM's default heap)
        // the live heap at ten sampled moments depends on which transients exist then (frames in flight, a
        // worker's chain-link reference model: tens of MiB at 640 x 512); the 300-frame series is sampled twice (the
        // fixed and the default heap), and the long series is compared with the larger of the two
        double shortLive = Math.max(shortRun.liveMaxBytes(), defaultHeap.liveMaxBytes());
        double heapRatio = longRun.liveMaxBytes() / shortLive;
        t.add(new Target("live heap (full collections), " + longRun.frames() + " / " + shortRun.frames()
                + " frames (larger of its two runs)", heapRatio, "<= 1.1", heapRatio <= 1.1));
        // the same in a heap near what the analysis needs on one thread (one worker: fewer transients in flight).
        // The peak heap the run needs is the largest live heap, not the peak in use or the largest heap left after
        // any collection: both follow the collector's timing (with room to spare, G1 grows its young generation
        // the longer a run lasts; under 128m the heap after a collection was 0.96 and 1.22 times as large at 3,000
        // frames as at 300 in two runs of the same jar, the live heap 1.05 and 1.07); both are printed
        HeapRow tightShort = heap.get(3), tightLong = heap.get(4);
        double tightLive = (double) tightLong.liveMaxBytes() / tightShort.liveMaxBytes();
        t.add(new Target("live heap (full collections), " + tightLong.frames() + " / " + tightShort.frames()
                + " frames (" + tightLong.heapLimit() + ", one thread)", tightLive, "<= 1.1", tightLive <= 1.1));
        double tightPerFrame = tightLong.msPerFrame() / tightShort.msPerFrame();
        t.add(new Target("time per frame, " + tightLong.frames() + " / " + tightShort.frames() + " frames ("
                + tightLong.heapLimit() + ", one thread)", tightPerFrame, "<= 1.2", tightPerFrame <= 1.2));
        double perFrame = longRun.msPerFrame() / defaultHeap.msPerFrame();
        t.add(new Target("time per frame, " + longRun.frames() + " frames " + longRun.heapLimit() + " / "
                + defaultHeap.frames() + " frames default heap", perFrame, "<= 1.2", perFrame <= 1.2));
        return t;
    }

    /** The result as the table the command prints. */
    public static String table(Result r) {
        StringBuilder b = new StringBuilder();
        b.append(String.format(Locale.ROOT, "risetrace bench: %d x %d, %d frames per series, %d cores, Java %s, "
                        + "load average %.2f before, %.2f after%s%n", r.width(), r.height(),
                r.series().isEmpty() ? 0 : r.series().get(0).frames(), r.cores(), r.java(), r.loadAverageBefore(),
                r.loadAverageAfter(), r.quick() ? " (--quick: sizes for a test, numbers mean nothing)" : ""));
        if (r.warmUpRounds() > 0)
            b.append(String.format(Locale.ROOT, "%n(%d untimed rounds over the four series before, compilers %.0f %% "
                    + "of the last one's wall time)", r.warmUpRounds(), 100 * r.lastWarmUpCompilerShare()));
        b.append(String.format(Locale.ROOT, "%n%-15s %12s %16s %16s %16s %16s %10s  %s%n", "series",
                "decode f/s", "import", "+registration", "analysis 1 thr", "analysis all", "peak MiB", "verdict"));
        for (SeriesRow s : r.series())
            b.append(String.format(Locale.ROOT, "%-15s %12.1f %8.1f (%4.2fx) %8.1f (%4.2fx) %8.1f (%4.2fx) %8.1f (%4.2fx) %10.1f  %s%n",
                    s.series(), s.decodeFps(), s.importFps(), s.importRatio(), s.registrationFps(), s.registrationRatio(),
                    s.analysisFps(), s.analysisRatio(), s.analysisAllCoresFps(), s.analysisAllCoresRatio(),
                    s.peakHeapBytes() / 1048576.0, s.verdict()));
        b.append("(frames per second; in brackets the ratio to the bare decode; import = read, hash, decode, map to "
                + "Celsius; analysis includes the report)\n");
        BatchRow bt = r.batch();
        b.append(String.format(Locale.ROOT, "%nbatch of %d series, %d frames (%s): one job, one thread "
                        + "%.1f f/s; one job, all threads %.1f f/s; two jobs %.1f f/s = %.2fx one job on one thread%n",
                bt.seriesCount(), bt.frames(), r.quick() ? "one round" : "fastest of two rounds", bt.oneJobOneThreadFps(),
                bt.oneJobAllThreadsFps(), bt.twoJobsFps(), bt.twoJobsRatio()));
        b.append(bt.warmUpBatches() == 0 ? "(no untimed batch before; "
                : String.format(Locale.ROOT, "(%d untimed batches before, compilers %.0f %% of the last one's wall time; ",
                bt.warmUpBatches(), 100 * bt.lastWarmUpCompilerShare()));
        b.append(String.format(Locale.ROOT, "compilers %.0f %% of the timed ones' wall time)%n",
                100 * bt.timedCompilerShare()));
        b.append(String.format(Locale.ROOT, "%ncold analyze in a new JVM (%s):%n", r.quick() ? "12 frames of 160 x 128"
                : "150 frames of 640 x 480, hand-held, 16-bit PNG"));
        for (ColdRow c : r.cold())
            b.append(String.format(Locale.ROOT, "  %6.2f s  %s%n          %s%n", c.wallSeconds(), c.settings(), c.timing()));
        b.append("\nheap in child JVMs (analysis and report):\n");
        for (HeapRow h : r.heap())
            b.append(String.format(Locale.ROOT, "  %5d frames, heap %-8s %-11s %7.2f ms/frame, peak in use %7.1f MiB "
                            + "(pools' own peaks summed %7.1f), after any collection %7.1f MiB, live (full collections) "
                            + "%6.1f MiB, result held %6.2f MiB, %s%n", h.frames(), h.heapLimit(),
                    h.threads() == 0 ? "all threads" : h.threads() == 1 ? "one thread" : h.threads() + " threads",
                    h.msPerFrame(),
                    h.peakInUseBytes() / 1048576.0, h.poolPeakBytes() / 1048576.0,
                    h.afterGcMaxBytes() / 1048576.0, h.liveMaxBytes() / 1048576.0, h.retainedBytes() / 1048576.0,
                    h.verdict()));
        if (r.heap().size() >= 5) {
            List<HeapRow> h = r.heap(); // 0, 1: short and long at 256m; 3, 4: short and long at 128m
            b.append(String.format(Locale.ROOT, "  (%d / %d frames: peak in use %.2f with %s, %.2f with %s; largest after "
                            + "any collection %.2f and %.2f: these follow when the collector runs, not what the "
                            + "analysis holds)%n", h.get(1).frames(), h.get(0).frames(),
                    ratio(h.get(1), h.get(0), HeapRow::peakInUseBytes), h.get(1).heapLimit(),
                    ratio(h.get(4), h.get(3), HeapRow::peakInUseBytes), h.get(4).heapLimit(),
                    ratio(h.get(1), h.get(0), HeapRow::afterGcMaxBytes), ratio(h.get(4), h.get(3), HeapRow::afterGcMaxBytes)));
        }
        b.append("\ntargets:\n");
        for (Target t : r.targets())
            b.append(String.format(Locale.ROOT, "  %-4s %-78s %8.2f  (%s)%n", t.met() ? "met" : "MISS", t.what(),
                    t.value(), t.bound()));
        return b.toString();
    }

    private static double ratio(HeapRow a, HeapRow b, java.util.function.ToLongFunction<HeapRow> f) {
        return (double) f.applyAsLong(a) / f.applyAsLong(b);
    }

    /** The result as JSON (snake_case names). */
    public static String json(Result r) {
        try {
            return new ObjectMapper().setPropertyNamingStrategy(PropertyNamingStrategies.SNAKE_CASE)
                    .enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(r);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static double seconds(long t0) {
        return (System.nanoTime() - t0) / 1e9;
    }

    private static void deleteTree(Path dir) {
        if (!Files.exists(dir)) return;
        try (Stream<Path> walk = Files.walk(dir)) {
            for (Path p : walk.sorted(Comparator.reverseOrder()).toList()) Files.deleteIfExists(p);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
