package org.risetrace.calibration;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

class SakumaHattoriTest {
    @Test
    void fitRecoversItsOwnParametersFromNoiseFreePoints() {
        // a curve of the Sakuma-Hattori form with long-wave parameters (A near 10 um, B tens of um K); noise-free
        // points lie exactly on it, so the least-squares fit must return the same parameters (issue: 1e-6 relative)
        SakumaHattori truth = new SakumaHattori(2.5e6, 9.8, 45.0);
        double[][] sets = {{273.15, 298.15, 323.15, 373.15, 423.15}, {293.15, 333.15, 393.15}};
        for (double[] kelvin : sets) {
            double[] signal = new double[kelvin.length];
            for (int i = 0; i < kelvin.length; i++) signal[i] = truth.signal(kelvin[i]);
            SakumaHattori fit = SakumaHattori.fit(kelvin, signal, new double[]{7.5, 14});
            assertEquals(1.0, fit.c() / truth.c(), 1e-6, "C from " + kelvin.length + " points");
            assertEquals(1.0, fit.aUm() / truth.aUm(), 1e-6, "A from " + kelvin.length + " points");
            assertEquals(1.0, fit.bUmK() / truth.bUmK(), 1e-6, "B from " + kelvin.length + " points");
        }
    }

    @Test
    void inverseReturnsTheTemperature() {
        SakumaHattori curve = new SakumaHattori(1.2e5, 10.3, -20);
        for (double t = 240; t < 800; t += 17.3) assertEquals(t, curve.kelvin(curve.signal(t)), 1e-9 * t);
    }

    @Test
    void approximatesBandRadianceOfTheLongWaveBand() {
        // the equation exists to interpolate band radiance (Sakuma and Hattori 1982): a fit to 7.5-14 um blackbody
        // radiance from 0 to 200 C must reproduce the radiance temperatures to well under the 50 mK NETD of an
        // uncooled camera (NETD order: common practice)
        double[] kelvin = new double[9];
        double[] signal = new double[kelvin.length];
        for (int i = 0; i < kelvin.length; i++) {
            kelvin[i] = 273.15 + 25 * i;
            signal[i] = 1000 * Planck.bandRadiance(7.5, 14, kelvin[i]);
        }
        SakumaHattori fit = SakumaHattori.fit(kelvin, signal, new double[]{7.5, 14});
        assertTrue(fit.aUm() > 7.5 && fit.aUm() < 14, "effective wavelength " + fit.aUm());
        for (double t = 273.15; t <= 473.15; t += 5) {
            double s = 1000 * Planck.bandRadiance(7.5, 14, t);
            assertEquals(t, fit.kelvin(s), 0.01, "at " + t + " K");
        }
    }
}
