package org.risetrace.report;

import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisResult;
import org.risetrace.analysis.BoardMap;
import org.risetrace.analysis.FrameRecord;
import org.risetrace.analysis.Hotspot;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.RiseCurve;
import org.risetrace.analysis.RiseModelFit;
import org.risetrace.analysis.Verdict;
import org.risetrace.analysis.VerdictStatus;
import org.risetrace.board.Board;
import org.risetrace.board.Outline;
import org.risetrace.board.Part;
import org.risetrace.io.Sidecar;
import org.risetrace.registration.BoardRaster;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

/**
 * Invented test data only: a small made-up board ("RT-7 bench board", 80 x 60 mm, ten parts), 60 frames two
 * seconds apart, rise curves from one- and (for the fault, die plus board) two-time-constant formulas with seeded
 * noise, fitted by {@link RiseModelFit}, maps from Gaussians. No real product.
 */
final class DemoAnalysis {
    static final int FRAMES = 60;
    static final double INTERVAL_S = 2.0;
    static final double START_S = 10.0;
    static final double PX_PER_MM = 4.0;
    static final double BOARD_W_MM = 80, BOARD_H_MM = 60;

    /** ref, x, y, w, h, rotation, dT_inf, tau, delay after start; Q3 is the invented fault. */
    private static final Object[][] PARTS = {
            {"Q3", 30.0, 20.0, 5.0, 6.0, 0.0, 9.0, 45.0, 0.0},
            {"Q5", 40.0, 20.0, 5.0, 6.0, 0.0, 4.0, 60.0, 6.0},
            {"L1", 35.0, 34.0, 10.0, 10.0, 0.0, 3.2, 80.0, 8.0},
            {"Q1", 20.0, 20.0, 5.0, 6.0, 0.0, 2.4, 70.0, 10.0},
            {"U3", 60.0, 20.0, 9.0, 9.0, 45.0, 1.6, 90.0, 14.0},
            {"C12", 24.0, 44.0, 3.2, 1.6, 90.0, 1.2, 60.0, 14.0},
            {"C14", 46.0, 44.0, 3.2, 1.6, 0.0, 0.9, 60.0, 18.0},
            {"R5", 66.0, 42.0, 2.0, 1.25, 30.0, 0.6, 50.0, 20.0},
            {"L2", 12.0, 44.0, 8.0, 8.0, 0.0, 0.4, 90.0, 24.0},
            {"D2", 70.0, 52.0, 4.0, 2.5, 0.0, 0.2, 90.0, 28.0}};

    private DemoAnalysis() { }

    static Analysis build() { return build(false, false); }

    /**
     * @param unmarkedHottest add an unmarked spot hotter than every part (an unmarked capacitor)
     * @param comparison      a before/after pair: two frames, no rates, curves of one point
     */
    static Analysis build(boolean unmarkedHottest, boolean comparison) {
        Random random = new Random(7);
        int nFrames = comparison ? 2 : FRAMES;
        double[] t = new double[nFrames];
        for (int i = 0; i < nFrames; i++) t[i] = comparison ? i * 60.0 : i * INTERVAL_S;
        double tEnd = t[nFrames - 1];

        List<Part> parts = new ArrayList<>();
        List<RiseCurve> curves = new ArrayList<>();
        List<PartResult> results = new ArrayList<>();
        for (int k = 0; k < PARTS.length; k++) {
            Object[] p = PARTS[k];
            String ref = (String) p[0];
            double dtInf = (double) p[6], tau = (double) p[7], t0 = START_S + (double) p[8];
            parts.add(new Part(ref, k < 2 ? "mosfet" : null, null, (double) p[1], (double) p[2], (double) p[3],
                    (double) p[4], (double) p[5] == 0 ? null : (double) p[5]));
            double[] rise = new double[nFrames];
            // the invented fault Q3 has a die term besides the board's: 35 % of its rise with a 5 s time constant
            double die = k == 0 ? 0.35 : 0.0;
            for (int i = 0; i < nFrames; i++) {
                double model = t[i] <= t0 ? 0 : dtInf * ((1 - die) * (1 - Math.exp(-(t[i] - t0) / tau))
                        + die * (1 - Math.exp(-(t[i] - t0) / 5.0)));
                rise[i] = model + 0.03 * random.nextGaussian();
            }
            if (comparison) {
                curves.add(new RiseCurve(ref, new double[]{tEnd}, new double[]{rise[nFrames - 1]}, null, null, null));
                results.add(new PartResult(ref, k + 1, null, null, rise[nFrames - 1], null, null, null, null, null,
                        null, 0.03, 1.0, 0.95, List.of()));
            } else {
                RiseModelFit fit = RiseModelFit.fit(t, rise, t0);
                curves.add(new RiseCurve(ref, t, rise, t0 + 2, fit));
                double rate = dtInf / tau;
                List<String> warnings = ref.equals("R5") ? List.of("emissivity 0.35: reading may be low")
                        : ref.equals("D2") ? List.of("12 % of the footprint outside some frames") : List.of();
                results.add(new PartResult(ref, k + 1, rate, 0.004 + 0.001 * k, rise[nFrames - 1], t0 + 2,
                        fit == null ? null : fit.slow().tauS(), fit == null ? null : fit.slow().tauSe(),
                        fit == null ? null : fit.dtInfK(), fit == null ? null : fit.dtInfSe(),
                        fit == null ? null : fit.rmsK(), 0.03, ref.equals("D2") ? 0.88 : 1.0,
                        ref.equals("R5") ? 0.35 : 0.95, warnings, fit));
            }
        }

        // maps: a Gaussian per part with its final rise, a wider spread for later parts
        int w = (int) (BOARD_W_MM * PX_PER_MM), h = (int) (BOARD_H_MM * PX_PER_MM);
        float[] riseMap = new float[w * h], onset = new float[w * h], celsius = new float[w * h];
        boolean[] valid = new boolean[w * h];
        double ux = 56, uy = 30, uAmp = unmarkedHottest ? 11.0 : 0.0;
        for (int j = 0; j < h; j++) {
            for (int i = 0; i < w; i++) {
                double x = (i + 0.5) / PX_PER_MM, y = (j + 0.5) / PX_PER_MM;
                double r = 0;
                for (int k = 0; k < PARTS.length; k++) {
                    Part p = parts.get(k);
                    double s = 2.5 + k * 0.4;
                    double d2 = (x - p.xMm()) * (x - p.xMm()) + (y - p.yMm()) * (y - p.yMm());
                    r += last(curves.get(k)) * Math.exp(-d2 / (2 * s * s));
                }
                r += uAmp * Math.exp(-((x - ux) * (x - ux) + (y - uy) * (y - uy)) / (2 * 1.5 * 1.5));
                int idx = j * w + i;
                riseMap[idx] = (float) r;
                // onset: heat spreads from Q3 (or the unmarked spot) at 0.5 mm/s; points that never rose are NaN
                double sx = unmarkedHottest ? ux : 30, sy = unmarkedHottest ? uy : 20;
                double dist = Math.hypot(x - sx, y - sy);
                onset[idx] = r > 0.3 ? (float) (2 + dist / 0.5) : Float.NaN;
                valid[idx] = !(i > w - 12 && j < 30);  // a corner that fell outside the last frame
                celsius[idx] = valid[idx] ? (float) (23.5 + r + 0.4 * Math.sin(x / 7) * Math.cos(y / 9)) : Float.NaN;
            }
        }

        List<FrameRecord> frames = new ArrayList<>();
        for (int i = 0; i < nFrames; i++) {
            String status = i == 37 ? "failed" : (i == 21 || i == 22) ? "weak" : i == 0 ? "marked" : "ok";
            Double rms = status.equals("failed") ? null : 0.25 + 0.1 * Math.abs(Math.sin(i / 5.0))
                    + (status.equals("weak") ? 1.1 : 0);
            String reason = status.equals("failed") ? "too few board features matched (hand blocked the view)"
                    : status.equals("weak") ? "camera moved; residual above 1 px" : null;
            double[][] corners = status.equals("failed") ? null
                    : new double[][]{{12 + i * 0.05, 10}, {300, 11}, {301, 230}, {11, 229}};
            String file = String.format("frame_%03d.tiff", i + 1);
            frames.add(new FrameRecord(file, t[i], sha256(file), !status.equals("failed"),
                    new FrameRecord.Registration(status, rms, reason, corners)));
        }

        List<Hotspot> hotspots = new ArrayList<>();
        if (unmarkedHottest) hotspots.add(new Hotspot(ux, uy, 11.0, null));
        hotspots.add(new Hotspot(30.2, 19.9, last(curves.get(0)), "Q3"));
        hotspots.add(new Hotspot(35.1, 34.2, last(curves.get(2)), "L1"));
        hotspots.add(new Hotspot(50.4, 52.0, 0.7, null));

        Verdict verdict;
        if (unmarkedHottest) {
            // as Verdicts gives it: no marked part is named when the source is the unmarked spot
            verdict = new Verdict(VerdictStatus.INCONCLUSIVE, null, null, null, null,
                    "the hottest spot is on no marked part");
        } else if (comparison) {
            verdict = new Verdict(VerdictStatus.IDENTIFIED, "Q3", null, "Q5", 41.0,
                    "Q3 rose most, far above the noise");
        } else {
            verdict = new Verdict(VerdictStatus.IDENTIFIED, "Q3", 0.2, "Q5", 7.9,
                    "leader ahead of the runner-up by 7.9 combined standard errors");
        }
        Map<String, Object> parameters = new LinkedHashMap<>();
        parameters.put("statistic", "p95");
        parameters.put("onset_k_sigma", 4.0);
        parameters.put("rate_window_s", 20.0);
        parameters.put("smoothing_mm", 0.8);
        parameters.put("baseline_frames", 5);
        parameters.put("nan_example", Double.NaN);

        Sidecar.Injection injection = new Sidecar.Injection(START_S, "VCORE", "GND", 1.0, 3.0,
                "bench supply, 30 V 5 A", "clip on the output capacitor bank, lead length 20 cm");
        AnalysisResult result = new AnalysisResult(AnalysisResult.SCHEMA, "risetrace", "0.1.0",
                "2026-12-01T23:40:00Z", "cases/rt7-bench/series-01", "cases/rt7-bench/board.json", "u16-centikelvin",
                parameters, injection, verdict, results, hotspots, frames);
        Board board = new Board("RT-7 bench board", new double[]{BOARD_W_MM, BOARD_H_MM},
                new Outline("frame_001.tiff", new double[][]{{12, 10}, {300, 11}, {301, 230}, {11, 229}}, null),
                parts, null);
        return new Analysis(result, board, curves,
                new BoardMap(w, h, PX_PER_MM, riseMap, "K"),
                new BoardMap(w, h, PX_PER_MM, onset, "s"),
                new BoardRaster(w, h, PX_PER_MM, celsius, valid));
    }

    private static double last(RiseCurve c) { return c.riseK()[c.riseK().length - 1]; }

    static String sha256(String s) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(s.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Writes demo reports for looking at by eye: {@code java ... DemoAnalysis outDir}. */
    public static void main(String[] args) {
        Path out = Path.of(args.length > 0 ? args[0] : "target/report-demo");
        Reports.writeAll(build(), out.resolve("identified"), "Customer reports no power after a liquid spill.\nBoard arrived without its battery.");
        Reports.writeAll(build(true, false), out.resolve("unmarked"), null);
        ComparisonReport.writeAll(build(false, true), out.resolve("compare"), null);
    }
}
