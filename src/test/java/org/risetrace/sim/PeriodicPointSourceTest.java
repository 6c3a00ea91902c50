package org.risetrace.sim;

import org.apache.commons.math3.special.BesselJ;
import org.junit.jupiter.api.Test;
import org.risetrace.analysis.Excitation;
import org.risetrace.analysis.LockInFit;
import org.risetrace.analysis.LockInMaps;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The heat model's plate under a periodic point source, read by the lock-in accumulator, against the exact
 * periodic solution; and the complex K0 it needs against tables and identities.
 */
class PeriodicPointSourceTest {

    @Test
    void complexK0MatchesTablesAndIdentities() {
        // Abramowitz & Stegun Table 9.8: K0(0.5), K0(1), K0(2) to 5 decimals; e^5 K0(5) = 0.5478075 (from memory)
        assertEquals(0.92442, ComplexBesselK0.k0(0.5, 0)[0], 1e-5);
        assertEquals(0.42102, ComplexBesselK0.k0(1.0, 0)[0], 1e-5);
        assertEquals(0.11389, ComplexBesselK0.k0(2.0, 0)[0], 1e-5);
        assertEquals(0.5478075, Math.exp(5) * ComplexBesselK0.k0(5.0, 0)[0], 1e-6);
        // A&S 9.6.4 with nu = 0 at z = -ix: K0(-ix) = (pi/2) (-Y0(x) + i J0(x)); J0 from commons-math3's BesselJ,
        // Y0(1) = 0.0882569642 and Y0(2) = 0.5103756726 from A&S Table 9.1 (from memory)
        double[] y0 = {0.0882569642, 0.5103756726};
        for (int x = 1; x <= 2; x++) {
            double[] k = ComplexBesselK0.k0(0, -x);
            assertEquals(-Math.PI / 2 * y0[x - 1], k[0], 1e-8, "Re K0(-i" + x + ")");
            assertEquals(Math.PI / 2 * BesselJ.value(0, x), k[1], 1e-8, "Im K0(-i" + x + ")");
        }
        // A&S 9.9.2: ker x + i kei x = K0(x e^{i pi/4}); ker 1 = 0.2867062, kei 1 = -0.4949946 (A&S Table 9.12, from
        // memory)
        double[] kelvin = ComplexBesselK0.k0(Math.cos(Math.PI / 4), Math.sin(Math.PI / 4));
        assertEquals(0.2867062, kelvin[0], 1e-6);
        assertEquals(-0.4949946, kelvin[1], 1e-6);
        // the series and the asymptotic expansion agree where they meet (|z| = 10), along several directions
        for (double a : new double[]{0, 0.4, 0.8, 1.2}) {
            double re = 10 * Math.cos(a), im = 10 * Math.sin(a);
            double[] s = ComplexBesselK0.series(re, im), e = ComplexBesselK0.asymptotic(re, im);
            double size = Math.hypot(e[0], e[1]);
            assertEquals(0, Math.hypot(s[0] - e[0], s[1] - e[1]) / size, 1e-6, "arg " + a);
        }
    }

    /**
     * A point source of square-wave power P0 (on half of each period T) in a thin plate of in-plane conductance k t,
     * heat capacity rho c t per area and film coefficient h on both faces: the temperature's complex amplitude at the
     * fundamental is T(r) = P1 / (2 pi k t) K0(q r), q^2 = 1/L^2 + i omega / D, L^2 = k t / (2 h), D = k t / (rho c t),
     * P1 = 2 P0 / pi (the square wave's fundamental): the plate equation rho c t dT/dt = k t lap T - 2 h T + P delta,
     * periodic in time (Carslaw and Jaeger, Conduction of Heat in Solids, 2nd ed., the periodic point source with a
     * linear heat loss; K0 of complex argument as for the "thermal wave"). Its magnitude is the amplitude and
     * -arg K0(q r) the phase lag. The simulator's plate (backward Euler, 5-point finite volumes) read by the lock-in
     * accumulator must match both within 10 % from one thermal diffusion length mu = sqrt(2 D / omega) outwards.
     */
    @Test
    void lagAndAmplitudeFollowThePeriodicPointSourceSolutionBeyondOneDiffusionLength() {
        int n = 101, c = n / 2;
        double dx = 0.5e-3, kt = 0.002, periodS = 20.0, omega = 2 * Math.PI / periodS;
        double mu = 3e-3, lengthL = 6e-3; // mu = 6 cells; the plate edge lies 25 mm = 8 mu = 4 L from the source
        double diffusivity = omega * mu * mu / 2, rhoCt = kt / diffusivity, h = kt / (2 * lengthL * lengthL);
        double p0 = 1.0, ambient = 25.0;
        ThermalModel m = new ThermalModel(n, n, 0);
        Arrays.fill(m.gx, kt);
        Arrays.fill(m.gy, kt);
        Arrays.fill(m.loss, 2 * h * dx * dx);
        Arrays.fill(m.capacity, rhoCt * dx * dx);
        double[] p = new double[m.nodes()];
        p[c * n + c] = p0 / 2;
        m.steady(p, ambient); // the mean state; only the periodic part has to settle
        int stepsPerPeriod = 200, framesEvery = 5, warmPeriods = 3, periods = 6;
        double dt = periodS / stepsPerPeriod;
        Excitation ex = new Excitation(periodS, periodS / 2, 0.0, "test");
        double start = warmPeriods * periodS;
        LockInFit fit = new LockInFit(ex, new Excitation.Window(start, periods, periodS), 2);
        int radius = 24;
        LockInMaps maps = new LockInMaps(radius + 1, 1, 1.0, fit);
        float[] row = new float[radius + 1];
        for (int s = 0; s < (warmPeriods + periods) * stepsPerPeriod; s++) {
            double t0 = s * dt;
            // on during the first half of each period; the steps divide the halves exactly
            p[c * n + c] = (t0 % periodS) < periodS / 2 - 1e-9 ? p0 : 0;
            m.step(dt, p, ambient);
            double t = t0 + dt;
            // a step's power acts over the step; the frame stands for the middle of it, where backward Euler's
            // state is centred to first order
            if ((s + 1) % framesEvery == 0) {
                for (int r = 0; r <= radius; r++) row[r] = (float) m.temperature[c * n + c + r];
                maps.add(row, null, t - dt / 2);
            }
        }
        LockInMaps.Maps res = maps.finish();
        double p1 = 2 * p0 / Math.PI;
        double qMu2r = mu * mu / (lengthL * lengthL), qMu2i = 2; // (q mu)^2 = mu^2 / L^2 + 2i
        double qm = Math.sqrt(Math.hypot(qMu2r, qMu2i)), qa = Math.atan2(qMu2i, qMu2r) / 2;
        double worstAmp = 0, worstLag = 0, lastLag = 0;
        for (int r = 6; r <= radius; r += 2) {
            double rOverMu = r * dx / mu;
            double[] k = ComplexBesselK0.k0(qm * rOverMu * Math.cos(qa), qm * rOverMu * Math.sin(qa));
            double amp = p1 / (2 * Math.PI * kt) * Math.hypot(k[0], k[1]);
            // the lag grows past 180 degrees with distance: unwrapped along r, and the measured lag taken in the
            // same turn
            double lag = -Math.toDegrees(Math.atan2(k[1], k[0]));
            lag += 360 * Math.round((lastLag - lag) / 360);
            lastLag = lag;
            double measured = res.lagDeg()[r];
            measured += 360 * Math.round((lag - measured) / 360);
            worstAmp = Math.max(worstAmp, Math.abs(res.amplitude()[r] / amp - 1));
            worstLag = Math.max(worstLag, Math.abs(measured / lag - 1));
            assertEquals(amp, res.amplitude()[r], 0.10 * amp, "amplitude at r = " + rOverMu + " mu");
            assertEquals(lag, measured, 0.10 * Math.abs(lag), "lag at r = " + rOverMu + " mu");
        }
        System.out.printf("periodic point source: worst amplitude error %.2f %%, worst lag error %.2f %% (1 to 4 mu)%n",
                100 * worstAmp, 100 * worstLag);
    }
}
