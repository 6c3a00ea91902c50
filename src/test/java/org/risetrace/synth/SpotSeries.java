package org.risetrace.synth;

import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.ObjectWriter;
import nu.pattern.OpenCV;
import org.opencv.core.CvType;
import org.opencv.core.Mat;
import org.opencv.core.Scalar;
import org.opencv.core.Size;
import org.opencv.imgcodecs.Imgcodecs;
import org.opencv.imgproc.Imgproc;
import org.risetrace.board.Board;
import org.risetrace.board.Outline;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;

/**
 * A second synthetic series generator, built apart from {@code org.risetrace.sim} in every modelling choice, so
 * the analysis can be checked on captures its own simulator did not make (issue 10, item 5). Heat is closed-form
 * ({@link SpotHeat}: uniform footprints plus spreading Gaussian spots), the board is a picture of emissivities
 * ({@link SpotBoard}), apparent temperature is the linear mix {@code e T + (1 - e) T_reflected} (not band
 * radiance), the picture is warped into each frame by OpenCV's {@code warpPerspective} after an anti-alias
 * Gaussian, blurred by OpenCV's {@code GaussianBlur} for the optics, given a seeded fixed pattern, temporal noise
 * at NETD and an optional global flicker, and written by OpenCV's PNG encoder ({@code imwrite}) as 16-bit
 * centikelvin or auto-ranged 8-bit grey. The same configuration gives the same bytes.
 *
 * <pre>
 * SpotSeries.Output out = SpotSeries.generate(SpotSeries.random(7, HeatingMode.LEADER, MotionKind.HANDHELD,
 *         Encoding.U16_CENTIKELVIN), dir);
 * Series.open(out.directory()); BoardFile.read(out.boardFile(), null); out.leader(); out.boardToFrame(k);
 * </pre>
 */
public final class SpotSeries {
    static {
        OpenCV.loadLocally();
    }

    public enum MotionKind { STAND, HANDHELD }

    public enum HeatingMode { LEADER, TWO_ALIKE, NONE }

    public enum Encoding {
        U16_CENTIKELVIN("u16-centikelvin"), U8_SPAN("u8-span");
        public final String profile;

        Encoding(String profile) { this.profile = profile; }
    }

    /**
     * Camera motion. Stand: {@code driftPxPerFrame} is the length of each random-walk step (a slow turn of the same
     * order is added). Hand-held: each frame independently within +-rotationDeg, +-zoom (fraction), +-shiftFraction
     * of the frame size per axis and +-perspective of the frame size at each frame corner.
     */
    public record Motion(MotionKind kind, double driftPxPerFrame, double rotationDeg, double zoom, double shiftFraction,
                         double perspective) {
        public Motion {
            if (kind == null || driftPxPerFrame < 0 || rotationDeg < 0 || zoom < 0 || zoom >= 0.5 || shiftFraction < 0
                    || shiftFraction > 0.4 || perspective < 0 || perspective > 0.05)
                throw new IllegalArgumentException("motion out of range");
        }

        public static Motion stand(double driftPxPerFrame) {
            return new Motion(MotionKind.STAND, driftPxPerFrame, 0, 0, 0, 0);
        }

        public static Motion handheld(double rotationDeg, double zoom, double shiftFraction) {
            return new Motion(MotionKind.HANDHELD, 0, rotationDeg, zoom, shiftFraction, 0.01);
        }
    }

    /**
     * Heating. LEADER: one part's initial rate is {@code ratio} times the runner-up's (the rest below 0.9 of the
     * runner-up), the leader rising {@code riseK} by the last frame. TWO_ALIKE: two parts with rates in the ratio
     * {@code ratio} (at most 1.1), the first rising {@code riseK}, the rest below 0.4 of the second. NONE: nothing
     * heats (ratio and riseK ignored). The leading part(s) are drawn among the parts whose shorter side is at least
     * {@code leaderMinSideMm} (0: any part; the largest part when none qualifies): at 2-3 frame px per mm the
     * camera sees a fraction of a 2 mm chip's rise through blur and its shiny end caps.
     */
    public record Heating(HeatingMode mode, double ratio, double riseK, double leaderMinSideMm) {
        public Heating {
            if (mode == null) throw new IllegalArgumentException("heating mode");
            if (mode != HeatingMode.NONE && (!(ratio >= 1) || !(riseK > 0)))
                throw new IllegalArgumentException("heating needs ratio >= 1 and riseK > 0");
            if (mode == HeatingMode.TWO_ALIKE && ratio > 1.1) throw new IllegalArgumentException("two alike: ratio <= 1.1");
            if (!(leaderMinSideMm >= 0)) throw new IllegalArgumentException("leaderMinSideMm >= 0");
        }

        public static Heating leader(double ratio, double riseK) { return new Heating(HeatingMode.LEADER, ratio, riseK, 0); }

        public static Heating twoAlike(double ratio, double riseK) { return new Heating(HeatingMode.TWO_ALIKE, ratio, riseK, 0); }

        public static Heating none() { return new Heating(HeatingMode.NONE, 1, 0, 0); }

        public Heating withLeaderMinSideMm(double mm) { return new Heating(mode, ratio, riseK, mm); }
    }

    /**
     * What to generate; the board layout, pose, curve shape, spot spread, emissivities, ambient and reflected
     * temperature and fixed pattern are drawn from {@code seed}.
     *
     * @param ambientDriftK largest ambient drift over the series (K); a ramp or half a sine of random sign
     * @param flickerK      standard deviation of a global frame-to-frame offset (K)
     * @param lidChance     chance that an ic, mosfet or inductor has a nickel-plated lid (emissivity 0.10)
     */
    public record Config(long seed, int widthPx, int heightPx, int frames, double intervalS, double injectionStartS,
                         Motion motion, Encoding encoding, double netdK, int parts, Heating heating,
                         double opticsSigmaPx, double flickerK, double ambientDriftK, double lidChance) {
        public Config {
            if (widthPx < 32 || heightPx < 32 || frames < 2 || !(intervalS > 0) || injectionStartS < 0
                    || injectionStartS >= (frames - 1) * intervalS || motion == null || encoding == null
                    || netdK < 0 || parts < 2 || parts > 20 || heating == null || opticsSigmaPx < 0.3
                    || flickerK < 0 || ambientDriftK < 0 || lidChance < 0 || lidChance > 1)
                throw new IllegalArgumentException("configuration out of range");
        }

        /** 320 x 240, 40 frames at 0.5 s, injection at 3 s, a still stand, 16-bit, NETD 0.05 K, 8 parts, a 3x leader of 2 K. */
        public static Config defaults(long seed) {
            return new Config(seed, 320, 240, 40, 0.5, 3.0, Motion.stand(0.05), Encoding.U16_CENTIKELVIN, 0.05, 8,
                    Heating.leader(3, 2), 0.9, 0, 0.05, 0.1);
        }

        public Config withMotion(Motion m) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, m, encoding, netdK, parts, heating, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }

        public Config withEncoding(Encoding e) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, motion, e, netdK, parts, heating, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }

        public Config withHeating(Heating h) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, motion, encoding, netdK, parts, h, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }

        public Config withNoise(double netd, double flicker) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, motion, encoding, netd, parts, heating, opticsSigmaPx, flicker, ambientDriftK, lidChance); }

        public Config withAmbientDrift(double k) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, motion, encoding, netdK, parts, heating, opticsSigmaPx, flickerK, k, lidChance); }

        public Config withSize(int w, int h) { return new Config(seed, w, h, frames, intervalS, injectionStartS, motion, encoding, netdK, parts, heating, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }

        public Config withFrames(int n, double interval, double injection) { return new Config(seed, widthPx, heightPx, n, interval, injection, motion, encoding, netdK, parts, heating, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }

        public Config withParts(int n) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, motion, encoding, netdK, n, heating, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }

        public Config withLidChance(double p) { return new Config(seed, widthPx, heightPx, frames, intervalS, injectionStartS, motion, encoding, netdK, parts, heating, opticsSigmaPx, flickerK, ambientDriftK, p); }

        /**
         * The noise-free twin: the same board, heat, pose and motion (each drawn from its own stream of the seed), no
         * fixed pattern, temporal noise or flicker; its frames are what the camera would see without noise.
         */
        public Config noiseFree() { return withNoise(0, 0); }

        public Config withLeaderMinSideMm(double mm) { return withHeating(heating.withLeaderMinSideMm(mm)); }

        public Config withSeed(long s) { return new Config(s, widthPx, heightPx, frames, intervalS, injectionStartS, motion, encoding, netdK, parts, heating, opticsSigmaPx, flickerK, ambientDriftK, lidChance); }
    }

    /**
     * A configuration drawn from the seed: 320 x 240, 40 frames at 0.5 s, injection at 3 s, 6-12 parts, NETD
     * 0.02-0.08 K, optics sigma 0.7-1.2 px, flicker in half the series (up to 0.4 NETD), ambient drift up to
     * 0.05 K; stand drift 0.02-0.15 px per frame, or hand-held within 3-5 degrees, 5-10 % zoom, 10-15 % shift;
     * LEADER ratio 2-4 and rise 1-4 K, TWO_ALIKE ratio 1-1.08 and rise 1.5-4 K.
     */
    public static Config random(long seed, HeatingMode mode, MotionKind motion, Encoding encoding) {
        SplittableRandom r = new SplittableRandom(seed ^ 0x5EC0DE5EEDL);
        Motion m = motion == MotionKind.STAND ? Motion.stand(0.02 + 0.13 * r.nextDouble())
                : Motion.handheld(3 + 2 * r.nextDouble(), 0.05 + 0.05 * r.nextDouble(), 0.10 + 0.05 * r.nextDouble());
        Heating h = switch (mode) {
            case LEADER -> Heating.leader(2 + 2 * r.nextDouble(), 1 + 3 * r.nextDouble());
            case TWO_ALIKE -> Heating.twoAlike(1 + 0.08 * r.nextDouble(), 1.5 + 2.5 * r.nextDouble());
            case NONE -> Heating.none();
        };
        double netd = 0.02 + 0.06 * r.nextDouble();
        double flicker = r.nextBoolean() ? 0.4 * netd * r.nextDouble() : 0;
        return new Config(seed, 320, 240, 40, 0.5, 3.0, m, encoding, netd, 6 + r.nextInt(7), h,
                0.7 + 0.5 * r.nextDouble(), flicker, 0.05, 0.1);
    }

    /**
     * What was generated and its truth.
     *
     * @param boardToFrame       per frame the board-mm-to-frame-px homography, 3 x 3 rows
     *                           ({@code Homography.fromRows} takes them)
     * @param boardCornersPx     per frame the board corners (0,0), (W,0), (W,H), (0,H) in frame px
     * @param leaders            the true leader (LEADER), the two alike parts, faster first (TWO_ALIKE), none (NONE)
     * @param initialRateKPerS   every marked part's true initial rate (its own plus the board's warming)
     * @param riseK              every marked part's true rise above ambient per frame (the body's object temperature)
     * @param emissivity         every marked part's true body emissivity
     */
    public record Output(Config config, Path directory, Path boardFile, List<String> fileNames, double[] tS,
                         double[][][] boardToFrame, double[][][] boardCornersPx, List<String> leaders,
                         Map<String, Double> initialRateKPerS, Map<String, double[]> riseK,
                         Map<String, Double> emissivity, double injectionStartS, double ambientC, double reflectedC) {
        /** The fastest part, null when nothing heats. */
        public String leader() { return leaders.isEmpty() ? null : leaders.get(0); }

        public double[][] boardToFrame(int frame) { return boardToFrame[frame]; }
    }

    // ---- the scene, drawn once per configuration

    private final Config config;
    private final SpotBoard board;
    private final SpotHeat heat;
    private final List<Integer> leaderIndices = new ArrayList<>();
    private final double[][] boardToFrame;
    private final double ambientC, reflectedOffsetK, antiAliasSigmaTexels;
    private final float[] base, emissivityOnBoard, fixedPattern;

    /** Draws the scene of a configuration (board, heat, pose, motion, fixed pattern); frames are rendered on demand. */
    public SpotSeries(Config c) {
        this.config = c;
        SplittableRandom sceneRnd = new SplittableRandom(c.seed());
        SplittableRandom boardRnd = sceneRnd.split(), heatRnd = sceneRnd.split(), camRnd = sceneRnd.split(),
                patternRnd = sceneRnd.split();
        double[] size = SpotBoard.drawSize(boardRnd);
        double[] pose = SpotCamera.basePose(camRnd, c.widthPx(), c.heightPx(), size[0], size[1]);
        double frameScale = Math.sqrt(Math.abs(pose[0] * pose[4] - pose[1] * pose[3]));
        // the picture at 8 px/mm or 3 texels per frame pixel, whichever is finer
        double ppm = Math.max(8, Math.ceil(3 * frameScale));
        board = SpotBoard.draw(boardRnd, size[0], size[1], c.parts(), c.lidChance(), ppm);
        heat = SpotHeat.draw(heatRnd, c, board.parts, leaderIndices);
        double[][] motion = SpotCamera.motions(camRnd, c.motion(), c.frames(), c.widthPx(), c.heightPx());
        boardToFrame = new double[c.frames()][];
        for (int k = 0; k < c.frames(); k++)
            boardToFrame[k] = SpotCamera.normalise(SpotCamera.multiply(motion[k], pose));
        // a resampling prefilter of 0.45 frame px (in texels), so texture finer than a frame pixel does not alias
        antiAliasSigmaTexels = 0.45 * ppm / frameScale;
        ambientC = 21 + 6 * heatRnd.nextDouble();
        reflectedOffsetK = (heatRnd.nextBoolean() ? 1 : -1) * (2 + 4 * heatRnd.nextDouble());
        int n = board.texW * board.texH;
        base = new float[n];
        emissivityOnBoard = new float[n];
        for (int i = 0; i < n; i++) {
            double e = board.emissivity[i];
            // T_app = e T + (1 - e) T_refl with T = ambient at rest and T_refl = ambient + offset
            base[i] = (float) (ambientC + (1 - e) * reflectedOffsetK);
            emissivityOnBoard[i] = board.owner[i] == SpotBoard.MAT ? 0f : (float) e;
        }
        int w = c.widthPx(), h = c.heightPx();
        fixedPattern = new float[w * h];
        double fpn = c.netdK() * (0.5 + patternRnd.nextDouble());
        double[] column = new double[w];
        for (int x = 0; x < w; x++) column[x] = 0.5 * fpn * patternRnd.nextGaussian();
        for (int i = 0; i < w * h; i++) fixedPattern[i] = (float) (fpn * patternRnd.nextGaussian() + column[i % w]);
    }

    public Config config() { return config; }

    /** Every marked part's true initial rate (K/s), board order. */
    public Map<String, Double> initialRates() {
        Map<String, Double> rates = new LinkedHashMap<>();
        for (int p = 0; p < board.parts.size(); p++) rates.put(board.parts.get(p).ref(), heat.initialRateKPerS(p));
        return Collections.unmodifiableMap(rates);
    }

    /** The leader (LEADER), the two alike parts faster first (TWO_ALIKE), or nothing (NONE). */
    public List<String> leaders() {
        List<String> leaders = new ArrayList<>();
        for (int i : leaderIndices) leaders.add(board.parts.get(i).ref());
        return Collections.unmodifiableList(leaders);
    }

    /** The true rise (K) of a part above ambient at a frame's time. */
    double riseK(String ref, int frame) {
        for (int p = 0; p < board.parts.size(); p++)
            if (board.parts.get(p).ref().equals(ref)) return heat.riseK(p, tS(frame));
        throw new IllegalArgumentException(ref);
    }

    double ambientOffsetK(int frame) { return heat.ambientOffsetK(tS(frame)); }

    SpotBoard board() { return board; }

    public double[][] boardToFrameRows(int frame) {
        double[] h = boardToFrame[frame];
        return new double[][]{{h[0], h[1], h[2]}, {h[3], h[4], h[5]}, {h[6], h[7], h[8]}};
    }

    double tS(int frame) { return frame * config.intervalS(); }

    /** The apparent temperature picture in board space at a frame's time (before any blur). */
    float[] boardPicture(int frame) {
        double t = tS(frame);
        float[] pic = new float[base.length];
        float drift = (float) heat.ambientOffsetK(t);
        float warm = (float) (heat.boardRateKPerS * heat.shape(t));
        for (int i = 0; i < pic.length; i++) pic[i] = base[i] + drift + emissivityOnBoard[i] * warm;
        int tw = board.texW;
        for (int p = 0; p < board.parts.size(); p++) {
            if (heat.ownRateKPerS[p] <= 0 || heat.shape(t) <= 0) continue;
            SpotBoard.PartLayout part = board.parts.get(p);
            float rise = (float) (heat.ownRateKPerS[p] * heat.shape(t));
            int u0 = Math.max(0, (int) Math.floor(board.u(part.xMm() - part.wMm() / 2)));
            int u1 = Math.min(tw - 1, (int) Math.ceil(board.u(part.xMm() + part.wMm() / 2)));
            int v0 = Math.max(0, (int) Math.floor(board.v(part.yMm() - part.hMm() / 2)));
            int v1 = Math.min(board.texH - 1, (int) Math.ceil(board.v(part.yMm() + part.hMm() / 2)));
            for (int v = v0; v <= v1; v++)
                for (int u = u0; u <= u1; u++) {
                    int i = v * tw + u;
                    if (board.owner[i] == p) pic[i] += board.emissivity[i] * rise;
                }
            // the spot on the bare board around it, separable: exp(-dx^2/2s^2) exp(-dy^2/2s^2)
            double s0 = 0.5 * Math.sqrt(part.wMm() * part.hMm());
            double var = heat.spotVarianceMm2(s0, t), peak = heat.spotPeakK(p, s0, t), reach = 4 * Math.sqrt(var);
            int su0 = Math.max(0, (int) Math.floor(board.u(part.xMm() - reach)));
            int su1 = Math.min(tw - 1, (int) Math.ceil(board.u(part.xMm() + reach)));
            int sv0 = Math.max(0, (int) Math.floor(board.v(part.yMm() - reach)));
            int sv1 = Math.min(board.texH - 1, (int) Math.ceil(board.v(part.yMm() + reach)));
            float[] gx = new float[su1 - su0 + 1];
            for (int u = su0; u <= su1; u++) {
                double dx = board.xMm(u) - part.xMm();
                gx[u - su0] = (float) Math.exp(-dx * dx / (2 * var));
            }
            for (int v = sv0; v <= sv1; v++) {
                double dy = board.yMm(v) - part.yMm();
                float gy = (float) (peak * Math.exp(-dy * dy / (2 * var)));
                int row = v * tw;
                for (int u = su0; u <= su1; u++) {
                    int i = row + u;
                    if (board.owner[i] == SpotBoard.BOARD) pic[i] += board.emissivity[i] * gy * gx[u - su0];
                }
            }
        }
        return pic;
    }

    /** The apparent temperature of the bench mat (and of everything beyond the picture) at a frame's time. */
    private double matC(int frame) {
        return ambientC + (1 - SpotBoard.MAT_EMISSIVITY) * reflectedOffsetK + heat.ambientOffsetK(tS(frame));
    }

    /** Texel to board mm: x = (u + 0.5) / ppm - margin. */
    private double[] texelToBoard() {
        double s = 1 / board.pxPerMm, o = 0.5 / board.pxPerMm - board.marginMm;
        return new double[]{s, 0, o, 0, s, o, 0, 0, 1};
    }

    /**
     * Warps a board-space picture (texW x texH, float) into frame {@code frame} through its true mapping with
     * OpenCV's {@code warpPerspective} (bilinear), after the anti-alias Gaussian; {@code outside} fills pixels the
     * picture does not reach. No optics blur, no noise.
     */
    float[] warpBoardPicture(float[] picture, int frame, double outside) {
        Mat pic = new Mat(board.texH, board.texW, CvType.CV_32F);
        pic.put(0, 0, picture);
        Imgproc.GaussianBlur(pic, pic, new Size(0, 0), antiAliasSigmaTexels);
        Mat m = new Mat(3, 3, CvType.CV_64F);
        m.put(0, 0, SpotCamera.multiply(boardToFrame[frame], texelToBoard()));
        Mat out = new Mat();
        Imgproc.warpPerspective(pic, out, m, new Size(config.widthPx(), config.heightPx()), Imgproc.INTER_LINEAR,
                org.opencv.core.Core.BORDER_CONSTANT, new Scalar(outside));
        float[] f = new float[config.widthPx() * config.heightPx()];
        out.get(0, 0, f);
        pic.release();
        out.release();
        m.release();
        return f;
    }

    int textureWidth() { return board.texW; }

    int textureHeight() { return board.texH; }

    /** Board mm to texel coordinates (u, v). */
    double[] boardToTexel(double xMm, double yMm) { return new double[]{board.u(xMm), board.v(yMm)}; }

    /** Frame {@code frame} as the camera measured it, degrees Celsius, before the export encoding. */
    public float[] renderFrame(int frame) {
        float[] f = warpBoardPicture(boardPicture(frame), frame, matC(frame));
        int w = config.widthPx(), h = config.heightPx();
        Mat m = new Mat(h, w, CvType.CV_32F);
        m.put(0, 0, f);
        Imgproc.GaussianBlur(m, m, new Size(0, 0), config.opticsSigmaPx());
        m.get(0, 0, f);
        m.release();
        SplittableRandom noise = new SplittableRandom(mix(config.seed(), frame));
        float flicker = (float) (config.flickerK() * noise.nextGaussian());
        float netd = (float) config.netdK();
        for (int i = 0; i < f.length; i++) f[i] += fixedPattern[i] + flicker + netd * (float) noise.nextGaussian();
        return f;
    }

    static long mix(long seed, int frame) {
        long z = seed * 0xD1B54A32D192ED03L + (frame + 7) * 0x9E3779B97F4A7C15L;
        z = (z ^ (z >>> 32)) * 0xD6E8FEB86659FD93L;
        return z ^ (z >>> 32);
    }

    /** An auto-ranging camera's span: the frame's minimum and maximum, 0.05 K wider, out to the tenth of a kelvin. */
    static double[] autoSpan(float[] f) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (float v : f) {
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        return new double[]{Math.floor((lo - 0.05) * 10) / 10, Math.ceil((hi + 0.05) * 10) / 10};
    }

    static String fileName(int frame) {
        return String.format(Locale.ROOT, "f%04d.png", frame + 1);
    }

    /** Writes one frame as PNG through OpenCV's encoder; returns the 8-bit span or null. */
    static double[] writeFrame(Path file, float[] celsius, int w, int h, Encoding enc) {
        Mat m;
        double[] span = null;
        if (enc == Encoding.U16_CENTIKELVIN) {
            short[] counts = new short[celsius.length];
            for (int i = 0; i < counts.length; i++) {
                long c = Math.round((celsius[i] + 273.15) * 100);
                counts[i] = (short) Math.max(0, Math.min(65535, c));
            }
            m = new Mat(h, w, CvType.CV_16UC1);
            m.put(0, 0, counts);
        } else {
            span = autoSpan(celsius);
            byte[] level = new byte[celsius.length];
            double k = 255 / (span[1] - span[0]);
            for (int i = 0; i < level.length; i++)
                level[i] = (byte) Math.max(0, Math.min(255, Math.round((celsius[i] - span[0]) * k)));
            m = new Mat(h, w, CvType.CV_8UC1);
            m.put(0, 0, level);
        }
        if (!Imgcodecs.imwrite(file.toString(), m)) throw new UncheckedIOException(new IOException("cannot write " + file));
        m.release();
        return span;
    }

    private static final ObjectWriter JSON;

    static {
        DefaultPrettyPrinter pp = new DefaultPrettyPrinter().withObjectIndenter(new DefaultIndenter("  ", "\n"))
                .withArrayIndenter(DefaultPrettyPrinter.FixedSpaceIndenter.instance);
        JSON = new ObjectMapper().writer(pp);
    }

    private static void writeJson(Path file, Object value) {
        try {
            Files.write(file, (JSON.writeValueAsString(value) + "\n").getBytes(StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }

    /** Generates the series of {@code c} into {@code dir} (created when missing). */
    public static Output generate(Config c, Path dir) {
        return new SpotSeries(c).write(dir);
    }

    /** Renders and writes every frame, series.json and board.json. */
    public Output write(Path dir) {
        try {
            Files.createDirectories(dir);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create " + dir, e);
        }
        Config c = config;
        int n = c.frames();
        List<String> names = new ArrayList<>();
        double[] times = new double[n];
        Map<String, Sidecar.FrameEntry> entries = new LinkedHashMap<>();
        double[][][] rows = new double[n][][];
        double[][][] corners = new double[n][][];
        double wMm = board.widthMm, hMm = board.heightMm;
        for (int k = 0; k < n; k++) {
            String name = fileName(k);
            names.add(name);
            times[k] = tS(k);
            double[] span = writeFrame(dir.resolve(name), renderFrame(k), c.widthPx(), c.heightPx(), c.encoding());
            entries.put(name, new Sidecar.FrameEntry(times[k], span));
            rows[k] = boardToFrameRows(k);
            double[] h = boardToFrame[k];
            corners[k] = new double[][]{SpotCamera.apply(h, 0, 0), SpotCamera.apply(h, wMm, 0),
                    SpotCamera.apply(h, wMm, hMm), SpotCamera.apply(h, 0, hMm)};
        }
        double reflectedC = ambientC + reflectedOffsetK;
        Sidecar.Injection injection = new Sidecar.Injection(c.injectionStartS(), "P3V3", "GND", 0.8, 2.0,
                "bench supply, constant-current mode", "synthetic: current into the 3.3 V rail");
        Sidecar sidecar = new Sidecar(c.encoding().profile, c.intervalS(), null, reflectedC, entries, injection,
                "synthetic spot-model series (risetrace test scope), seed " + c.seed());
        List<Part> parts = new ArrayList<>();
        Map<String, Double> emissivity = new LinkedHashMap<>();
        Map<String, double[]> rise = new LinkedHashMap<>();
        for (int p = 0; p < board.parts.size(); p++) {
            SpotBoard.PartLayout l = board.parts.get(p);
            parts.add(new Part(l.ref(), l.kind(), l.material(), l.xMm(), l.yMm(), l.wMm(), l.hMm(), null));
            emissivity.put(l.ref(), l.emissivity());
            double[] r = new double[n];
            for (int k = 0; k < n; k++) r[k] = heat.riseK(p, times[k]);
            rise.put(l.ref(), r);
        }
        // the outline marked on the first frame with the true corners
        Board b = new Board(String.format(Locale.ROOT, "SP-%d spot-model test board (synthetic)", c.seed()),
                new double[]{wMm, hMm}, new Outline(names.get(0), corners[0], null), parts, null);
        Path boardFile = dir.resolve("board.json");
        writeJson(boardFile, b);
        writeJson(dir.resolve("series.json"), sidecar);
        return new Output(c, dir, boardFile, Collections.unmodifiableList(names), times, rows, corners,
                leaders(), initialRates(), Collections.unmodifiableMap(rise),
                Collections.unmodifiableMap(emissivity), c.injectionStartS(), ambientC, reflectedC);
    }
}
