package org.risetrace.calibration;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class EmissivityCorrectionTest {
    private static final double[] LWIR = {7.5, 14};
    /** A narrow band at 10 um, where band radiance is L_lambda(10 um) times the width to 1e-6 relative. */
    private static final double[] NARROW_10_UM = {9.99, 10.01};
    /** Effectively all wavelengths, where band radiance is sigma T^4 / pi (Stefan-Boltzmann). */
    private static final double[] FULL_SPECTRUM = {0.01, 1.0e6};

    @Test
    void unitEmissivityLeavesTemperatureUnchanged() {
        // definition of apparent temperature: a blackbody reads its own temperature
        for (double c : new double[]{-40, 0, 25, 87.5, 500}) {
            assertEquals(c, EmissivityCorrection.objectCelsius(c, 1.0, 22, LWIR), 0.0);
            assertEquals(c, EmissivityCorrection.apparentCelsius(c, 1.0, 22, LWIR), 0.0);
        }
    }

    @Test
    void apparentEqualToReflectedGivesObjectEqualToApparentForAnyEmissivity() {
        // the correction equation with L(T_app) = L(T_refl): L(T_obj) = L(T_app) (1 - (1 - e)) / e = L(T_app)
        for (double e : new double[]{0.02, 0.1, 0.5, 0.95})
            for (double c : new double[]{-30, 21.7, 60, 300})
                assertEquals(c, EmissivityCorrection.objectCelsius(c, e, c, LWIR), 1e-6, "e = " + e + ", " + c + " C");
    }

    @Test
    void narrowBandWorkedExampleMatchesHandArithmetic() {
        // Worked by hand, monochromatic at lambda = 10 um, c2 = 14387.768775 um K (CODATA 2018):
        //   T_app = 50 C = 323.15 K: x_a = 1438.7769/323.15 = 4.452350, e^x_a = 85.82840, 1/(e^x_a - 1) = 0.01178851
        //   T_refl = 20 C = 293.15 K: x_r = 1438.7769/293.15 = 4.907989, e^x_r = 135.36687, 1/(e^x_r - 1) = 0.00744231
        //   e = 0.5: 1/(e^x_o - 1) = (0.01178851 - 0.5 * 0.00744231) / 0.5 = 0.01613470
        //   x_o = ln(1 + 1/0.01613470) = 4.142789, T_obj = 1438.7769/4.142789 = 347.2967 K = 74.1467 C
        // A 0.02 um band differs from the single wavelength by ~1e-6 relative, the table by under 1 mK: within 1 mK
        // (was 50 mK, which a band or table error 50 times the stated accuracy would have passed)
        assertEquals(74.1467, EmissivityCorrection.objectCelsius(50, 0.5, 20, NARROW_10_UM), 0.001);
        assertEquals(50.0, EmissivityCorrection.apparentCelsius(74.1467, 0.5, 20, NARROW_10_UM), 0.001);
    }

    @Test
    void fullSpectrumMatchesStefanBoltzmannArithmetic() {
        // Over all wavelengths L = sigma T^4 / pi, so T_obj^4 = (T_app^4 - (1 - e) T_refl^4) / e (Stefan-Boltzmann):
        //   323.15^4 = 1.0904773e10, 293.15^4 = 7.3851546e9
        //   (1.0904773e10 - 0.5 * 7.3851546e9) / 0.5 = 1.4424392e10, fourth root = 346.5568 K = 73.4068 C
        assertEquals(73.4068, EmissivityCorrection.objectCelsius(50, 0.5, 20, FULL_SPECTRUM), 0.001);
        // the band result lies between the 10 um and the full-spectrum one: the long-wave band is nearer 10 um
        double band = EmissivityCorrection.objectCelsius(50, 0.5, 20, LWIR);
        assertTrue(band > 73.4068 && band < 74.1467 + 0.5, "7.5-14 um result " + band);
    }

    @Test
    void apparentAndObjectAreInverses() {
        for (double e : new double[]{0.05, 0.3, 0.7, 0.95})
            for (double obj = -20; obj <= 400; obj += 13.3) {
                double app = EmissivityCorrection.apparentCelsius(obj, e, 23, LWIR);
                assertEquals(obj, EmissivityCorrection.objectCelsius(app, e, 23, LWIR), 1e-3, "e = " + e + ", " + obj + " C");
            }
    }

    @Test
    void lowEmissivityPartReadsColderThanItIs() {
        // fact of the trade: a hot shiny part reads colder, between its temperature and the room's
        double app = EmissivityCorrection.apparentCelsius(80, 0.1, 22, LWIR);
        assertTrue(app > 22 && app < 40, "apparent " + app);
    }

    @Test
    void atmosphereFormReducesToBenchFormAtUnitTransmission() {
        assertEquals(EmissivityCorrection.objectCelsius(45, 0.6, 21, LWIR),
                EmissivityCorrection.objectCelsius(45, 0.6, 21, 1.0, 30, LWIR), 1e-9);
        assertEquals(EmissivityCorrection.apparentCelsius(45, 0.6, 21, LWIR),
                EmissivityCorrection.apparentCelsius(45, 0.6, 21, 1.0, 30, LWIR), 1e-9);
    }

    @Test
    void atmosphereFormMatchesStefanBoltzmannArithmetic() {
        // Full spectrum, T_obj = 100 C = 373.15 K, e = 0.8, T_refl = T_atm = 20 C = 293.15 K, tau = 0.9:
        //   T_app^4 = 0.9 (0.8 * 373.15^4 + 0.2 * 293.15^4) + 0.1 * 293.15^4
        //           = 0.9 (0.8 * 1.938803e10 + 0.2 * 7.385155e9) + 7.385155e8
        //           = 0.9 (1.551043e10 + 1.477031e9) + 7.385155e8 = 1.528872e10 + 7.385155e8 = 1.602723e10
        //   T_app = (1.602723e10)^(1/4) = 355.807 K = 82.657 C
        assertEquals(82.657, EmissivityCorrection.apparentCelsius(100, 0.8, 20, 0.9, 20, FULL_SPECTRUM), 0.001);
        assertEquals(100, EmissivityCorrection.objectCelsius(82.657, 0.8, 20, 0.9, 20, FULL_SPECTRUM), 0.001);
        double app = EmissivityCorrection.apparentCelsius(100, 0.8, 20, 0.7, 35, LWIR);
        assertEquals(100, EmissivityCorrection.objectCelsius(app, 0.8, 20, 0.7, 35, LWIR), 1e-3);
    }

    @Test
    void rasterCorrectionMatchesPerPixelCorrection() {
        float[] app = {20f, 25f, Float.NaN, 60f, 150f, 5f};
        float[] out = new float[app.length];
        EmissivityCorrection.objectCelsius(app, out, 0.4, 22, LWIR);
        for (int i = 0; i < app.length; i++) {
            if (Float.isNaN(app[i])) assertTrue(Float.isNaN(out[i]));
            else assertEquals(EmissivityCorrection.objectCelsius(app[i], 0.4, 22, LWIR), out[i], 1e-4);
        }
        // a reading far below the reflected temperature on a shiny part has no physical object temperature
        float[] impossible = {-60f};
        EmissivityCorrection.objectCelsius(impossible, impossible, 0.05, 40, LWIR);
        assertTrue(Float.isNaN(impossible[0]));
    }

    @Test
    void argumentsOutsideThePhysicsAreRejected() {
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.objectCelsius(30, 0.0, 20, LWIR));
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.objectCelsius(30, -0.2, 20, LWIR));
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.objectCelsius(30, 1.01, 20, LWIR));
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.objectCelsius(30, Double.NaN, 20, LWIR));
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.apparentCelsius(30, 1.5, 20, LWIR));
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.objectCelsius(-300, 0.9, 20, LWIR));
        assertThrows(IllegalArgumentException.class, () -> EmissivityCorrection.objectCelsius(30, 0.9, 20, 0, 20, LWIR));
        // L(T_app) < (1 - e) L(T_refl): the object would have to emit negative radiance
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> EmissivityCorrection.objectCelsius(-50, 0.05, 40, LWIR));
        assertTrue(e.getMessage().contains("absolute zero"), e.getMessage());
    }
}
