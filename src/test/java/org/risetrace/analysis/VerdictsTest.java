package org.risetrace.analysis;

import org.junit.jupiter.api.Test;
import org.risetrace.board.Part;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The decision rules on hand-made candidates; every expected number is worked out in the comment beside it. */
class VerdictsTest {
    private static final AnalysisOptions O = AnalysisOptions.defaults();

    @Test
    void separationIsJudgedAtTheWorstCaseOfTheEmissivityRange() {
        // leader 1.0 +/- 0.1 K/s, runner-up 0.3 +/- 0.05 K/s: (1.0 - 0.3) / hypot(0.1, 0.05) = 6.26 sigma
        Verdicts.Candidate lead = new Verdicts.Candidate("Q1", 1.0, 0.1, true, 5.0);
        Verdicts.Candidate second = new Verdicts.Candidate("U2", 0.3, 0.05, true, 2.0);
        Verdict v = Verdicts.decide(List.of(lead, second), List.of(), 0.1, 0, 20, O);
        assertEquals(VerdictStatus.IDENTIFIED, v.status());
        assertEquals(6.26, v.separationSigma(), 0.01); // hand arithmetic above

        // the same nominal rates with a wide emissivity range: leader at e + u reads half (0.5 +/- 0.05), runner-up at
        // e - u reads 1.5 times (0.45 +/- 0.075): (0.5 - 0.45) / hypot(0.05, 0.075) = 0.55 sigma, under 3
        Verdicts.Candidate leadWide = new Verdicts.Candidate("Q1", 1.0, 0.1, true, 5.0, 0.5, 2.0);
        Verdicts.Candidate secondWide = new Verdicts.Candidate("U2", 0.3, 0.05, true, 2.0, 0.5, 1.5);
        Verdict w = Verdicts.decide(List.of(leadWide, secondWide), List.of(), 0.1, 0, 20, O);
        assertEquals(VerdictStatus.INCONCLUSIVE, w.status(), w.reason());
        assertEquals(0.55, w.separationSigma(), 0.01); // hand arithmetic above
    }

    @Test
    void emissivityUncertaintyDoesNotDecideWhetherAPartHeats() {
        // a lone part at 0.1 +/- 0.02 K/s is 5 standard errors above zero whatever its emissivity (a scale error
        // cannot make a zero rise non-zero, nor a clear rise zero)
        Verdicts.Candidate only = new Verdicts.Candidate("Q1", 0.1, 0.02, true, 1.0, 0.4, 3.0);
        Verdict v = Verdicts.decide(List.of(only), List.of(), 0.1, 0, 20, O);
        assertEquals(VerdictStatus.IDENTIFIED, v.status(), v.reason());
    }

    @Test
    void hotSpotBesideAFootprintIsNotAnUnmarkedPart() {
        Part q1 = new Part("Q1", "ic", null, 10, 10, 4, 4, null); // footprint x 8..12, y 8..12 mm
        Verdicts.Candidate lead = new Verdicts.Candidate("Q1", 1.0, 0.05, true, 2.0);
        Verdicts.Candidate second = new Verdicts.Candidate("U2", 0.1, 0.05, true, 0.5);
        // 0.6 mm right of the footprint's edge, hotter on the map than the leader's own peak by far (8 K vs 2 K)
        Hotspot beside = new Hotspot(12.6, 10.0, 8.0, null);
        Verdict near = Verdicts.decide(List.of(lead, second), List.of(beside), 0.1, 0, 20, O, "K/s", List.of(q1), 1.0);
        assertEquals(VerdictStatus.IDENTIFIED, near.status(), near.reason());
        // 5 mm away it is on no marked part
        Hotspot away = new Hotspot(17.0, 10.0, 8.0, null);
        Verdict far = Verdicts.decide(List.of(lead, second), List.of(away), 0.1, 0, 20, O, "K/s", List.of(q1), 1.0);
        assertEquals(VerdictStatus.INCONCLUSIVE, far.status());
        assertTrue(far.reason().contains("no marked part"), far.reason());
    }

    @Test
    void distanceToARotatedFootprint() {
        // a 4 x 2 mm part turned by 90 degrees spans x 9..11, y 8..12: the point (12.5, 10) is 1.5 mm from its edge
        Part r = new Part("R1", "resistor", null, 10, 10, 4, 2, 90.0);
        assertTrue(Verdicts.nearAnyPart(List.of(r), 12.5, 10, 1.6));
        assertTrue(!Verdicts.nearAnyPart(List.of(r), 12.5, 10, 1.4));
    }
}
