package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.calibration.Material;
import org.risetrace.calibration.Materials;
import org.risetrace.calibration.Profile;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.io.Sidecar;
import org.risetrace.planning.BenchReading;
import org.risetrace.planning.BenchReadings;
import org.risetrace.planning.ReadingsFile;
import org.risetrace.planning.SeriesInjection;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Homography;
import org.risetrace.registration.Rectifier;
import org.risetrace.registration.Registrar;
import org.risetrace.registration.RegistrationConfig;
import org.risetrace.registration.Registrars;

import java.nio.file.Path;
import java.util.List;

/**
 * The analysis of a series folder or of a before/after pair, put together from the stages: the import stage's
 * {@link Series}, the registration stage's {@link Registrar} and {@link Rectifier}, and this stage's
 * {@link Analyzer}, {@link SeriesAnalysis} and {@link PairAnalysis}.
 */
public final class SeriesAnalyzer {
    private SeriesAnalyzer() {
    }

    /** Worker threads: every core, at least two (decoding of one frame overlaps registration of the next). */
    public static int defaultThreads() {
        return Math.max(2, Runtime.getRuntime().availableProcessors());
    }

    public static String version() {
        String v = SeriesAnalyzer.class.getPackage().getImplementationVersion();
        return v == null ? "dev" : v;
    }

    /**
     * Analyses a series against its board file.
     *
     * @param seriesLabel the series as the user named it (for analysis.json)
     * @param boardFile   the board file's path (for analysis.json and error messages)
     */
    public static Analysis analyze(Series series, Board board, Path boardFile, String seriesLabel,
                                   AnalysisOptions options, EmissivityModel emissivity, int threads,
                                   Analyzer.Progress progress) {
        return analyze(series, board, boardFile, seriesLabel, options, emissivity, threads, progress, null);
    }

    /** As above; {@code alsoInOrder} (may be null) sees every frame's sample in time order too (lock-in). */
    public static Analysis analyze(Series series, Board board, Path boardFile, String seriesLabel,
                                   AnalysisOptions options, EmissivityModel emissivity, int threads,
                                   Analyzer.Progress progress, java.util.function.Consumer<FrameSample> alsoInOrder) {
        if (series.size() == 0) throw new InputRejected(series.folder(), "the series has no frames");
        Frame reference = series.read(referenceIndex(series, board, boardFile));
        double pxPerMm = options.pxPerMm() != null ? options.pxPerMm() : Rectifier.defaultPxPerMm(board);
        // bounds before the large allocations: the board raster, then the workers' memory
        if (options.pxPerMm() != null) MemoryBudget.requireResolvesParts(board, pxPerMm, boardFile);
        long boardPixels = MemoryBudget.boardRasterPixels(board, pxPerMm, boardFile);
        threads = MemoryBudget.threadsThatFit(reference.source(), reference.width(), reference.height(), boardPixels,
                threads);
        Registrar registrar = options.stillCamera()
                ? Registrars.still(reference, board, RegistrationConfig.defaults())
                : Registrars.create(reference, board, RegistrationConfig.defaults());
        Rectifier rectifier = new Rectifier(board, pxPerMm);
        double[] times = new double[series.size()];
        for (int i = 0; i < times.length; i++) times[i] = series.tSeconds(i);
        Sidecar sidecar = series.sidecar() == null ? Sidecar.empty() : series.sidecar();
        Sidecar.Injection injection = sidecar.injection();
        SeriesInjection.planOf(injection, series.folder().resolve(org.risetrace.io.Sidecars.FILE_NAME)); // checked once here
        BenchReadings readings = benchReadings(series.folder());
        BaselinePlan plan = BaselinePlan.plan(times, injection == null ? null : injection.startS(),
                options.baselineFrames(), options.lastFrames());
        AmbientSampler probe = AmbientSampler.forBoard(board, options.ambientGapMm(), options.ambientBandMm());
        Profile profile = series.profile();
        SeriesAnalysis.Context context = new SeriesAnalysis.Context(seriesLabel, boardFile == null ? null : boardFile.toString(),
                profile == null ? null : profile.name(), injection, sidecar.reflectedC(), version(), probe.source());
        SeriesAnalysis sa = new SeriesAnalysis(board, options, plan, emissivity, context);
        FrameSource source = new FrameSource() {
            @Override public int size() { return series.size(); }
            @Override public String fileName(int i) { return series.fileName(i); }
            @Override public double tSeconds(int i) { return series.tSeconds(i); }
            @Override public Frame read(int i) { return series.read(i); }
        };
        Analysis a = Analyzer.run(source, board, () -> mapper(registrar, rectifier),
                () -> AmbientSampler.forBoard(board, options.ambientGapMm(), options.ambientBandMm()), sa, alsoInOrder,
                threads, progress).withBenchReadings(readings);
        a = a.withFrames(withInstants(a.result().frames(), series));
        // the worker threads are recorded: each thread's registrar starts a frame from its own last one, so another
        // count registers from other starts and the numbers differ within their errors (the same count repeats them)
        return a.withResult(a.result().withParameter("worker_threads", threads).withSeriesWarnings(series.warnings()));
    }

    /**
     * A series as its frames allow: exactly two frames are a before/after pair, compared part by part on their
     * rises as {@code compare} does (a rate needs at least three frames, so analysed over time such a pair could
     * only ever be inconclusive); any other series is analysed over time. The pair's result carries the frames'
     * capture instants and what reading the series assumed, as a series' does.
     */
    public static Analysis analyzeOrCompare(Series series, Board board, Path boardFile, String seriesLabel,
                                            AnalysisOptions options, int threads, Analyzer.Progress progress) {
        if (series.size() != 2)
            return analyze(series, board, boardFile, seriesLabel, options, emissivity(series.profile()), threads,
                    progress);
        Analysis a = compare(series.read(0), series.read(1), board, boardFile, options, series.sidecar(),
                series.profile());
        progress.update(2, 2);
        a = a.withFrames(withInstants(a.result().frames(), series));
        return a.withResult(a.result().withSeriesWarnings(series.warnings()));
    }

    /** True for the result of a before/after comparison ({@link #compare}). */
    public static boolean isComparison(Analysis a) {
        Object mode = a.result().parameters() == null ? null : a.result().parameters().get("mode");
        return "compare".equals(mode);
    }

    /** Each frame record with its capture instant from the image metadata, matched by file name. */
    static List<FrameRecord> withInstants(List<FrameRecord> records, Series series) {
        java.util.Map<String, java.time.Instant> at = new java.util.HashMap<>();
        for (int i = 0; i < series.size(); i++) at.put(series.fileName(i), series.instant(i));
        List<FrameRecord> out = new java.util.ArrayList<>(records.size());
        for (FrameRecord r : records) out.add(r.withInstant(at.get(r.file())));
        return out;
    }

    /** The folder's readings.csv, assessed; null when there is none (planning stage, {@link ReadingsFile}). */
    static BenchReadings benchReadings(Path folder) {
        if (folder == null) return null;
        List<BenchReading> list = ReadingsFile.readIfPresent(folder);
        return list == null ? null : BenchReadings.assess(folder.resolve(ReadingsFile.FILE_NAME).toString(), list);
    }

    /** Compares two frames; the board outline is marked on one of them (or on a frame that looks like them). */
    public static Analysis compare(Frame before, Frame after, Board board, Path boardFile, AnalysisOptions options,
                                   String profileName) {
        return compare(before, after, board, boardFile, options, null, null, profileName);
    }

    /**
     * As above with the frames' sidecar and profile: the sidecar's injection record and reflected temperature go
     * into analysis.json and the emissivity correction, the profile's band and materials correct each part's rise
     * (both may be null: no injection record, no correction).
     */
    public static Analysis compare(Frame before, Frame after, Board board, Path boardFile, AnalysisOptions options,
                                   Sidecar sidecar, Profile profile) {
        return compare(before, after, board, boardFile, options, sidecar, profile,
                profile == null ? null : profile.name());
    }

    private static Analysis compare(Frame before, Frame after, Board board, Path boardFile, AnalysisOptions options,
                                    Sidecar sidecar, Profile profile, String profileName) {
        String refName = board.outline() == null ? null : board.outline().frame();
        Frame reference = after.fileName().equals(refName) ? after : before;
        double pxPerMm = options.pxPerMm() != null ? options.pxPerMm() : Rectifier.defaultPxPerMm(board);
        if (options.pxPerMm() != null) MemoryBudget.requireResolvesParts(board, pxPerMm, boardFile);
        MemoryBudget.threadsThatFit(reference.source(), reference.width(), reference.height(),
                MemoryBudget.boardRasterPixels(board, pxPerMm, boardFile), 1);
        Registrar registrar = options.stillCamera()
                ? Registrars.still(reference, board, RegistrationConfig.defaults())
                : Registrars.create(reference, board, RegistrationConfig.defaults());
        AmbientSampler ambient = AmbientSampler.forBoard(board, options.ambientGapMm(), options.ambientBandMm());
        SeriesAnalysis.Context context = new SeriesAnalysis.Context(before.source() + " -> " + after.source(),
                boardFile == null ? null : boardFile.toString(), profileName,
                sidecar == null ? null : sidecar.injection(), sidecar == null ? null : sidecar.reflectedC(), version(),
                ambient.source());
        return PairAnalysis.compare(before, after, board, mapper(registrar, new Rectifier(board, pxPerMm)), ambient,
                options, context, emissivity(profile));
    }

    /**
     * The emissivity model for a series: each part's material from the bundled materials table (else the profile's
     * default emissivity), the profile's band, and the radiometry stage's band-radiance correction; no correction
     * when the profile is unknown.
     */
    public static EmissivityModel emissivity(Profile profile) {
        if (profile == null) return EmissivityModel.none();
        Materials materials = Materials.load();
        return EmissivityModel.of(name -> {
            if (!materials.contains(name)) return null;
            Material m = materials.get(name);
            return new EmissivityModel.Emissivity(m.emissivity(), m.uncertainty(), m.source());
        }, profile.defaultEmissivity(), profile.bandUm());
    }

    static BoardMapper mapper(Registrar registrar, Rectifier rectifier) {
        return new BoardMapper() {
            @Override public FrameRegistration register(Frame frame) { return registrar.register(frame); }
            @Override public BoardRaster rectify(Frame frame, Homography h) { return rectifier.rectify(frame, h); }
        };
    }

    /** The frame the outline was marked on; the first frame when the board file names none. */
    static int referenceIndex(Series series, Board board, Path boardFile) {
        String name = board.outline() == null ? null : board.outline().frame();
        if (name == null || name.isBlank()) return 0;
        for (int i = 0; i < series.size(); i++) if (series.fileName(i).equals(name)) return i;
        throw new InputRejected(boardFile, "the outline is marked on frame '" + name + "', which is not in the series "
                + series.folder(), "mark the outline on a frame of this series (risetrace board)");
    }
}
