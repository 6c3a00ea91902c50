package org.risetrace.synth;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.opencv.core.Core;
import org.opencv.core.CvType;
import org.opencv.core.Mat;
import org.opencv.core.MatOfPoint2f;
import org.opencv.core.Point;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.SeriesAnalyzer;
import org.risetrace.analysis.Verdict;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.Frame;
import org.risetrace.io.Series;
import org.risetrace.registration.FrameRegistration;
import org.risetrace.registration.Homographies;
import org.risetrace.registration.Homography;
import org.risetrace.registration.Registrar;
import org.risetrace.registration.RegistrationConfig;
import org.risetrace.registration.RegistrationStatus;
import org.risetrace.registration.Registrars;
import org.risetrace.synth.SpotSeries.Config;
import org.risetrace.synth.SpotSeries.Encoding;
import org.risetrace.synth.SpotSeries.HeatingMode;
import org.risetrace.synth.SpotSeries.MotionKind;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The second synthetic generator checked against OpenCV, the import stage, its own configuration and determinism. */
class SpotSeriesTest {
    @TempDir
    Path dir;

    @BeforeAll
    static void loadOpenCv() {
        nu.pattern.OpenCV.loadLocally();
    }

    /**
     * The warp: a small Gaussian mark drawn in the board picture at a board point lands, in every checked frame,
     * where OpenCV's {@code Core.perspectiveTransform} (a general-purpose reference library) sends that point
     * through the true homography, within 0.1 px (intensity centroid of the warped mark).
     */
    @Test
    void aMarkedBoardPointLandsWhereOpenCvMapsItThroughTheTrueHomography() {
        for (MotionKind motion : MotionKind.values()) {
            SpotSeries s = new SpotSeries(SpotSeries.random(31, HeatingMode.NONE, motion, Encoding.U16_CENTIKELVIN));
            SpotBoard b = s.board();
            double[][] marks = {{b.widthMm * 0.3, b.heightMm * 0.4}, {b.widthMm * 0.75, b.heightMm * 0.6},
                    {b.widthMm * 0.5, b.heightMm * 0.2}};
            for (int k : new int[]{0, 7, 23, 39}) {
                Mat h = new Mat(3, 3, CvType.CV_64F);
                double[][] rows = s.boardToFrameRows(k);
                for (int r = 0; r < 3; r++) h.put(r, 0, rows[r]);
                for (double[] mark : marks) {
                    float[] pic = new float[s.textureWidth() * s.textureHeight()];
                    double[] uv = s.boardToTexel(mark[0], mark[1]);
                    double sigma = 0.4 * b.pxPerMm; // 0.4 mm
                    for (int v = 0; v < s.textureHeight(); v++)
                        for (int u = 0; u < s.textureWidth(); u++) {
                            double d2 = (u - uv[0]) * (u - uv[0]) + (v - uv[1]) * (v - uv[1]);
                            if (d2 < 36 * sigma * sigma) pic[v * s.textureWidth() + u] = (float) Math.exp(-d2 / (2 * sigma * sigma));
                        }
                    float[] f = s.warpBoardPicture(pic, k, 0);
                    MatOfPoint2f src = new MatOfPoint2f(new Point(mark[0], mark[1])), dst = new MatOfPoint2f();
                    Core.perspectiveTransform(src, dst, h);
                    Point expected = dst.toArray()[0];
                    double sx = 0, sy = 0, sw = 0;
                    int w = s.config().widthPx();
                    for (int y = (int) expected.y - 8; y <= (int) expected.y + 8; y++)
                        for (int x = (int) expected.x - 8; x <= (int) expected.x + 8; x++) {
                            if (x < 0 || y < 0 || x >= w || y >= s.config().heightPx()) continue;
                            double v = f[y * w + x];
                            sx += v * x;
                            sy += v * y;
                            sw += v;
                        }
                    assertTrue(sw > 0, "mark outside the frame");
                    double err = Math.hypot(sx / sw - expected.x, sy / sw - expected.y);
                    assertTrue(err < 0.1, motion + " frame " + k + " mark " + mark[0] + "," + mark[1] + ": " + err + " px");
                }
            }
        }
    }

    /**
     * NETD is the standard deviation of a pixel's reading over time on a uniform, steady scene (common practice);
     * on a still, unheated series without ambient drift or flicker, read back through {@link Series}, the pooled
     * per-pixel temporal standard deviation equals the configured NETD within 10 %.
     */
    @Test
    void temporalNoiseOfAStillUnheatedSeriesEqualsTheNetd() {
        double netd = 0.05;
        Config c = Config.defaults(5).withMotion(SpotSeries.Motion.stand(0)).withHeating(SpotSeries.Heating.none())
                .withNoise(netd, 0).withAmbientDrift(0);
        SpotSeries.Output out = SpotSeries.generate(c, dir.resolve("still"));
        Series s = Series.open(out.directory());
        int n = s.size(), px = c.widthPx() * c.heightPx();
        double[] sum = new double[px], sum2 = new double[px];
        for (int k = 0; k < n; k++) {
            float[] f = s.read(k).celsius();
            for (int i = 0; i < px; i++) {
                sum[i] += f[i];
                sum2[i] += (double) f[i] * f[i];
            }
        }
        double var = 0;
        for (int i = 0; i < px; i++) var += (sum2[i] - sum[i] * sum[i] / n) / (n - 1);
        double measured = Math.sqrt(var / px);
        System.out.printf(Locale.ROOT, "spot model NETD: configured %.4f K, measured %.4f K%n", netd, measured);
        assertEquals(netd, measured, 0.1 * netd);
    }

    /**
     * Quantisation round trip through the import stage: 16-bit centikelvin within half a count (0.005 K) and
     * auto-ranged 8-bit within half a grey level of the frame's span (span / 510), against the rendered values
     * before encoding (the encodings' definitions in calibration/u16-centikelvin.json and u8-span.json).
     */
    @Test
    void framesReadBackThroughSeriesWithinHalfAQuantisationStep() {
        for (Encoding enc : Encoding.values()) {
            Config c = SpotSeries.random(41, HeatingMode.LEADER, MotionKind.HANDHELD, enc).withFrames(12, 0.5, 1.0);
            SpotSeries.Output out = SpotSeries.generate(c, dir.resolve(enc.name()));
            Series s = Series.open(out.directory());
            assertEquals(enc.profile, s.profile().name());
            SpotSeries again = new SpotSeries(c);
            double worst = 0;
            for (int k = 0; k < s.size(); k++) {
                float[] truth = again.renderFrame(k), read = s.read(k).celsius();
                double limit;
                if (enc == Encoding.U16_CENTIKELVIN) limit = 0.005;
                else {
                    double[] span = s.spanC(k);
                    assertNotNull(span, "8-bit frames carry their span");
                    limit = (span[1] - span[0]) / 510;
                    for (float v : truth)
                        if (!(v >= span[0] && v <= span[1])) throw new AssertionError("span " + span[0] + ".." + span[1] + " misses " + v);
                }
                for (int i = 0; i < truth.length; i++) {
                    double e = Math.abs(truth[i] - read[i]);
                    worst = Math.max(worst, e / limit);
                    // 1e-5 K: float rounding of the decoded value
                    if (e > limit + 1e-5)
                        throw new AssertionError(enc + " frame " + k + " pixel " + i + ": " + e + " K, limit " + limit);
                }
            }
            System.out.printf(Locale.ROOT, "spot model %s round trip: worst %.3f of the half step%n", enc.profile, worst);
        }
    }

    /**
     * The truth follows the configuration: LEADER's rate is ratio x the runner-up's and rises riseK by the last
     * frame; TWO_ALIKE's two rates are within 10 % and the rest below 0.4 of them; NONE has no rate. The rendered
     * body of the leader rises by e x its true rise plus the ambient drift (the linear emissivity mix).
     */
    @Test
    void trueRatesFollowTheHeatingMode() {
        for (long seed = 1; seed <= 12; seed++) {
            for (HeatingMode mode : HeatingMode.values()) {
                Config c = SpotSeries.random(seed, mode, MotionKind.STAND, Encoding.U16_CENTIKELVIN);
                SpotSeries s = new SpotSeries(c);
                List<Double> rates = new ArrayList<>(s.initialRates().values());
                rates.sort(java.util.Comparator.reverseOrder());
                List<String> leaders = s.leaders();
                switch (mode) {
                    case NONE -> {
                        assertTrue(leaders.isEmpty());
                        for (double r : rates) assertEquals(0.0, r, 0.0);
                    }
                    case LEADER -> {
                        assertEquals(1, leaders.size());
                        assertEquals(rates.get(0), s.initialRates().get(leaders.get(0)));
                        assertEquals(c.heating().ratio(), rates.get(0) / rates.get(1), 1e-9);
                        assertTrue(c.heating().ratio() >= 2 && c.heating().ratio() <= 4);
                        int last = c.frames() - 1;
                        assertEquals(c.heating().riseK(), s.riseK(leaders.get(0), last), 1e-9);
                        assertTrue(c.heating().riseK() >= 1 && c.heating().riseK() <= 4);
                    }
                    case TWO_ALIKE -> {
                        assertEquals(2, leaders.size());
                        double a = s.initialRates().get(leaders.get(0)), b = s.initialRates().get(leaders.get(1));
                        assertEquals(rates.get(0), a);
                        assertEquals(rates.get(1), b);
                        assertTrue(a / b <= 1.1, "within 10 %: " + a + " " + b);
                        assertTrue(rates.get(2) <= 0.4 * b + 1e-12);
                    }
                }
                if (mode == HeatingMode.NONE) continue;
                // leaders drawn among parts with a shorter side of at least 3 mm when asked (some exist on every board)
                SpotSeries big = new SpotSeries(c.withLeaderMinSideMm(3));
                boolean anyBig = big.board().parts.stream().anyMatch(q -> Math.min(q.wMm(), q.hMm()) >= 3);
                assertTrue(anyBig, "seed " + seed + " has a part of 3 mm or more");
                for (String ref : big.leaders())
                    for (SpotBoard.PartLayout q : big.board().parts)
                        if (q.ref().equals(ref)) assertTrue(Math.min(q.wMm(), q.hMm()) >= 3, ref + " " + q);
                // rendered leader body: a texel deep inside the body (no end cap there for the chosen parts)
                String ref = leaders.get(0);
                SpotBoard.PartLayout p = s.board().parts.stream().filter(q -> q.ref().equals(ref)).findFirst().orElseThrow();
                int u = (int) Math.round(s.board().u(p.xMm())), v = (int) Math.round(s.board().v(p.yMm()));
                int i = v * s.board().texW + u;
                int last = c.frames() - 1;
                double seen = s.boardPicture(last)[i] - s.boardPicture(0)[i];
                double expected = s.board().emissivity[i] * s.riseK(ref, last) + s.ambientOffsetK(last) - s.ambientOffsetK(0);
                assertEquals(expected, seen, 1e-4, "rendered rise of " + ref);
            }
        }
    }

    private static Map<String, String> hashes(Path folder) throws IOException, NoSuchAlgorithmException {
        Map<String, String> out = new TreeMap<>();
        try (Stream<Path> files = Files.list(folder)) {
            for (Path f : files.toList()) {
                MessageDigest md = MessageDigest.getInstance("SHA-256");
                out.put(f.getFileName().toString(), HexFormat.of().formatHex(md.digest(Files.readAllBytes(f))));
            }
        }
        return out;
    }

    /** Same configuration, same bytes (SHA-256 of every file, FIPS 180-4 via the JDK); another seed differs. */
    @Test
    void sameSeedWritesIdenticalBytes() throws Exception {
        Config c = SpotSeries.random(77, HeatingMode.LEADER, MotionKind.HANDHELD, Encoding.U8_SPAN).withFrames(10, 0.5, 1.0);
        SpotSeries.generate(c, dir.resolve("a"));
        SpotSeries.generate(c, dir.resolve("b"));
        SpotSeries.generate(c.withSeed(78), dir.resolve("c"));
        Map<String, String> a = hashes(dir.resolve("a")), b = hashes(dir.resolve("b")), other = hashes(dir.resolve("c"));
        assertEquals(12, a.size(), a.keySet().toString());
        assertEquals(a, b);
        assertNotEquals(a.get("f0005.png"), other.get("f0005.png"));
    }

    /**
     * The noise-free twin has the same mappings and rates, and differs from the noisy series only by zero-mean
     * noise: per frame the difference has a mean within 5 standard errors of zero (plus 4 sigma of flicker)
     * and a standard deviation between NETD (temporal noise alone) and 2.1 NETD (with the fixed pattern of at most
     * 1.5 NETD per pixel and 0.75 NETD per column, by construction).
     */
    @Test
    void noiseFreeTwinDiffersOnlyByTheNoise() {
        Config c = SpotSeries.random(55, HeatingMode.LEADER, MotionKind.HANDHELD, Encoding.U16_CENTIKELVIN);
        SpotSeries noisy = new SpotSeries(c), clean = new SpotSeries(c.noiseFree());
        assertEquals(noisy.initialRates(), clean.initialRates());
        for (int k : new int[]{0, 20, 39}) {
            for (int r = 0; r < 3; r++)
                assertTrue(java.util.Arrays.equals(noisy.boardToFrameRows(k)[r], clean.boardToFrameRows(k)[r]));
            float[] a = noisy.renderFrame(k), b = clean.renderFrame(k);
            double sum = 0, sum2 = 0;
            for (int i = 0; i < a.length; i++) {
                double d = a[i] - b[i];
                sum += d;
                sum2 += d * d;
            }
            double mean = sum / a.length, sd = Math.sqrt(sum2 / a.length - mean * mean);
            // 5 standard errors: pixel noise over all pixels and the column offsets (sd <= 0.75 NETD) over the columns
            double se = Math.sqrt(sd * sd / a.length + Math.pow(0.75 * c.netdK(), 2) / c.widthPx());
            assertTrue(Math.abs(mean) < 5 * se + 4 * c.flickerK(), "frame " + k + " mean " + mean);
            assertTrue(sd >= 0.97 * c.netdK() && sd <= 2.1 * c.netdK(), "frame " + k + " sd " + sd + " netd " + c.netdK());
        }
    }

    /** Mean distance of the four corners (px). */
    static double cornerError(double[][] a, double[][] b) {
        double s = 0;
        for (int i = 0; i < 4; i++) s += Math.hypot(a[i][0] - b[i][0], a[i][1] - b[i][1]);
        return s / 4;
    }

    /**
     * Registration smoke check on two stand and two hand-held series: the marked frame maps exactly as board.json
     * says (the outline's four-point homography equals the true one, checked at the corners and the centre, within
     * 1e-6 px); the grades and corner errors of the other frames are printed for the registration work, not asserted.
     */
    @Test
    void registrationOfSpotSeriesMapsTheMarkedFrameExactlyAndPrintsTheRest() {
        StringBuilder log = new StringBuilder();
        long[] seeds = {101, 102, 201, 202};
        for (long seed : seeds) {
            MotionKind motion = seed < 200 ? MotionKind.STAND : MotionKind.HANDHELD;
            SpotSeries.Output out = SpotSeries.generate(SpotSeries.random(seed, HeatingMode.LEADER, motion,
                    Encoding.U16_CENTIKELVIN), dir.resolve("r" + seed));
            Board board = BoardFile.read(out.boardFile(), null);
            Series s = Series.open(out.directory());
            assertEquals(out.fileNames().get(0), board.outline().frame());
            Frame ref = s.read(0);
            Homography truth0 = Homography.fromRows(out.boardToFrame(0));
            Registrar reg = Registrars.create(ref, board, RegistrationConfig.defaults());
            FrameRegistration marked = reg.register(ref);
            assertEquals(RegistrationStatus.MARKED, marked.status());
            double[][] probe = {{0, 0}, {board.widthMm(), 0}, {board.widthMm(), board.heightMm()}, {0, board.heightMm()},
                    {board.widthMm() / 2, board.heightMm() / 2}};
            Homography fromOutline = Homographies.boardToFrame(board, board.outline().cornersPx());
            for (double[] p : probe) {
                double[] a = truth0.apply(p[0], p[1]), b = marked.boardToFrame().apply(p[0], p[1]),
                        c = fromOutline.apply(p[0], p[1]);
                assertEquals(a[0], b[0], 1e-6);
                assertEquals(a[1], b[1], 1e-6);
                assertEquals(a[0], c[0], 1e-6);
                assertEquals(a[1], c[1], 1e-6);
            }
            int ok = 0, weak = 0, failed = 0;
            double okSum = 0, okMax = 0, weakSum = 0, weakMax = 0;
            for (int k = 1; k < s.size(); k++) {
                FrameRegistration g = reg.register(s.read(k));
                switch (g.status()) {
                    case OK -> {
                        double e = cornerError(g.boardCornersPx(), out.boardCornersPx()[k]);
                        ok++;
                        okSum += e;
                        okMax = Math.max(okMax, e);
                    }
                    case WEAK -> {
                        double e = cornerError(g.boardCornersPx(), out.boardCornersPx()[k]);
                        weak++;
                        weakSum += e;
                        weakMax = Math.max(weakMax, e);
                    }
                    default -> failed++;
                }
            }
            log.append(String.format(Locale.ROOT, "%n  seed %d %s: %d ok (corner error mean %.3f, max %.3f px), "
                            + "%d weak (mean %.3f, max %.3f px), %d failed", seed, motion, ok, ok == 0 ? Double.NaN : okSum / ok,
                    okMax, weak, weak == 0 ? Double.NaN : weakSum / weak, weakMax, failed));
        }
        System.out.println("spot model registration:" + log);
    }

    /**
     * End to end through the analyze command's path ({@link SeriesAnalyzer#analyze}, registration included) on a
     * stand and a hand-held LEADER series, and through {@link SpotTruth} with the true mappings: prints the
     * verdicts; on the stand series the part ranked first is the true leader both ways (a 2-4 times faster part
     * rising 1-4 K, per the configuration).
     */
    @Test
    void analysisRanksTheTrueLeaderFirstOnAStandSeries() {
        StringBuilder log = new StringBuilder();
        for (MotionKind motion : MotionKind.values()) {
            SpotSeries.Output out = SpotSeries.generate(SpotSeries.random(303, HeatingMode.LEADER, motion,
                    Encoding.U16_CENTIKELVIN), dir.resolve("e" + motion));
            Series s = Series.open(out.directory());
            Board b = BoardFile.read(out.boardFile(), Materials.load().names());
            Analysis a = SeriesAnalyzer.analyze(s, b, out.boardFile(), out.directory().toString(),
                    AnalysisOptions.defaults(), SeriesAnalyzer.emissivity(s.profile()), 2, Analyzer.Progress.NONE);
            Analysis t = SpotTruth.analyze(out);
            PartResult first = a.result().parts().get(0), firstTruth = t.result().parts().get(0);
            assertEquals(1, first.rank());
            Verdict v = a.result().verdict(), vt = t.result().verdict();
            log.append(String.format(Locale.ROOT, "%n  %s seed 303: true leader %s (%.4f K/s, ratio %.2f, rise %.2f K)"
                            + "%n    registered: %s %s (%s), rank 1 %s %.4f +- %.4f K/s"
                            + "%n    true mapping: %s %s (%s), rank 1 %s %.4f +- %.4f K/s",
                    motion, out.leader(), out.initialRateKPerS().get(out.leader()), out.config().heating().ratio(),
                    out.config().heating().riseK(), v.status().word(), v.ref(), v.reason(), first.ref(), first.rateKPerS(),
                    first.rateSe(), vt.status().word(), vt.ref(), vt.reason(), firstTruth.ref(), firstTruth.rateKPerS(),
                    firstTruth.rateSe()));
            if (motion == MotionKind.STAND) {
                assertEquals(out.leader(), first.ref(), "registered analysis ranks the true leader first" + log);
                assertEquals(out.leader(), firstTruth.ref(), "truth-mapped analysis ranks the true leader first" + log);
            }
        }
        System.out.println("spot model analysis:" + log);
    }
}
