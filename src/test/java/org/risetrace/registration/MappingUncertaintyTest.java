package org.risetrace.registration;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.sim.Scenario;
import org.risetrace.synth.SpotSeries;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.function.Function;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The per-frame corner error estimate ({@code corner_sigma_px}) against the true corner error, on series from two
 * different generators (our simulator with heating and chain links over 40 frames; the spot model with OpenCV warps
 * and a tilting hand-held camera), stand and hand-held, 16-bit and 8-bit. Issue 10, item 2: the RMS of true error /
 * estimated error between 0.7 and 1.5, and no frame graded ok more than 1 px off.
 *
 * <p>The RMS of the ratio is 1 exactly when the estimate is the RMS of the error it describes: the check of a
 * standard deviation against realised errors (the calibration of a predicted uncertainty; for normal errors the ratio
 * of an error component to its sigma has unit RMS). The true error is the RMS over the four corners of the distance
 * between the registered and the true corners (truth.json / the spot model's homographies), the reference outline
 * marked with its true corners (the marking's own error belongs to the outline, not to registration).
 *
 * <p>{@code mvn test} runs a reduced set (about 400 frames); the calibration set (about 1,900 frames) runs as a
 * benchmark: {@code mvn test -Dbench.exclude=none -Dgroups=benchmark -Dtest=MappingUncertaintyTest}, numbers in
 * DEVELOPERS.md ("Mapping uncertainty").
 */
class MappingUncertaintyTest {
    @TempDir
    Path dir;

    /** Frames of each group, then the checks. */
    private static void check(List<UncertaintyCalibrationRun.Row> rows, int minFrames) {
        List<UncertaintyCalibrationRun.Row> mapped = rows.stream()
                .filter(r -> r.status() != RegistrationStatus.FAILED && Double.isFinite(r.trueRmsPx()))
                .toList();
        assertTrue(mapped.size() >= minFrames, "premise: " + mapped.size() + " mapped frames");
        Map<String, List<UncertaintyCalibrationRun.Row>> groups = mapped.stream().collect(Collectors.groupingBy(
                r -> r.generator() + " " + r.motion(), TreeMap::new, Collectors.toList()));
        StringBuilder log = new StringBuilder();
        for (Map.Entry<String, List<UncertaintyCalibrationRun.Row>> g : groups.entrySet())
            log.append(summary(g.getKey(), g.getValue()));
        log.append(summary("all", mapped));
        System.out.println("mapping uncertainty:" + log);
        double all = ratioRms(mapped);
        // issue 10 item 2: RMS of true / estimated error between 0.7 and 1.5 (over all frames, and per generator)
        assertTrue(all >= 0.7 && all <= 1.5, "ratio RMS " + all + log);
        for (String gen : List.of("sim", "spot")) {
            List<UncertaintyCalibrationRun.Row> part = mapped.stream().filter(r -> r.generator().startsWith(gen)).toList();
            double q = ratioRms(part);
            assertTrue(q >= 0.7 && q <= 1.5, gen + ": ratio RMS " + q + log);
        }
        // issue 10 item 2: an ok frame is never more than 1 px off
        for (UncertaintyCalibrationRun.Row r : mapped)
            if (r.status() == RegistrationStatus.OK)
                assertTrue(r.trueRmsPx() <= 1.0, "ok frame " + r.tsv());
    }

    static double ratioRms(List<UncertaintyCalibrationRun.Row> rows) {
        double s = 0;
        for (UncertaintyCalibrationRun.Row r : rows) s += Math.pow(r.trueRmsPx() / r.sigmaPx(), 2);
        return Math.sqrt(s / rows.size());
    }

    private static String summary(String name, List<UncertaintyCalibrationRun.Row> rows) {
        Function<RegistrationStatus, Long> count = st -> rows.stream().filter(r -> r.status() == st).count();
        double maxOk = rows.stream().filter(r -> r.status() == RegistrationStatus.OK)
                .mapToDouble(UncertaintyCalibrationRun.Row::trueRmsPx).max().orElse(Double.NaN);
        double mean = rows.stream().mapToDouble(UncertaintyCalibrationRun.Row::trueRmsPx).average().orElse(Double.NaN);
        return String.format(Locale.ROOT, "%n  %-28s %4d frames (ok %d, weak %d): true error mean %.3f px, max over ok %.3f px;"
                        + " RMS of true / estimated %.2f", name, rows.size(), count.apply(RegistrationStatus.OK),
                count.apply(RegistrationStatus.WEAK), mean, maxOk, ratioRms(rows));
    }

    private List<UncertaintyCalibrationRun.Row> rows(int simSeries, int spotSeries, long seedOffset) {
        List<UncertaintyCalibrationRun.Row> rows = new ArrayList<>();
        rows.addAll(UncertaintyCalibrationRun.simulator(dir, Scenario.Motion.stand(0.15), 51000 + seedOffset, simSeries, 40));
        rows.addAll(UncertaintyCalibrationRun.simulator(dir, Scenario.Motion.handheld(5, 0.10, 0.15), 52000 + seedOffset,
                simSeries, 40));
        for (SpotSeries.MotionKind m : SpotSeries.MotionKind.values())
            for (SpotSeries.Encoding e : SpotSeries.Encoding.values())
                rows.addAll(UncertaintyCalibrationRun.spot(dir, m, e, 53000 + seedOffset + 100L * m.ordinal()
                        + 1000L * e.ordinal(), spotSeries));
        return rows;
    }

    @Test
    void estimatedCornerErrorsMatchTheTrueErrorsOnBothGenerators() {
        check(rows(3, 1, 0), 350);
    }

    @Test
    @Tag("benchmark")
    void calibrationSetOfAtLeastAThousandFrames() {
        List<UncertaintyCalibrationRun.Row> rows = rows(12, 6, 500);
        check(rows, 1000);
    }

    /**
     * The estimate's parts combine as errors do, checked through the estimate's own results rather than its formula:
     * independent errors' variances add (Bienayme), so a chain link's squared corner error is the earlier mapping's
     * plus its own; an error measured in reference pixels is a length, so at zoom 2 it is twice as many frame pixels.
     */
    @Test
    void chainLinkVariancesAdd() {
        MappingUncertainty direct = MappingUncertainty.direct(0.01, 0.04, Double.NaN, 1.0);
        MappingUncertainty own = MappingUncertainty.direct(0.02, 0.02, Double.NaN, 2.0);
        MappingUncertainty link = own.after(direct);
        double sd = direct.cornerSigmaPx(), so = own.cornerSigmaPx(), sl = link.cornerSigmaPx();
        assertTrue(sd > 0 && so > 0, sd + " " + so);
        assertEquals(sd * sd + so * so, sl * sl, 1e-12);
        assertEquals(2, link.mappings());
        // zoom: the same reference-pixel variances at zoom 2 give twice the corner error of zoom 1
        assertEquals(2 * MappingUncertainty.direct(0.02, 0.02, Double.NaN, 1.0).cornerSigmaPx(), so, 1e-12);
        // each part counts: more alignment variance or more patch correction, more error
        assertTrue(MappingUncertainty.direct(0.05, 0.04, Double.NaN, 1.0).cornerSigmaPx() > sd);
        assertTrue(MappingUncertainty.direct(0.01, 0.09, Double.NaN, 1.0).cornerSigmaPx() > sd);
        // composing after nothing measured changes nothing; nothing measured has no error to report
        assertEquals(sd, direct.after(MappingUncertainty.NONE).cornerSigmaPx(), 0.0);
        assertTrue(Double.isNaN(MappingUncertainty.NONE.cornerSigmaPx()));
    }
}
