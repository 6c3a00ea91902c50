package org.risetrace.planning;

import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The board heating model behind the too-little-heat check. */
class BoardHeatingTest {
    @Test
    void exponentialIntegralMatchesTheHandbookTable() {
        // Abramowitz and Stegun, Table 5.1 (from memory, 7 digits): E1(0.1) = 1.8229240, E1(0.5) = 0.5597736,
        // E1(1) = 0.2193839, E1(2) = 0.04890051, E1(5) = 0.001148296
        assertEquals(1.8229240, BoardHeating.e1(0.1), 1e-7);
        assertEquals(0.5597736, BoardHeating.e1(0.5), 1e-7);
        assertEquals(0.2193839, BoardHeating.e1(1.0), 1e-7);
        assertEquals(0.04890051, BoardHeating.e1(2.0), 1e-8);
        assertEquals(0.001148296, BoardHeating.e1(5.0), 1e-9);
    }

    @Test
    void exponentialIntegralMatchesQuadrature() {
        // E1(x) = integral over v in (-inf, 0] of exp(-x e^-v) dv (t = e^-v in the definition; the integrand is below
        // exp(-148) for v < ln x - 5); commons-math3's Legendre-Gauss integrator as the reference
        IterativeLegendreGaussIntegrator gauss = new IterativeLegendreGaussIntegrator(16, 1e-11, 1e-15);
        for (double x : new double[]{1e-3, 0.05, 0.3, 0.99, 1.0, 1.7, 4.0, 12.0}) {
            double q = gauss.integrate(1_000_000, v -> Math.exp(-x * Math.exp(-v)), Math.log(x) - 5, 0.0);
            assertEquals(q, BoardHeating.e1(x), 1e-9 * Math.max(1, q), "x = " + x);
        }
    }

    @Test
    void continuousSourceEqualsTheSumOfInstantaneousReleases() {
        // Carslaw and Jaeger (1959), ch. 10: an instantaneous release Q in a plate gives
        // dT = Q / (4 pi (k t) (t - t')) exp(-r^2 / (4 alpha (t - t'))); a steady power P is the integral of those
        // over the release times (age s = t - t'), done here by quadrature in ln s, independent of the E1 code
        BoardHeating b = new BoardHeating(70);
        double kt = b.conductanceThicknessWPerK(), alpha = b.diffusivityM2PerS();
        IterativeLegendreGaussIntegrator gauss = new IterativeLegendreGaussIntegrator(16, 1e-11, 1e-15);
        for (double r : new double[]{0.5e-3, 1e-3, 5e-3}) {
            double a = r * r / (4 * alpha);
            for (double t : new double[]{5, 60}) {
                // ds / s = d(ln s): integrand exp(-a / s) / (4 pi k t)
                double q = gauss.integrate(1_000_000, v -> Math.exp(-a * Math.exp(-v)) / (4 * Math.PI * kt),
                        Math.log(a) - 5, Math.log(t));
                assertEquals(q, b.riseK(1.0, r, t), 1e-6 * q, "r = " + r + ", t = " + t);
            }
        }
    }

    @Test
    void oneWattOnTheDefaultBoardByHand() {
        // k t = 0.30 x 1.6e-3 + 390 x 70e-6 = 0.02778 W/K; rho c t = 2.035e6 x 1.6e-3 + 3.439e6 x 70e-6 = 3496.7 J/m^2K;
        // alpha = 7.945e-6 m^2/s; u = (1e-3)^2 / (4 alpha 60 s) = 5.245e-4; E1(u) = -0.5772 + 7.5531 + 0.0005 = 6.976;
        // dT = 1 W x 6.976 / (4 pi x 0.02778) = 19.98 K
        BoardHeating b = new BoardHeating(70);
        assertEquals(0.02778, b.conductanceThicknessWPerK(), 1e-5);
        assertEquals(7.945e-6, b.diffusivityM2PerS(), 0.002e-6);
        assertEquals(19.98, b.riseK(1.0, 1e-3, 60), 0.01);
        // linear in power
        assertEquals(2 * b.riseK(0.3, 1e-3, 60), b.riseK(0.6, 1e-3, 60), 1e-12);
        // more copper spreads the heat: less rise
        assertEquals(true, new BoardHeating(420).riseK(1.0, 1e-3, 60) < b.riseK(1.0, 1e-3, 60));
    }
}
