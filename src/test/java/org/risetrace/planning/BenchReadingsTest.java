package org.risetrace.planning;

import org.apache.commons.math3.stat.descriptive.rank.Median;
import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Bench readings: the outlier test (Iglewicz and Hoaglin 1993) and the ideal inductor reactance. */
class BenchReadingsTest {
    private static BenchReading reading(String what, String where, String value, String unit, Double fHz, Double lUh) {
        return new BenchReading(2, what, where, value, Double.parseDouble(value), unit, "ESR meter", fHz, lUh, null);
    }

    private static List<BenchReading> phases(String... values) {
        List<BenchReading> l = new ArrayList<>();
        for (int i = 0; i < values.length; i++)
            l.add(reading("phase inductor", "L" + (i + 1), values[i], "ohm", 100e3, null));
        return l;
    }

    @Test
    void idealReactanceOfA220NanohenryInductorAt100KilohertzIs0138Ohm() {
        // ideal inductor reactance |Z| = 2 pi f L = 2 pi x 100e3 Hz x 0.22e-6 H = 0.13823 ohm
        assertEquals(0.138, BenchReadings.reactanceOhms(100e3, 0.22), 0.0005);
        // to seven digits: 2 pi x 0.022 = 0.1382301 (hand arithmetic, not the formula written out again)
        assertEquals(0.1382301, BenchReadings.reactanceOhms(100e3, 0.22), 1e-7);
        // and 1 uH at 1 MHz: 2 pi = 6.283185 ohm
        assertEquals(6.283185, BenchReadings.reactanceOhms(1e6, 1.0), 1e-6);
    }

    @Test
    void shortedPhaseStandsOutAmongFourPhaseInductors() {
        // common practice: across a healthy phase inductor a 100 kHz ESR meter reads about 0.14-0.17 ohm, across
        // the shorted phase about 0.004 ohm. By hand: median of 0.004, 0.14, 0.15, 0.16 = (0.14 + 0.15) / 2 = 0.145;
        // |deviations| 0.005, 0.015, 0.005, 0.141 -> sorted 0.005, 0.005, 0.015, 0.141 -> MAD = 0.010;
        // modified z of 0.004 = 0.6745 x (0.004 - 0.145) / 0.010 = -9.51; of 0.16: 0.6745 x 0.015 / 0.010 = 1.01
        BenchReadings b = BenchReadings.assess("r.csv", phases("0.15", "0.16", "0.14", "0.004"));
        assertEquals(1, b.outliers().size());
        BenchReadings.Row l4 = b.outliers().get(0);
        assertEquals("L4", l4.where());
        assertEquals(-9.51, l4.modifiedZ(), 0.005);
        assertEquals(0.145, l4.groupMedian(), 1e-12);
        assertEquals(0.0275862, l4.ratioToMedian(), 1e-7); // 0.004 / 0.145 by hand
        assertEquals(1.01, b.rows().get(1).modifiedZ(), 0.005);
        assertTrue(b.findings().get(0).startsWith("L4 (phase inductor) reads 0.004 ohm"), b.findings().get(0));
    }

    @Test
    void medianAndMadMatchAHandComputedExample() {
        // by hand: 2.0, 2.1, 2.3, 2.2, 9.0 -> sorted 2.0, 2.1, 2.2, 2.3, 9.0 -> median 2.2;
        // |x - 2.2| = 0.2, 0.1, 0.1, 0.0, 6.8 -> sorted 0.0, 0.1, 0.1, 0.2, 6.8 -> MAD 0.1;
        // modified z (Iglewicz and Hoaglin 1993) of 9.0 = 0.6745 x 6.8 / 0.1 = 45.866, of 2.0 = 0.6745 x -0.2 / 0.1 = -1.349
        double[] x = {2.0, 2.1, 2.3, 2.2, 9.0};
        assertEquals(2.2, RobustStats.median(x), 1e-12);
        assertEquals(0.1, RobustStats.mad(x), 1e-12);
        assertEquals(45.866, RobustStats.modifiedZ(9.0, 2.2, 0.1), 1e-3);
        assertEquals(-1.349, RobustStats.modifiedZ(2.0, 2.2, 0.1), 1e-3);
        // commons-math3's median as a second reference, odd and even counts
        assertEquals(new Median().evaluate(x), RobustStats.median(x), 1e-15);
        double[] even = {0.15, 0.16, 0.14, 0.004};
        assertEquals(new Median().evaluate(even), RobustStats.median(even), 1e-15);
        BenchReadings b = BenchReadings.assess("r", phases("2.0", "2.1", "2.3", "2.2", "9.0"));
        assertEquals(List.of(false, false, false, false, true), b.rows().stream().map(BenchReadings.Row::outlier).toList());
    }

    @Test
    void identicalReadingsDoNotMakeTheMeterResolutionAnOutlier() {
        // MAD of 0.15, 0.15, 0.15, 0.14 is 0: floored at a quarter of the 0.01 resolution, 0.0025;
        // 0.6745 x -0.01 / 0.0025 = -2.70: not an outlier. The shorted phase still is: 0.6745 x -0.146 / 0.0025 = -39.4
        BenchReadings close = BenchReadings.assess("r", phases("0.15", "0.15", "0.15", "0.14"));
        assertTrue(close.outliers().isEmpty());
        assertEquals(-2.70, close.rows().get(3).modifiedZ(), 0.005);
        BenchReadings shorted = BenchReadings.assess("r", phases("0.15", "0.15", "0.15", "0.004"));
        assertEquals("L4", shorted.outliers().get(0).where());
        assertEquals(-39.4, shorted.outliers().get(0).modifiedZ(), 0.05);
    }

    @Test
    void anOutlierWrittenWithACoarsePrefixDoesNotSetTheFloor() {
        // "1 kohm" among "1 ohm" readings is the same value as "1000 ohm" (SI prefix k = 1000): by hand, with the
        // modified z-score of Iglewicz and Hoaglin (1993) as above, MAD of 1, 1, 1000 (ohm) is 0,
        // floored at a quarter of the typical 1 ohm step, 0.25; modified z = 0.6745 x 999 / 0.25 = 2695.3. With the
        // coarsest step (1 kohm) as the floor it read 2.7 and hid
        for (String[] w : new String[][]{{"1000", "ohm"}, {"1", "kohm"}}) {
            BenchReadings b = BenchReadings.assess("r", List.of(reading("rail to ground", "A", "1", "ohm", null, null),
                    reading("rail to ground", "B", "1", "ohm", null, null),
                    reading("rail to ground", "C", w[0], w[1], null, null)));
            assertEquals(List.of("C"), b.outliers().stream().map(BenchReadings.Row::where).toList(), w[1]);
            assertEquals(2695.3, b.rows().get(2).modifiedZ(), 0.05, w[1]);
        }
    }

    @Test
    void likeReadingsAreComparedInTheBaseUnitAndOtherKindsApart() {
        List<BenchReading> l = new ArrayList<>(List.of(
                reading("phase inductor", "L1", "150", "mohm", 100e3, null),
                reading("Phase  inductor", "L2", "0.16", "ohm", 100e3, null),
                reading("phase inductor", "L3", "140", "m\u03a9", 100e3, null),
                reading("phase inductor", "L4", "4", "mohm", 100e3, null),
                reading("rail to ground", "VCORE", "0.2", "ohm", null, null),
                reading("rail to ground", "VMEM", "35", "ohm", null, null)));
        BenchReadings b = BenchReadings.assess("r", l);
        assertEquals(List.of("L4"), b.outliers().stream().map(BenchReadings.Row::where).toList());
        assertEquals(145, b.rows().get(0).groupMedian(), 1e-9, "median in the row's own unit (mohm)");
        assertEquals(0.145, b.rows().get(1).groupMedian(), 1e-12);
        assertEquals(4, b.rows().get(0).groupSize());
        // two rail readings: too few to compare
        assertEquals(2, b.rows().get(4).groupSize());
        assertNull(b.rows().get(4).modifiedZ());
        assertFalse(b.rows().get(5).outlier());
    }

    @Test
    void inductorReadingIsComparedWithItsIdealReactance() {
        BenchReadings b = BenchReadings.assess("r", List.of(
                reading("phase inductor", "L1", "0.15", "ohm", 100e3, 0.22),
                reading("phase inductor", "L2", "4", "mohm", 100e3, 0.22),
                reading("inductance", "L3", "0.21", "uH", null, 0.22)));
        BenchReadings.Row l1 = b.rows().get(0), l2 = b.rows().get(1), l3 = b.rows().get(2);
        assertEquals(0.13823, l1.expected(), 1e-5);
        assertEquals(0.15 / 0.138230, l1.ratioToExpected(), 1e-4);
        assertTrue(l1.withinTolerance());
        assertEquals(138.23, l2.expected(), 0.01, "expected in mohm, the reading's unit");
        assertFalse(l2.withinTolerance());
        assertEquals(0.22, l3.expected(), 1e-12);
        assertTrue(l3.withinTolerance());
        assertTrue(b.findings().stream().anyMatch(f -> f.startsWith("L2 (phase inductor) reads 4 mohm at 100 kHz")
                && f.contains("outside")), b.findings().toString());
    }
}
