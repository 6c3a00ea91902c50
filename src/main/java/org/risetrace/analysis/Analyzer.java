package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.registration.BoardRaster;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.RegistrationStatus;

import java.util.ArrayDeque;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.function.Supplier;

/**
 * The series pipeline: decode, register, rectify and sample frames on worker threads (frames are independent, so
 * different frames overlap on different cores), and feed the results in time order to one {@link SeriesAnalysis}.
 * At most a few frames are in flight at any time; the series is never held in memory.
 */
public final class Analyzer {

    /** Progress callback: frames done out of total. */
    public interface Progress {
        void update(int done, int total);

        Progress NONE = (d, t) -> { };
    }

    private Analyzer() {
    }

    /**
     * @param frames     the series
     * @param board      the board file
     * @param mappers    makes one mapper per worker thread
     * @param ambient    the ambient sampler (copied per thread)
     * @param analysis   the accumulator, with its baseline plan made from the frame times
     * @param threads    worker threads (at least 1)
     */
    public static Analysis run(FrameSource frames, Board board, Supplier<BoardMapper> mappers,
                               Supplier<AmbientSampler> ambient, SeriesAnalysis analysis, int threads,
                               Progress progress) {
        return run(frames, board, mappers, ambient, analysis, null, threads, progress);
    }

    /** As above; {@code alsoInOrder} (may be null) sees every frame's sample in time order too (lock-in). */
    public static Analysis run(FrameSource frames, Board board, Supplier<BoardMapper> mappers,
                               Supplier<AmbientSampler> ambient, SeriesAnalysis analysis,
                               java.util.function.Consumer<FrameSample> alsoInOrder, int threads, Progress progress) {
        java.util.function.Consumer<FrameSample> sink = alsoInOrder == null ? analysis::add : s -> {
            analysis.add(s);
            alsoInOrder.accept(s);
        };
        int n = frames.size();
        threads = Math.max(1, threads);
        if (threads == 1) return runOnOneThread(frames, board, mappers, ambient, analysis, sink, progress);
        // one single-thread executor per worker and frame i always on worker i mod threads: each worker's
        // registrar state (last estimate, chain link) then sees the same frames in the same order on every run,
        // so a report is reproducible to the last digit (with a shared pool the assignment followed the timing and
        // rates differed in the fourth digit between runs)
        ExecutorService[] pools = new ExecutorService[threads];
        for (int k = 0; k < threads; k++)
            pools[k] = Executors.newSingleThreadExecutor(Analyzer::frameThread);
        ThreadLocal<Worker> workers = ThreadLocal.withInitial(() -> new Worker(board, mappers.get(), ambient.get()));
        ArrayDeque<Future<FrameSample>> inFlight = new ArrayDeque<>();
        int window = 2 * threads + 1, done = 0;
        try {
            for (int i = 0; i < n; i++) {
                final int index = i;
                inFlight.add(pools[index % pools.length].submit(() -> workers.get().process(frames, index)));
                while (inFlight.size() > window) {
                    sink.accept(take(inFlight.poll()));
                    progress.update(++done, n);
                }
            }
            while (!inFlight.isEmpty()) {
                sink.accept(take(inFlight.poll()));
                progress.update(++done, n);
            }
        } finally {
            for (ExecutorService pool : pools) pool.shutdownNow();
        }
        return analysis.finish();
    }

    /**
     * One thread for the whole pipeline: each frame read, registered, sampled and added in turn. With a worker
     * thread beside the caller the adding overlapped the next frame's work, so "one thread" ran on 1.09-1.25 cores
     * (process CPU over wall time, a batch of four 300-frame series), and a batch of one-thread series on every
     * core had more busy threads than cores. A thread of its own (not the caller's) so that the registrar's
     * thread-local workspaces end with it.
     */
    private static Analysis runOnOneThread(FrameSource frames, Board board, Supplier<BoardMapper> mappers,
                                           Supplier<AmbientSampler> ambient, SeriesAnalysis analysis,
                                           java.util.function.Consumer<FrameSample> sink, Progress progress) {
        ExecutorService one = Executors.newSingleThreadExecutor(Analyzer::frameThread);
        try {
            take(one.submit(() -> {
                Worker worker = new Worker(board, mappers.get(), ambient.get());
                int n = frames.size();
                for (int i = 0; i < n; i++) {
                    sink.accept(worker.process(frames, i));
                    progress.update(i + 1, n);
                }
                return null;
            }));
        } finally {
            one.shutdownNow();
        }
        return analysis.finish();
    }

    /** A worker thread: named for thread dumps, a daemon so a stuck frame cannot keep the JVM alive. */
    private static Thread frameThread(Runnable r) {
        Thread t = new Thread(r, "risetrace-frame");
        t.setDaemon(true);
        return t;
    }

    private static <T> T take(Future<T> f) {
        try {
            return f.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("analysis interrupted", e);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) throw re;
            if (e.getCause() instanceof Error err) throw err; // out of memory stays what it is
            throw new IllegalStateException(e.getCause());
        }
    }

    /** Per-thread state: a mapper, footprint and ambient samplers with their buffers. */
    static final class Worker {
        private final Board board;
        private final BoardMapper mapper;
        private final AmbientSampler ambient;
        private FootprintSampler footprints;

        Worker(Board board, BoardMapper mapper, AmbientSampler ambient) {
            this.board = board;
            this.mapper = mapper;
            this.ambient = ambient;
        }

        FrameSample process(FrameSource frames, int i) {
            String file = frames.fileName(i);
            double t = frames.tSeconds(i);
            Frame frame;
            try {
                frame = frames.read(i);
            } catch (InputRejected e) {
                // one unreadable frame does not end the analysis: it is listed as not used, with the reason
                return new FrameSample(i, file, t, null, new FrameRegistration(file, t, RegistrationStatus.FAILED,
                        e.reason().startsWith("cannot read") ? e.reason() : "cannot read: " + e.reason(), null, null, 0,
                        Double.NaN, Double.NaN), null, null, Double.NaN);
            }
            return sample(i, frame, t);
        }

        FrameSample sample(int i, Frame frame, double t) {
            String file = frame.fileName();
            FrameRegistration reg = mapper.register(frame);
            if (reg == null || !reg.status().usable() || reg.boardToFrame() == null)
                return new FrameSample(i, file, t, frame.sha256(), reg, null, null, Double.NaN);
            BoardRaster raster = mapper.rectify(frame, reg.boardToFrame());
            if (footprints == null || !footprints.fits(raster))
                footprints = new FootprintSampler(board.partsOrEmpty(), raster.width(), raster.height(), raster.pxPerMm());
            double[] stats = new double[footprints.parts() * FootprintSampler.STATS];
            footprints.sample(raster.celsius(), raster.valid(), stats);
            double amb = ambient == null ? Double.NaN : ambient.sample(frame, reg.boardToFrame());
            return new FrameSample(i, file, t, frame.sha256(), reg, raster, stats, amb);
        }
    }
}
