package org.risetrace.calibration;

import org.junit.jupiter.api.Test;

import java.util.stream.IntStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class BandRadianceTest {
    private static final double K0 = 273.15;

    @Test
    void roundTripTemperatureRadianceTemperatureWithinOneMillikelvin() {
        // issue requirement: 1 mK from -40 to +500 C; checked against the quadrature itself, not the table
        for (double[] bandUm : new double[][]{{7.5, 14}, {8, 14}, {3, 5}}) {
            BandRadiance band = BandRadiance.of(bandUm);
            for (double c = -40; c <= 500; c += 0.37) {
                double exact = Planck.bandRadiance(bandUm[0], bandUm[1], c + K0);
                assertEquals(c, band.celsius(exact), 1e-3, "inverse of exact radiance at " + c + " C");
                assertEquals(c, band.celsius(band.radianceCelsius(c)), 1e-3, "table round trip at " + c + " C");
                assertEquals(1.0, band.radianceCelsius(c) / exact, 1e-9, "table radiance at " + c + " C");
            }
        }
    }

    @Test
    void outsideTheTableFallsBackToQuadrature() {
        BandRadiance band = BandRadiance.of(7.5, 14);
        for (double c : new double[]{-150, -61, 601, 900, 2000}) {
            double exact = Planck.bandRadiance(7.5, 14, c + K0);
            assertEquals(exact, band.radianceCelsius(c), exact * 1e-12);
            assertEquals(c, band.celsius(exact), 1e-6, "at " + c + " C");
        }
    }

    @Test
    void radianceIncreasesMonotonicallyAcrossTableNodes() {
        BandRadiance band = BandRadiance.of(7.5, 14);
        double previous = 0;
        for (double c = -70; c <= 610; c += 0.0731) {
            double l = band.radianceCelsius(c);
            assertTrue(l > previous, "at " + c + " C");
            previous = l;
        }
    }

    @Test
    void cachedPerBandAndSafeAcrossThreads() {
        assertSame(BandRadiance.of(new double[]{7.5, 14}), BandRadiance.of(null));
        BandRadiance band = BandRadiance.of(8, 13);
        assertSame(band, BandRadiance.of(8, 13));
        // concurrent use must give the same answers as sequential use (immutable tables)
        double[] sequential = IntStream.range(0, 2000).mapToDouble(i -> band.celsius(band.radianceCelsius(i * 0.25 - 40))).toArray();
        double[] parallel = IntStream.range(0, 2000).parallel()
                .mapToDouble(i -> BandRadiance.of(8, 13).celsius(BandRadiance.of(8, 13).radianceCelsius(i * 0.25 - 40))).toArray();
        for (int i = 0; i < sequential.length; i++) assertEquals(sequential[i], parallel[i], 0.0);
    }

    @Test
    void radianceAtOrBelowZeroIsRejected() {
        BandRadiance band = BandRadiance.of(7.5, 14);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> band.kelvin(-1.0));
        assertTrue(e.getMessage().contains("absolute zero"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> band.kelvin(0.0));
        assertThrows(IllegalArgumentException.class, () -> band.kelvin(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> band.radiance(-3));
        assertThrows(IllegalArgumentException.class, () -> BandRadiance.of(14, 7.5));
    }
}
