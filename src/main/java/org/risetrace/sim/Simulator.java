package org.risetrace.sim;

import org.risetrace.registration.Homography;
import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import com.fasterxml.jackson.databind.ObjectWriter;
import org.risetrace.board.Board;
import org.risetrace.board.Outline;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;
import org.risetrace.io.write.FrameEncoding;
import org.risetrace.io.write.FrameWriters;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * Runs a scenario: the board heat model through the series' time span, then the camera model per frame, and
 * writes the frames, {@code series.json}, {@code board.json} and {@code truth.json}. Same scenario and seed give
 * the same bytes (seeded generators only, no wall clock; frames rendered in parallel are independent).
 */
public final class Simulator {
    private Simulator() {
    }

    /** JSON writer with fixed "\n" line ends, so the bytes do not depend on the platform. */
    static final ObjectWriter JSON_OUT;

    static {
        DefaultPrettyPrinter pp = new DefaultPrettyPrinter()
                .withObjectIndenter(new DefaultIndenter("  ", "\n"))
                .withArrayIndenter(DefaultPrettyPrinter.FixedSpaceIndenter.instance);
        JSON_OUT = Scenario.JSON.writer(pp);
    }

    /** Thermal history sampled at the frame times. */
    record History(double[] tS, float[][] cellsC, double[][] partsC, double[] ambientC, double[] powerW,
                   double loC, double hiC, Truth.Energy energy, BoardModel model) {
    }

    /** Receives each frame's thermal state as soon as the heat model has reached the frame's time. */
    interface FrameSink {
        void accept(int frame, float[] cellsC, double[] partsC, double ambientC);
    }

    /** Runs the heat model and samples it at the frame times (no camera). */
    static History thermal(Scenario s) {
        return thermal(s, null, null);
    }

    /** As {@link #thermal(Scenario)}, reusing a board model and handing each frame to {@code sink} (may be null). */
    static History thermal(Scenario s, BoardModel given, FrameSink sink) {
        BoardModel bm = given != null ? given : new BoardModel(s);
        ThermalModel tm = bm.model;
        int cells = bm.nx * bm.ny, nParts = bm.parts.size(), n = s.frames().count();
        double amb0 = bm.ambientAt(0);
        tm.fill(amb0);
        double[] power = new double[tm.nodes()];
        if ("idle-steady".equals(s.board().initialOrDefault())) tm.steady(bm.idleW.clone(), amb0);
        double[] initial = tm.temperature().clone();
        double[] tS = new double[n], ambient = new double[n], powerW = new double[n];
        float[][] cellSnap = new float[n][];
        double[][] partSnap = new double[n][];
        double lo = amb0, hi = amb0;
        double t = 0, dt = s.frames().timeStepOrDefault();
        for (int k = 0; k < n; k++) {
            double tk = k * s.frames().intervalS();
            while (t < tk - 1e-9) {
                double h = Math.min(dt, tk - t);
                bm.powerOver(t, t + h, power);
                tm.step(h, power, bm.ambientAt(t + h));
                t += h;
            }
            t = tk;
            tS[k] = tk;
            ambient[k] = bm.ambientAt(tk);
            powerW[k] = s.fault().powerW() * bm.onFraction(tk, tk + 1e-6);
            double[] temp = tm.temperature();
            float[] c = new float[cells];
            for (int i = 0; i < cells; i++) {
                c[i] = (float) temp[i];
                lo = Math.min(lo, temp[i]);
                hi = Math.max(hi, temp[i]);
            }
            double[] p = new double[nParts];
            for (int i = 0; i < nParts; i++) {
                p[i] = temp[cells + i];
                lo = Math.min(lo, p[i]);
                hi = Math.max(hi, p[i]);
            }
            lo = Math.min(lo, ambient[k]);
            hi = Math.max(hi, ambient[k]);
            cellSnap[k] = c;
            partSnap[k] = p;
            if (sink != null) sink.accept(k, c, p, ambient[k]);
        }
        Truth.Energy energy = new Truth.Energy(tm.injectedJ(), tm.storedJ(initial), tm.lostJ());
        return new History(tS, cellSnap, partSnap, ambient, powerW, lo, hi, energy, bm);
    }

    /** Simulates the scenario and writes everything into {@code outDir} (created when missing). */
    public static SimulationOutput run(Scenario s, Path outDir) {
        try {
            Files.createDirectories(outDir);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create " + outDir, e);
        }
        BoardModel bm = new BoardModel(s);
        Renderer renderer = new Renderer(s, bm);
        // apparent-temperature tables from 20 K below to 60 K above ambient; they grow when a part gets hotter
        double amb0 = bm.ambientAt(0);
        renderer.prepare(amb0 - 20, amb0 + 60);

        int n = s.frames().count();
        double wMm = s.board().widthMm(), hMm = s.board().heightMm();
        Homography base = CameraModel.basePose(s.camera(), wMm, hMm);
        Homography[] motion = CameraModel.motions(s.camera(), n, s.seed());
        Homography[] boardToFrame = new Homography[n];
        for (int k = 0; k < n; k++) boardToFrame[k] = motion[k].compose(base);

        FrameEncoding enc = s.camera().encodingOrDefault();
        String[] names = new String[n];
        for (int k = 0; k < n; k++) names[k] = String.format(java.util.Locale.ROOT, "f%04d.%s", k + 1, enc.extension());
        double[][] spans = new double[n][];
        java.time.Instant exifStart = s.camera().exifStart() == null ? null : java.time.Instant.parse(s.camera().exifStart());
        int threads = Math.max(1, Math.min(2, Runtime.getRuntime().availableProcessors()));
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread th = new Thread(r, "risetrace-render");
            th.setDaemon(true);
            return th;
        });
        ThreadLocal<Renderer.Buffers> buffers = ThreadLocal.withInitial(renderer::buffers);
        List<Future<?>> jobs = new ArrayList<>();
        // the heat model runs on this thread; each frame is rendered and written on the pool as soon as it is ready
        FrameSink sink = (k, cellsC, partsC, ambientC) -> jobs.add(pool.submit(() -> {
            Renderer.Buffers buf = buffers.get();
            renderer.render(cellsC, partsC, ambientC, boardToFrame[k], noiseSeed(s.seed(), k), buf);
            double[] span = null;
            if (enc == FrameEncoding.U8_SPAN_PNG) {
                span = s.camera().autoSpanOrFalse() ? autoSpan(buf.image) : s.camera().spanC().clone();
                spans[k] = span;
            }
            Path file = outDir.resolve(names[k]);
            FrameWriters.write(file, enc, renderer.width, renderer.height, buf.image, span);
            if (exifStart != null && enc.extension().equals("tif"))
                FrameWriters.addExifTime(file, exifStart.plusNanos(Math.round(k * s.frames().intervalS() * 1e9)));
        }));
        History hist;
        try {
            hist = thermal(s, bm, sink);
            for (Future<?> f : jobs) f.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted", e);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) throw re;
            throw new IllegalStateException(e.getCause());
        } finally {
            pool.shutdownNow();
        }

        // truth
        List<Truth.TruthFrame> tf = new ArrayList<>();
        for (int k = 0; k < n; k++) {
            double[][] corners = CameraModel.corners(boardToFrame[k], wMm, hMm);
            tf.add(new Truth.TruthFrame(names[k], hist.tS()[k], hist.ambientC()[k], hist.powerW()[k], corners,
                    boardToFrame[k].rows()));
        }
        Map<String, double[]> partTemps = new LinkedHashMap<>();
        Map<String, Double> partE = new LinkedHashMap<>();
        List<Truth.UnmarkedPart> unmarked = new ArrayList<>();
        List<Part> boardParts = new ArrayList<>();
        for (int p = 0; p < bm.parts.size(); p++) {
            Scenario.PartSpec ps = bm.parts.get(p);
            double[] v = new double[n];
            for (int k = 0; k < n; k++) v[k] = hist.partsC()[k][p];
            partTemps.put(ps.ref(), v);
            partE.put(ps.ref(), ps.emissivityOrDefault());
            if (s.isMarked(ps.ref())) {
                boardParts.add(new Part(ps.ref(), ps.kind(), ps.material(), ps.xMm(), ps.yMm(), ps.wMm(), ps.hMm(),
                        ps.rotationDeg()));
            } else {
                unmarked.add(new Truth.UnmarkedPart(ps.ref(), ps.kind(), ps.xMm(), ps.yMm(), ps.wMm(), ps.hMm()));
            }
        }
        List<Truth.Source> sources = new ArrayList<>();
        for (Scenario.SourceShare src : s.fault().sourcesOrEmpty())
            sources.add(new Truth.Source(src.ref(), s.fault().powerW() * src.share(), src.share()));
        Truth truth = new Truth(s.name(), s.seed(), sources, tf, partTemps, partE, unmarked,
                hist.ambientC()[0], s.reflectedCOrDefault(), s.frames().injectionStartS(), s.camera().netdOrDefault(),
                s.fault().waveformOrDefault(), s.fault().periodS(),
                new Truth.Grid(bm.nx, bm.ny, bm.dxMm, bm.dyMm, s.frames().timeStepOrDefault()), hist.energy());

        // board file: the outline as a user would click it on the first frame, to the nearest half pixel
        double[][] clicked = CameraModel.corners(boardToFrame[0], wMm, hMm);
        for (double[] c : clicked) {
            c[0] = Math.round(c[0] * 2) / 2.0;
            c[1] = Math.round(c[1] * 2) / 2.0;
        }
        String boardName = s.board().name() != null ? s.board().name() : s.name();
        Board board = new Board(boardName, new double[]{wMm, hMm}, new Outline(names[0], clicked, null), boardParts, null);

        // sidecar
        Map<String, Sidecar.FrameEntry> entries = new LinkedHashMap<>();
        for (int k = 0; k < n; k++) {
            boolean perFrameSpan = enc == FrameEncoding.U8_SPAN_PNG && s.camera().autoSpanOrFalse();
            entries.put(names[k], new Sidecar.FrameEntry(hist.tS()[k], perFrameSpan ? spans[k] : null));
        }
        Scenario.InjectionSpec inj = s.injection();
        Sidecar.Injection injection = inj == null
                ? new Sidecar.Injection(s.frames().injectionStartS(), null, null, null, null, null, null)
                : new Sidecar.Injection(s.frames().injectionStartS(), inj.fromRail(), inj.toRail(), inj.volts(),
                inj.currentLimitA(), inj.supply(), inj.notes());
        if ("square".equals(s.fault().waveformOrDefault())) // a periodic injection: its timing, for lock-in
            injection = new Sidecar.Injection(injection.startS(), injection.fromRail(), injection.toRail(),
                    injection.volts(), injection.currentLimitA(), injection.supply(), injection.notes(),
                    s.fault().periodS(), s.fault().dutyOrDefault() * s.fault().periodS(), null);
        double[] fixedSpan = enc == FrameEncoding.U8_SPAN_PNG && !s.camera().autoSpanOrFalse() ? s.camera().spanC() : null;
        Sidecar sidecar = new Sidecar(enc.profile(), s.frames().intervalS(), fixedSpan, s.reflectedCOrDefault(), entries,
                injection, "simulated by risetrace from scenario '" + s.name() + "', seed " + s.seed());

        writeJson(outDir.resolve("truth.json"), truth);
        writeJson(outDir.resolve("board.json"), board);
        writeJson(outDir.resolve("series.json"), sidecar);
        List<Path> files = new ArrayList<>();
        for (String name : names) files.add(outDir.resolve(name));
        return new SimulationOutput(outDir, files, board, sidecar, truth);
    }

    static long noiseSeed(long seed, int frame) {
        long z = seed * 0x9E3779B97F4A7C15L + (frame + 1) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 31)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 29);
    }

    /** An auto-ranging camera's span: the frame's own minimum and maximum, widened to 0.1 degC and at least 2 K. */
    static double[] autoSpan(float[] image) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (float v : image) {
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        lo = Math.floor(lo * 10) / 10;
        hi = Math.ceil(hi * 10) / 10;
        if (hi - lo < 2) {
            double mid = 0.5 * (lo + hi);
            lo = Math.floor((mid - 1) * 10) / 10;
            hi = lo + 2;
        }
        return new double[]{lo, hi};
    }

    static void writeJson(Path file, Object value) {
        try {
            String text = JSON_OUT.writeValueAsString(value) + "\n";
            Files.write(file, text.getBytes(StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }
}
