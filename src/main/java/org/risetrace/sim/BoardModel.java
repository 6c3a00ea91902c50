package org.risetrace.sim;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The thermal model of a scenario's board: the grid, the parts as lumped nodes, and the power distribution.
 *
 * <p>Each cell's in-plane conductance-thickness product is k_eff*t = k_FR4*t_FR4 + sum(k_Cu*t_Cu*fill) plus the
 * copper of tracks crossing it; conductance between neighbours is the series (harmonic) combination of the two
 * half-cells. Heat capacity per area likewise sums laminate and copper. Both faces lose heat with
 * h = h_conv + 4*e*sigma*T_amb^3 (linearised radiation); where a part covers the top face, the part's own top
 * face loses instead. Mounting holes are ignored thermally (their area is small).
 */
final class BoardModel {
    final Scenario scenario;
    final ThermalModel model;
    final int nx, ny;
    final double dxMm, dyMm;
    final List<Scenario.PartSpec> parts;
    /** Node power per watt of fault power (sums to 1 when sources are given). */
    final double[] faultShare;
    /** Node idle power, W. */
    final double[] idleW;
    final Map<String, Integer> partIndex = new HashMap<>();

    BoardModel(Scenario s) {
        this.scenario = s;
        Scenario.BoardSpec b = s.board();
        double cell = b.cellOrDefault();
        nx = Math.max(1, (int) Math.ceil(b.widthMm() / cell - 1e-9));
        ny = Math.max(1, (int) Math.ceil(b.heightMm() / cell - 1e-9));
        dxMm = b.widthMm() / nx;
        dyMm = b.heightMm() / ny;
        parts = b.partsOrEmpty();
        model = new ThermalModel(nx, ny, parts.size());
        int cells = nx * ny;
        faultShare = new double[model.nodes()];
        idleW = new double[model.nodes()];
        for (int p = 0; p < parts.size(); p++) partIndex.put(parts.get(p).ref(), p);

        double tFr4 = b.thicknessOrDefault() * 1e-3;
        double ktBase = Materials.FR4_K * tFr4;
        double rcBase = Materials.FR4_RHO * Materials.FR4_C * tFr4;
        for (Scenario.CopperLayer l : b.copperOrDefault()) {
            double tCu = l.thicknessUm() * 1e-6;
            ktBase += Materials.COPPER_K * tCu * l.fill();
            rcBase += Materials.COPPER_RHO * Materials.COPPER_C * tCu * l.fill();
        }
        double[] kt = new double[cells];
        double[] rc = new double[cells];
        java.util.Arrays.fill(kt, ktBase);
        java.util.Arrays.fill(rc, rcBase);

        // tracks: coverage per cell by 4 x 4 sub-samples
        final int sub = 4;
        List<Scenario.TraceSpec> traces = b.tracesOrEmpty();
        Map<String, double[]> traceCoverage = new HashMap<>();
        for (Scenario.TraceSpec t : traces) {
            double[] cov = coverage(sub, (x, y) -> t.distanceMm(x, y) <= t.widthMm() / 2, boundsOf(t));
            if (t.ref() != null) traceCoverage.put(t.ref(), cov);
            double tCu = t.thicknessOrDefault() * 1e-6;
            for (int c = 0; c < cells; c++) {
                if (cov[c] == 0) continue;
                kt[c] += Materials.COPPER_K * tCu * cov[c];
                rc[c] += Materials.COPPER_RHO * Materials.COPPER_C * tCu * cov[c];
            }
        }

        // parts: coverage per cell; contact distributed by covered area
        double[] covered = new double[cells];
        double ambK = s.ambientOrDefault().startC() + 273.15;
        double hConv = b.hConvOrDefault();
        double areaCellM2 = dxMm * dyMm * 1e-6;
        for (int p = 0; p < parts.size(); p++) {
            Scenario.PartSpec part = parts.get(p);
            double[] cov = coverage(sub, (x, y) -> part.containsLocal(x, y, null), boundsOf(part));
            double total = 0;
            for (double v : cov) total += v;
            int node = cells + p;
            if (total == 0) {
                int ci = Math.min(nx - 1, (int) (part.xMm() / dxMm)), cj = Math.min(ny - 1, (int) (part.yMm() / dyMm));
                cov[cj * nx + ci] = 1.0;
                total = 1.0;
            }
            double contact = part.contactOrDefault();
            for (int c = 0; c < cells; c++) {
                if (cov[c] == 0) continue;
                model.couple(node, c, contact * cov[c] / total);
                covered[c] += cov[c];
            }
            model.capacity[node] = part.heatCapacityOrDefault();
            model.loss[node] = part.areaM2() * (hConv + Materials.radiativeH(part.emissivityOrDefault(), ambK));
            idleW[node] = part.idlePowerOrZero();
        }

        double hMask = hConv + Materials.radiativeH(b.maskEmissivityOrDefault(), ambK);
        for (int c = 0; c < cells; c++) {
            model.capacity[c] = rc[c] * areaCellM2;
            double faces = 2.0 - Math.min(1.0, covered[c]);
            model.loss[c] = hMask * areaCellM2 * faces;
        }
        for (int j = 0; j < ny; j++)
            for (int i = 0; i < nx - 1; i++) {
                int a = j * nx + i;
                // series combination of two half cells: G = dy / (dx/2/kt_a + dx/2/kt_b)
                model.gx[j * (nx - 1) + i] = dyMm / (0.5 * dxMm / kt[a] + 0.5 * dxMm / kt[a + 1]);
            }
        for (int j = 0; j < ny - 1; j++)
            for (int i = 0; i < nx; i++) {
                int a = j * nx + i;
                model.gy[a] = dxMm / (0.5 * dyMm / kt[a] + 0.5 * dyMm / kt[a + nx]);
            }

        for (Scenario.SourceShare src : s.fault().sourcesOrEmpty()) {
            Integer p = partIndex.get(src.ref());
            if (p != null) {
                faultShare[cells + p] += src.share();
                continue;
            }
            double[] cov = traceCoverage.get(src.ref());
            if (cov == null) continue;
            double total = 0;
            for (double v : cov) total += v;
            if (total == 0) continue;
            for (int c = 0; c < cells; c++) faultShare[c] += src.share() * cov[c] / total;
        }
    }

    interface Inside {
        boolean test(double xMm, double yMm);
    }

    private static double[] boundsOf(Scenario.PartSpec p) {
        double r = 0.5 * Math.hypot(p.wMm(), p.hMm());
        return new double[]{p.xMm() - r, p.yMm() - r, p.xMm() + r, p.yMm() + r};
    }

    private static double[] boundsOf(Scenario.TraceSpec t) {
        double x0 = Double.POSITIVE_INFINITY, y0 = x0, x1 = Double.NEGATIVE_INFINITY, y1 = x1;
        for (double[] pt : t.pointsMm()) {
            x0 = Math.min(x0, pt[0]); y0 = Math.min(y0, pt[1]);
            x1 = Math.max(x1, pt[0]); y1 = Math.max(y1, pt[1]);
        }
        double w = t.widthMm();
        return new double[]{x0 - w, y0 - w, x1 + w, y1 + w};
    }

    /** Fraction of each cell inside the shape, by sub x sub point samples, restricted to the shape's bounds. */
    private double[] coverage(int sub, Inside inside, double[] bounds) {
        double[] cov = new double[nx * ny];
        int i0 = Math.max(0, (int) Math.floor(bounds[0] / dxMm)), i1 = Math.min(nx - 1, (int) Math.floor(bounds[2] / dxMm));
        int j0 = Math.max(0, (int) Math.floor(bounds[1] / dyMm)), j1 = Math.min(ny - 1, (int) Math.floor(bounds[3] / dyMm));
        double w = 1.0 / (sub * sub);
        for (int j = j0; j <= j1; j++)
            for (int i = i0; i <= i1; i++) {
                double acc = 0;
                for (int sj = 0; sj < sub; sj++)
                    for (int si = 0; si < sub; si++) {
                        double x = (i + (si + 0.5) / sub) * dxMm, y = (j + (sj + 0.5) / sub) * dyMm;
                        if (inside.test(x, y)) acc += w;
                    }
                cov[j * nx + i] = acc;
            }
        return cov;
    }

    /** Fault power waveform: fraction of time on within [t0, t1] (exact integral, so energy is conserved). */
    double onFraction(double t0, double t1) {
        return (onTime(t1) - onTime(t0)) / (t1 - t0);
    }

    private double onTime(double t) {
        double start = scenario.frames().injectionStartS();
        if (t <= start) return 0;
        double u = t - start;
        Scenario.Fault f = scenario.fault();
        if (!"square".equals(f.waveformOrDefault())) return u;
        double period = f.periodS(), on = f.dutyOrDefault() * period;
        double k = Math.floor(u / period);
        return k * on + Math.min(u - k * period, on);
    }

    double ambientAt(double tS) {
        Scenario.AmbientSpec a = scenario.ambientOrDefault();
        return a.startC() + a.driftOrZero() * tS / 60.0;
    }

    /** Fills {@code powerW} with node powers averaged over [t0, t1]. */
    void powerOver(double t0, double t1, double[] powerW) {
        double fault = scenario.fault().powerW() * onFraction(t0, t1);
        for (int i = 0; i < powerW.length; i++) powerW[i] = idleW[i] + fault * faultShare[i];
    }

    /** Board cell temperature at (x, y) mm by bilinear interpolation between cell centres (clamped at the edges). */
    static double boardAt(float[] cellsC, int nx, int ny, double dxMm, double dyMm, double xMm, double yMm) {
        double fx = xMm / dxMm - 0.5, fy = yMm / dyMm - 0.5;
        if (fx < 0) fx = 0;
        if (fy < 0) fy = 0;
        if (fx > nx - 1) fx = nx - 1;
        if (fy > ny - 1) fy = ny - 1;
        int i = Math.min((int) fx, Math.max(0, nx - 2)), j = Math.min((int) fy, Math.max(0, ny - 2));
        double ax = fx - i, ay = fy - j;
        int i1 = Math.min(i + 1, nx - 1), j1 = Math.min(j + 1, ny - 1);
        double a = cellsC[j * nx + i], bb = cellsC[j * nx + i1], c = cellsC[j1 * nx + i], d = cellsC[j1 * nx + i1];
        return (1 - ay) * ((1 - ax) * a + ax * bb) + ay * ((1 - ax) * c + ax * d);
    }

    List<String> refsOfParts() {
        List<String> out = new ArrayList<>();
        for (Scenario.PartSpec p : parts) out.add(p.ref());
        return out;
    }
}
