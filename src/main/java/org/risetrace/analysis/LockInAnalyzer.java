package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.io.Sidecar;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * Lock-in analysis of a series: the excitation's timing from series.json (injection.period_s, on_s, start_s), else
 * the period found from the spectrum of the board's mean temperature; then one pass over the frames feeds both the
 * steady analysis and the {@link LockInAnalysis}.
 */
public final class LockInAnalyzer {
    /** Fewest frames per period of the excitation a lock-in analysis accepts. */
    static final int MIN_FRAMES_PER_PERIOD = 4;

    private static String framesPerPeriod(double f) {
        return Math.abs(f - Math.rint(f)) < 1e-6 ? String.valueOf((long) Math.rint(f))
                : String.format(Locale.ROOT, "%.1f", f);
    }

    /** The median spacing of the frames (0 for fewer than two). */
    static double medianInterval(double[] t) {
        if (t.length < 2) return 0;
        double[] d = new double[t.length - 1];
        for (int i = 1; i < t.length; i++) d[i - 1] = t[i] - t[i - 1];
        return PartCurve.median(d, d.length);
    }

    /** Fewest whole periods a lock-in analysis accepts. */
    public static final int MIN_PERIODS = 2;
    /** Largest chance that noise alone makes the spectrum's peak, for a period found from the spectrum. */
    static final double FALSE_ALARM = 1e-3;

    private LockInAnalyzer() {
    }

    /** True when the series' sidecar describes a periodic injection. */
    public static boolean periodic(Series series) {
        Sidecar s = series.sidecar();
        return s != null && s.injection() != null && s.injection().periodic();
    }

    public static LockIn analyze(Series series, Board board, Path boardFile, String seriesLabel,
                                 AnalysisOptions options, EmissivityModel emissivity, int threads,
                                 Analyzer.Progress progress) {
        if (series.size() == 0) throw new InputRejected(series.folder(), "the series has no frames");
        double[] times = new double[series.size()];
        for (int i = 0; i < times.length; i++) times[i] = series.tSeconds(i);
        Excitation excitation;
        try {
            excitation = periodic(series) ? LockInAnalysis.excitation(series.sidecar().injection())
                    : periodFromSpectrum(series, board, threads);
        } catch (IllegalArgumentException e) {
            throw new InputRejected(series.folder().resolve("series.json"), e.getMessage(),
                    "record the switching of a timer-driven supply or switch");
        }
        // the fundamental sampled at least MIN_FRAMES_PER_PERIOD times a period (README "Lock-in"): at two a
        // period its quadrature is not observable and the fit returned NaN or amplitudes of 1e12 K
        double dt = medianInterval(times);
        if (times.length > 1 && excitation.periodS() < MIN_FRAMES_PER_PERIOD * dt)
            throw new InputRejected(series.folder().resolve("series.json"), String.format(Locale.ROOT,
                    "the excitation's period of %.3g s holds %s frames (one every %.3g s); lock-in needs at least %d"
                            + " a period", excitation.periodS(), framesPerPeriod(excitation.periodS() / dt), dt,
                    MIN_FRAMES_PER_PERIOD),
                    "check injection.period_s; or switch more slowly, or capture faster");
        Excitation.Window window = excitation.window(times);
        if (window.periods() < MIN_PERIODS)
            throw new InputRejected(series.folder(), String.format(Locale.ROOT,
                    "the frames hold %d whole period(s) of the %.3g s excitation after its first switch-on at %.3g s;"
                            + " lock-in needs at least %d", window.periods(), excitation.periodS(),
                    excitation.firstOnS(), MIN_PERIODS), "capture more periods, or check injection.period_s and start_s");
        Sidecar sidecar = series.sidecar() == null ? Sidecar.empty() : series.sidecar();
        LockInAnalysis lockIn = new LockInAnalysis(board, excitation, window, options, emissivity, sidecar.reflectedC());
        Analysis steady = SeriesAnalyzer.analyze(series, board, boardFile, seriesLabel, options, emissivity, threads,
                progress, lockIn);
        return lockIn.finish(steady);
    }

    /**
     * The excitation period from the spectrum of the board's mean temperature when series.json gives none: each
     * frame's mean over the board outline as marked on the reference frame (no registration: a mean over the board
     * barely moves with the camera), then a periodogram: at each trial frequency the same least-squares fit as the
     * lock-in (quadratic trend, cosine and sine on the frames' own times: the generalised Lomb-Scargle periodogram,
     * Zechmeister and Kuerster 2009, A&amp;A 496, 577) and its power (amplitude / standard error)^2 / 2, which white
     * noise alone spreads as an exponential of mean 1. The highest peak between 3 periods per series and 2.5 frames
     * per period, refined by a parabola, is taken when noise alone would reach it with a chance under 0.1 % over all
     * trial frequencies (Scargle 1982, ApJ 263, 835), the powers first scaled by their median over ln 2 (the
     * median of white noise's powers) so that correlated noise does not pass for a period. The phase reference is then unknown: the first switch-on is
     * taken at the injection start (else the first frame) with half the period on, so only phase differences
     * between parts mean anything.
     */
    public static Excitation periodFromSpectrum(Series series, Board board, int threads) {
        int n = series.size();
        if (n < 12) throw new InputRejected(series.folder(), "too few frames (" + n + ") to find a period",
                "give injection.period_s in series.json");
        double[] t = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) t[i] = series.tSeconds(i);
        double[][] corners = board.outline() == null ? null : board.outline().cornersPx();
        if (corners == null) throw new InputRejected(series.folder(), "no board outline to find the period on",
                "give injection.period_s in series.json");
        ExecutorService pool = Executors.newFixedThreadPool(Math.max(1, threads), r -> {
            Thread th = new Thread(r, "risetrace-period");
            th.setDaemon(true);
            return th;
        });
        try {
            List<Future<Double>> jobs = new ArrayList<>();
            for (int i = 0; i < n; i++) {
                final int k = i;
                jobs.add(pool.submit(() -> boardMean(series.read(k), corners)));
            }
            for (int i = 0; i < n; i++) y[i] = jobs.get(i).get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted", e);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) throw re;
            throw new IllegalStateException(e.getCause());
        } finally {
            pool.shutdownNow();
        }
        Sidecar.Injection inj = series.sidecar() == null ? null : series.sidecar().injection();
        double t0 = inj != null && inj.startS() != null ? inj.startS() : t[0];
        double[] found = strongestPeriod(t, y, t0);
        if (found == null) throw new InputRejected(series.folder(),
                "no periodic heating found in the board's mean temperature",
                "give injection.period_s (and on_s, start_s) in series.json, or analyse without --mode lock-in");
        double period = found[0];
        return new Excitation(period, period / 2, t0, String.format(Locale.ROOT,
                "found from the spectrum of the board's mean temperature (peak power %.1f, noise alone reaches it "
                        + "with a chance of %.1g); switch-on timing unknown: on for half the period from %.3g s "
                        + "assumed, so only phase differences between parts are meaningful", found[1], found[2], t0));
    }

    /**
     * {period, peak power, chance of noise reaching it} of the strongest periodic component of y(t) after t0, or null
     * when noise alone would reach the peak with a chance of {@link #FALSE_ALARM} or more.
     */
    static double[] strongestPeriod(double[] t, double[] y, double t0) {
        int first = 0;
        while (first < t.length && t[first] < t0) first++;
        int n = t.length - first;
        if (n < 12) return null;
        double[] tt = java.util.Arrays.copyOfRange(t, first, t.length), yy = java.util.Arrays.copyOfRange(y, first, t.length);
        double span = tt[n - 1] - tt[0];
        double[] gaps = new double[n - 1];
        for (int i = 1; i < n; i++) gaps[i - 1] = tt[i] - tt[i - 1];
        java.util.Arrays.sort(gaps);
        double spacing = gaps[gaps.length / 2];
        double total = span + spacing;
        double fLo = 3 / total, fHi = 1 / (2.5 * spacing);
        if (!(fHi > fLo)) return null;
        double df = 1 / (5 * total); // five trial frequencies per independent one
        int count = (int) Math.floor((fHi - fLo) / df) + 1;
        double[] power = new double[count];
        for (int k = 0; k < count; k++) power[k] = power(tt, yy, fLo + k * df, total);
        // white noise spreads the power as an exponential of mean 1 (median ln 2); frame-to-frame correlation
        // (camera drift, a board edge moving in and out of the outline) raises the whole floor, so the powers are
        // scaled by their median first
        double[] sorted = power.clone();
        java.util.Arrays.sort(sorted);
        double floor = sorted[count / 2] / Math.log(2);
        if (!(floor > 0)) return null;
        int best = 0;
        for (int k = 1; k < count; k++) if (power[k] > power[best]) best = k;
        double shift = best > 0 && best < count - 1
                ? Hotspots.vertex((float) power[best - 1], (float) power[best], (float) power[best + 1]) : 0;
        double f = fLo + (best + shift) * df;
        double peak = power(tt, yy, f, total) / Math.max(1, floor);
        double independent = Math.max(1, (fHi - fLo) * total);
        double chance = 1 - Math.pow(1 - Math.exp(-peak), independent);
        if (!(chance < FALSE_ALARM)) return null;
        return new double[]{1 / f, peak, chance};
    }

    private static double power(double[] t, double[] y, double f, double total) {
        Excitation e = new Excitation(1 / f, 0.5 / f, t[0], "trial");
        LockInFit fit = new LockInFit(e, new Excitation.Window(t[0], 1, total), LockInAnalysis.DETREND_DEGREE);
        LockInFit.SeriesFit r = fit.fit(t, y);
        if (r == null || !(r.amplitudeSe() > 0)) return 0;
        double z = r.amplitude() / r.amplitudeSe();
        return z * z / 2;
    }

    /** Mean temperature inside the quadrilateral (frame pixels), by a point-in-polygon test on pixel centres. */
    static double boardMean(Frame frame, double[][] q) {
        int w = frame.width(), h = frame.height();
        double minX = w, maxX = 0, minY = h, maxY = 0;
        for (double[] c : q) {
            minX = Math.min(minX, c[0]);
            maxX = Math.max(maxX, c[0]);
            minY = Math.min(minY, c[1]);
            maxY = Math.max(maxY, c[1]);
        }
        float[] v = frame.celsius();
        double sum = 0;
        long cnt = 0;
        for (int y = Math.max(0, (int) Math.ceil(minY)); y <= Math.min(h - 1, (int) Math.floor(maxY)); y++)
            for (int x = Math.max(0, (int) Math.ceil(minX)); x <= Math.min(w - 1, (int) Math.floor(maxX)); x++) {
                if (!inside(q, x, y)) continue;
                float c = v[y * w + x];
                if (Float.isNaN(c)) continue;
                sum += c;
                cnt++;
            }
        return cnt == 0 ? Double.NaN : sum / cnt;
    }

    private static boolean inside(double[][] q, double x, double y) {
        boolean in = false;
        for (int i = 0, j = q.length - 1; i < q.length; j = i++)
            if ((q[i][1] > y) != (q[j][1] > y)
                    && x < (q[j][0] - q[i][0]) * (y - q[i][1]) / (q[j][1] - q[i][1]) + q[i][0]) in = !in;
        return in;
    }
}
