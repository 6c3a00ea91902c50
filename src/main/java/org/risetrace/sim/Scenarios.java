package org.risetrace.sim;

import org.risetrace.io.write.FrameEncoding;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * Scenarios built in code, for tests of every stage: a small board in a 160 x 128 view that simulates in a
 * fraction of a second, and random boards for calibration runs. Change them with the {@code with...} methods of
 * {@link Scenario}.
 */
public final class Scenarios {
    private Scenarios() {
    }

    private static Scenario.PartSpec part(String ref, String kind, double x, double y, double w, double h,
                                          String leads, Double emissivity, String material) {
        return new Scenario.PartSpec(ref, kind, material, x, y, w, h, null, kind.equals("capacitor") ? 1.0 : 1.2,
                null, null, emissivity, leads, null, null);
    }

    /**
     * A 60 x 40 mm two-phase converter: switches Q1..Q4, inductors L1, L2, capacitors C1..C4, controller U1 and a
     * power trace; Q1 shorted and dissipating {@code powerW} from 2 s; 160 x 128 px on a stand, 16-bit
     * centikelvin PNG, 30 frames at 0.5 s.
     */
    public static Scenario small(double powerW) {
        List<Scenario.PartSpec> parts = new ArrayList<>();
        parts.add(part("Q1", "mosfet", 12, 10, 5, 6, "sides", null, "epoxy moulded package"));
        parts.add(part("Q2", "mosfet", 12, 22, 5, 6, "sides", null, "epoxy moulded package"));
        parts.add(part("Q3", "mosfet", 30, 10, 5, 6, "sides", null, "epoxy moulded package"));
        parts.add(part("Q4", "mosfet", 30, 22, 5, 6, "sides", null, "epoxy moulded package"));
        parts.add(part("L1", "inductor", 21, 31, 7, 7, "none", null, null));
        parts.add(part("L2", "inductor", 39, 31, 7, 7, "none", null, null));
        parts.add(part("C1", "capacitor", 6, 33, 3.2, 1.6, "ends", null, "ceramic capacitor body"));
        parts.add(part("C2", "capacitor", 48, 8, 3.2, 1.6, "ends", null, "ceramic capacitor body"));
        parts.add(part("C3", "capacitor", 48, 14, 2.0, 1.25, "ends", null, "ceramic capacitor body"));
        parts.add(part("C4", "capacitor", 54, 30, 2.0, 1.25, "ends", null, "ceramic capacitor body"));
        parts.add(part("U1", "ic", 47, 22, 5, 4, "sides", null, "epoxy moulded package"));
        List<Scenario.TraceSpec> traces = List.of(
                new Scenario.TraceSpec("VIN", new double[][]{{2, 4}, {40, 4}}, 2.0, 35.0, false),
                new Scenario.TraceSpec(null, new double[][]{{47, 22}, {47, 35}, {30, 37}}, 0.5, 35.0, true));
        List<Scenario.HoleSpec> holes = List.of(new Scenario.HoleSpec(3, 37, 2.5, 0.6),
                new Scenario.HoleSpec(57, 3, 2.5, 0.6));
        Scenario.BoardSpec board = new Scenario.BoardSpec("small two-phase test board", new double[]{60, 40}, 1.6,
                List.of(new Scenario.CopperLayer(35, 0.5), new Scenario.CopperLayer(35, 0.7)), 1.0, 10.0, null, null,
                "ambient", parts, traces, holes);
        Scenario.Fault fault = new Scenario.Fault(List.of(new Scenario.SourceShare("Q1", 0.9),
                new Scenario.SourceShare("VIN", 0.1)), powerW, "step", null, null);
        Scenario.CameraSpec camera = new Scenario.CameraSpec(160, 128, 400, 250.0, 3.0, 30.0, 2.0, null,
                Scenario.Motion.stand(0.03), 0.7, 0.05, 0.02, null, FrameEncoding.U16_CENTIKELVIN_PNG.id(), null, null,
                2, null, 26.0, null);
        Scenario.InjectionSpec inj = new Scenario.InjectionSpec("VIN", "GND", 1.0, 2.0, "bench supply", null);
        return new Scenario("small", 1L, board, fault, inj, camera, new Scenario.Timing(30, 0.5, 2.0, 0.25),
                new Scenario.AmbientSpec(23.0, 0.0), null);
    }

    /** {@link #small(double)} at 1.5 W. */
    public static Scenario small() {
        return small(1.5);
    }

    /**
     * A random small board: {@code parts} parts (switches, capacitors, one IC) placed without overlap on a 60 x 40 mm
     * board, one random part the source at {@code powerW}, the rest as in {@link #small(double)}.
     */
    public static Scenario random(long seed, int parts, double powerW) {
        SplittableRandom rnd = new SplittableRandom(seed);
        List<Scenario.PartSpec> list = new ArrayList<>();
        int tries = 0;
        while (list.size() < parts && tries++ < 10000) {
            int kindPick = rnd.nextInt(3);
            String kind = kindPick == 0 ? "mosfet" : kindPick == 1 ? "capacitor" : "ic";
            double w = kind.equals("capacitor") ? 2.0 + rnd.nextDouble() * 1.2 : 4 + rnd.nextDouble() * 2;
            double h = kind.equals("capacitor") ? 1.25 + rnd.nextDouble() * 0.4 : 4 + rnd.nextDouble() * 2;
            double x = 5 + rnd.nextDouble() * 50, y = 5 + rnd.nextDouble() * 30;
            boolean clash = false;
            for (Scenario.PartSpec p : list)
                if (Math.abs(p.xMm() - x) < (p.wMm() + w) / 2 + 2 && Math.abs(p.yMm() - y) < (p.hMm() + h) / 2 + 2) clash = true;
            if (clash) continue;
            String ref = (kind.equals("mosfet") ? "Q" : kind.equals("capacitor") ? "C" : "U") + (list.size() + 1);
            list.add(part(ref, kind, x, y, w, h, kind.equals("capacitor") ? "ends" : "sides", null, null));
        }
        String source = list.get(rnd.nextInt(list.size())).ref();
        Scenario base = small(powerW);
        Scenario.BoardSpec b = base.board();
        Scenario.BoardSpec board = new Scenario.BoardSpec("random board " + seed, b.sizeMm(), b.thicknessMm(),
                b.copperLayers(), b.cellMm(), b.hConvWPerM2K(), null, null, "ambient", list, List.of(), b.holes());
        return base.withBoard(board).withSources(List.of(new Scenario.SourceShare(source, 1.0))).withSeed(seed);
    }
}
