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
        // a turn that is not its own mirror image: a 10 x 2 mm part at 30 degrees, counter-clockwise as seen on the
        // y-down board (Part), has its +x end up and to the right; the point 6 mm along that axis,
        // (10 + 6 cos 30, 10 - 6 sin 30) = (15.196, 7.0), is 1 mm beyond the end. Its mirror image (15.196, 13.0)
        // lies 3.0 mm along and 5.196 mm across the axis: 4.196 mm from the long side (hand arithmetic)
        Part slanted = new Part("L1", "inductor", null, 10, 10, 10, 2, 30.0);
        double x = 10 + 6 * Math.cos(Math.toRadians(30));
        assertTrue(Verdicts.nearAnyPart(List.of(slanted), x, 7.0, 1.05));
        assertTrue(!Verdicts.nearAnyPart(List.of(slanted), x, 7.0, 0.95));
        assertTrue(!Verdicts.nearAnyPart(List.of(slanted), x, 13.0, 4.1));
        assertTrue(Verdicts.nearAnyPart(List.of(slanted), x, 13.0, 4.3));
    }

    // --- issue 17: each rule of the verdict with its own test; the expected numbers are worked out beside them

    @Test
    void tooLittleHeatingWhenTheLeaderIsUnderKStandardErrors() {
        // leader 0.02 +/- 0.01 K/s is 2 standard errors from zero, under k = 3; it has an onset, so something rose
        Verdicts.Candidate lead = new Verdicts.Candidate("Q1", 0.02, 0.01, true, 0.3);
        Verdicts.Candidate second = new Verdicts.Candidate("U2", 0.0, 0.01, false, 0.1);
        Verdict v = Verdicts.decide(List.of(lead, second), List.of(), 0.1, 0, 20, O);
        assertEquals(VerdictStatus.INCONCLUSIVE, v.status(), v.reason());
        assertTrue(v.reason().startsWith("too little heating: the fastest part, Q1"), v.reason());
        assertEquals("Q1", v.ref());
        // the same leader at 0.04 +/- 0.01 K/s is 4 standard errors: it heats, and leads U2 by 0.04 / hypot(0.01,
        // 0.01) = 2.83 sigma, under the separation of 3: now "two parts level", no longer "too little heating"
        Verdicts.Candidate stronger = new Verdicts.Candidate("Q1", 0.04, 0.01, true, 0.3);
        Verdict w = Verdicts.decide(List.of(stronger, second), List.of(), 0.1, 0, 20, O);
        assertTrue(w.reason().startsWith("two parts level"), w.reason());
        assertEquals(2.83, w.separationSigma(), 0.01); // hand arithmetic above
    }

    @Test
    void noPartsMarkedIsSaidWhateverTheMapShows() {
        Verdict empty = Verdicts.decide(List.of(), List.of(), 0.1, 0, 20, O);
        assertEquals(VerdictStatus.INCONCLUSIVE, empty.status());
        assertEquals("the board file marks no parts", empty.reason());
        Hotspot spot = new Hotspot(17.0, 10.0, 8.0, null);
        Verdict withSpot = Verdicts.decide(List.of(), List.of(spot), 0.1, 0, 20, O);
        assertEquals(VerdictStatus.INCONCLUSIVE, withSpot.status());
        assertTrue(withSpot.reason().startsWith("the board file marks no parts; the hottest spot is at 17.0, 10.0 mm"),
                withSpot.reason());
        assertEquals(null, withSpot.ref());
    }

    @Test
    void hottestSpotOnNoMarkedPartNamesNoLeader() {
        // the fastest marked part must not be presented as the answer when the source is the unmarked spot
        Part q1 = new Part("Q1", "ic", null, 10, 10, 4, 4, null);
        Verdicts.Candidate lead = new Verdicts.Candidate("Q1", 1.0, 0.05, true, 2.0);
        Verdicts.Candidate second = new Verdicts.Candidate("U2", 0.1, 0.05, true, 0.5);
        Hotspot away = new Hotspot(30.0, 10.0, 8.0, null);
        Verdict v = Verdicts.decide(List.of(lead, second), List.of(away), 0.1, 0, 20, O, "K/s", List.of(q1), 1.0);
        assertEquals(VerdictStatus.INCONCLUSIVE, v.status());
        assertEquals(null, v.ref(), v.reason());
        assertEquals(null, v.runnerUpRef());
    }

    @Test
    void noHeatingDoesNotSpeakOfMeasuredNoiseWhenNoneWasMeasured() {
        // one usable frame: no part has a rate or a noise, the map has no sigma
        Verdicts.Candidate a = new Verdicts.Candidate("Q1", null, null, false, Double.NaN);
        Verdicts.Candidate b = new Verdicts.Candidate("U2", null, null, false, Double.NaN);
        Verdict v = Verdicts.decide(List.of(a, b), List.of(), Double.NaN, 0, 1, O);
        assertEquals(VerdictStatus.NO_HEATING, v.status());
        assertTrue(!v.reason().contains("measured noise") && v.reason().contains("no part's noise could be measured"), v.reason());
        // with a measured noise the usual words stay
        Verdicts.Candidate c = new Verdicts.Candidate("Q1", 0.0, 0.01, false, 0.0);
        Verdict w = Verdicts.decide(List.of(c), List.of(), 0.1, 0, 20, O);
        assertEquals("nothing rose above 3.0 times the measured noise", w.reason());
    }

    @Test
    void weakRegistrationIsNotedButDoesNotDecideByNumber() {
        // the rule since the mapping error became part of every rate's error: 10 weak frames of 20 (over the
        // weak_fraction_limit of 0.25) leave a clear lead identified, with a note; 2 of 20 add no note
        Verdicts.Candidate lead = new Verdicts.Candidate("Q1", 1.0, 0.1, true, 5.0);
        Verdicts.Candidate second = new Verdicts.Candidate("U2", 0.3, 0.05, true, 2.0);
        Verdict many = Verdicts.decide(List.of(lead, second), List.of(), 0.1, 10, 20, O);
        assertEquals(VerdictStatus.IDENTIFIED, many.status(), many.reason());
        assertTrue(many.reason().contains("(registration weak in 10 of 20 frames"), many.reason());
        Verdict few = Verdicts.decide(List.of(lead, second), List.of(), 0.1, 2, 20, O);
        assertEquals(VerdictStatus.IDENTIFIED, few.status());
        assertTrue(!few.reason().contains("registration weak"), few.reason());
    }
}
