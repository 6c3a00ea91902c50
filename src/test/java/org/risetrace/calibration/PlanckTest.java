package org.risetrace.calibration;

import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;

class PlanckTest {
    /** Stefan-Boltzmann constant, W m^-2 K^-4 (CODATA 2018). */
    private static final double SIGMA = 5.670374419e-8;
    /** Wien displacement law constant, um K (CODATA 2018). */
    private static final double WIEN_B_UM_K = 2897.771955;

    /** All wavelengths that matter: below 0.01 um and above 1e6 um a blackbody from 200 K to 6000 K emits < 1e-13. */
    private static double totalRadiance(double kelvin) {
        return Planck.bandRadiance(0.01, 1.0e6, kelvin);
    }

    @Test
    void integralOverAllWavelengthsIsStefanBoltzmann() {
        for (double t : new double[]{200, 273.15, 300, 773.15, 1500, 5772}) {
            // exitance = pi * radiance for a Lambertian emitter; sigma T^4 (CODATA 2018 sigma)
            double exitance = Math.PI * totalRadiance(t);
            assertEquals(1.0, exitance / (SIGMA * Math.pow(t, 4)), 1e-6, "T = " + t + " K");
        }
    }

    @Test
    void spectralPeakObeysWienDisplacementLaw() {
        for (double t : new double[]{250, 300, 500, 1000}) {
            // golden-section search for the maximum of L_lambda over lambda
            double a = 0.5 * WIEN_B_UM_K / t * 1e-6, b = 2 * WIEN_B_UM_K / t * 1e-6;
            double g = (Math.sqrt(5) - 1) / 2;
            for (int i = 0; i < 200; i++) {
                double c = b - g * (b - a), d = a + g * (b - a);
                if (Planck.spectralRadiance(c, t) > Planck.spectralRadiance(d, t)) b = d;
                else a = c;
            }
            double peakUm = (a + b) / 2 * 1e6;
            // lambda_max T = b, b = 2897.771955 um K (CODATA 2018)
            assertEquals(WIEN_B_UM_K, peakUm * t, WIEN_B_UM_K * 1e-6, "T = " + t + " K");
        }
    }

    @Test
    void blackbodyFractionMatchesHandbookTable() {
        // F(0 -> lambda T), Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table 12.1 (blackbody
        // radiation functions): 0.250 at 2898 um K, 0.634 at 5000 um K, 0.914 at 10000 um K
        double[][] table = {{2898, 0.250}, {5000, 0.634}, {10000, 0.914}};
        double t = 1000;
        for (double[] row : table) {
            double lambdaUm = row[0] / t;
            double fraction = Math.PI * Planck.bandRadiance(0.01, lambdaUm, t) / (SIGMA * Math.pow(t, 4));
            assertEquals(row[1], fraction, 0.001, "lambda T = " + row[0]);
            // the closed-form series must agree with the quadrature
            assertEquals(fraction, Planck.blackbodyFraction(row[0]), 1e-9, "series at lambda T = " + row[0]);
        }
    }

    @Test
    void bandQuadratureAgreesWithCommonsMathIntegrator() {
        // reference: commons-math3 iterative Legendre-Gauss integrator on L_lambda directly in lambda
        IterativeLegendreGaussIntegrator reference = new IterativeLegendreGaussIntegrator(16, 1e-13, 1e-30);
        double[][] bands = {{7.5, 14}, {8, 14}, {3, 5}};
        for (double[] band : bands)
            for (double t : new double[]{233.15, 300, 773.15}) {
                double expected = reference.integrate(1_000_000, lambda -> Planck.spectralRadiance(lambda, t),
                        band[0] * 1e-6, band[1] * 1e-6);
                assertEquals(1.0, Planck.bandRadiance(band[0], band[1], t) / expected, 1e-10,
                        band[0] + "-" + band[1] + " um at " + t + " K");
            }
    }

    @Test
    void bandDerivativeMatchesCentralDifference() {
        for (double t : new double[]{233.15, 300, 773.15}) {
            double h = 1e-3;
            double fd = (Planck.bandRadiance(7.5, 14, t + h) - Planck.bandRadiance(7.5, 14, t - h)) / (2 * h);
            // central difference error ~ h^2 L'''/6, far below 1e-7 relative here
            assertEquals(1.0, Planck.bandRadianceDerivative(7.5, 14, t) / fd, 1e-7, "T = " + t + " K");
        }
    }

    @Test
    void secondRadiationConstantIsCodata() {
        // c2 = h c / k = 1.438776877e-2 m K (CODATA 2018)
        assertEquals(1.438776877e-2, Planck.C2, 1e-11);
    }
}
