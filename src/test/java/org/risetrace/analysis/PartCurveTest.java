package org.risetrace.analysis;

import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

/**
 * One part's rise curve ({@link PartCurve#measure}) on hand-made series whose answer is known by construction:
 * when an onset is reported, and that the background (ambient) reading is subtracted frame by frame.
 */
class PartCurveTest {
    private static final AnalysisOptions O = AnalysisOptions.defaults();

    @Test
    void noOnsetForAPartThatIsNotRisenAtTheEnd() {
        // issue 17: onset 29.5 s shown for a part whose end rise was -0.07 K. Noise-free baseline 25 C over 10
        // frames, then two frames 0.5 K up (above any threshold of a noise near 0.01 K) and back to -0.07 K.
        int n = 60;
        double[] t = new double[n], part = new double[n];
        Random rnd = new Random(3);
        for (int i = 0; i < n; i++) {
            t[i] = 0.5 * i;
            part[i] = 25 + 0.01 * rnd.nextGaussian() + (i == 30 || i == 31 ? 0.5 : i > 31 ? -0.07 : 0);
        }
        PartCurve c = PartCurve.measure(t, part, null, null, 10, 4.75, O);
        assertNull(c.onsetS(), "end rise " + c.endRiseK() + " K is not above k sigma");
        assertNull(c.fit(), "a part that did not heat gets no rise model");

        // the same excursion that stays up: an onset at the first of the two frames (t = 15.0 s)
        for (int i = 32; i < n; i++) part[i] += 0.57;
        PartCurve up = PartCurve.measure(t, part, null, null, 10, 4.75, O);
        assertNotNull(up.onsetS());
        assertEquals(15.0, up.onsetS(), 1e-12);
    }
}
