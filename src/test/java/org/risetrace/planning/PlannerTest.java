package org.risetrace.planning;

import org.junit.jupiter.api.Test;

import java.util.EnumSet;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The planner: currents and powers by Ohm's law (I = V / R) and Joule's law (P = I^2 R) (any circuits text), the
 * supply's two regimes, each rail's voltage against ground, and every warning fired by its own case only.
 */
class PlannerTest {
    private static PlanRequest railToGround(double nominalV, double ohms, double supplyV, double supplyA,
                                            Double requestedV, Double powerW) {
        return new PlanRequest(Topology.RAIL_TO_GROUND, "VDD", nominalV, null, null, ohms, null, supplyV, supplyA,
                requestedV, powerW, null, false, false, null, null, null);
    }

    private static Set<PlanWarning.Code> codes(InjectionPlan p) {
        return p.warnings().stream().map(PlanWarning::code).collect(Collectors.toCollection(
                () -> EnumSet.noneOf(PlanWarning.Code.class)));
    }

    @Test
    void hardShortRunsTheSupplyInConstantCurrentAtItsLimit() {
        // Ohm: 0.9 V across 0.02 ohm would drive 45 A; the 5 A limit holds, so the leads see 5 A x 0.02 ohm = 0.1 V.
        // Joule: P = (5 A)^2 x 0.02 ohm = 0.5 W.
        InjectionPlan p = Planner.plan(railToGround(0.9, 0.02, 30, 5, null, null));
        assertEquals(0.9, p.setVolts(), 1e-12);
        assertEquals(5.0, p.currentLimitA(), 1e-12);
        assertEquals(InjectionPlan.CONSTANT_CURRENT, p.mode());
        assertEquals(5.0, p.currentA(), 1e-12);
        assertEquals(0.1, p.terminalV(), 1e-12);
        assertEquals(0.5, p.shortPowerW(), 1e-12);
        assertEquals(0.1, p.rails().get(0).volts(), 1e-12);
    }

    @Test
    void highResistanceRunsTheSupplyInConstantVoltage() {
        // Ohm: 3.3 V / 50 ohm = 0.066 A, below the 5 A limit; Joule: 0.066^2 x 50 = 0.2178 W = V^2 / R
        InjectionPlan p = Planner.plan(railToGround(3.3, 50, 30, 5, null, null));
        assertEquals(InjectionPlan.CONSTANT_VOLTAGE, p.mode());
        assertEquals(0.066, p.currentA(), 1e-12);
        assertEquals(3.3, p.terminalV(), 1e-12);
        assertEquals(3.3 * 3.3 / 50, p.shortPowerW(), 1e-12);
    }

    @Test
    void wantedPowerSetsTheCurrentLimitByJoulesLaw() {
        // Joule: I = sqrt(P / R) = sqrt(2 W / 1 ohm) = 1.41421 A; the leads see I R = 1.41421 V
        InjectionPlan p = Planner.plan(railToGround(3.3, 1.0, 30, 5, null, 2.0));
        assertEquals(Math.sqrt(2), p.currentLimitA(), 1e-12);
        assertEquals(Math.sqrt(2), p.currentA(), 1e-12);
        assertEquals(InjectionPlan.CONSTANT_CURRENT, p.mode());
        assertEquals(2.0, p.shortPowerW(), 1e-12);
        assertEquals(Math.sqrt(2), p.terminalV(), 1e-12);
    }

    @Test
    void gpuCoreRailAtItsNormalResistanceStaysWithinAFiveAmpSupply() {
        // common practice: a GPU core rail is 0.8-1.0 V and reads about 0.2 ohm to ground when healthy.
        // Ohm: 0.8 V / 0.2 ohm = 4 A and 0.9 V / 0.2 ohm = 4.5 A, both below a 5 A supply: constant voltage.
        for (double v : new double[]{0.8, 0.9}) {
            InjectionPlan p = Planner.plan(railToGround(v, 0.2, 30, 5, null, null));
            assertEquals(v / 0.2, p.currentA(), 1e-12);
            assertEquals(InjectionPlan.CONSTANT_VOLTAGE, p.mode());
            assertEquals(v * v / 0.2, p.shortPowerW(), 1e-12); // Joule: V^2 / R
            assertFalse(p.has(PlanWarning.Code.SUPPLY_CAPS_CURRENT), "0.2 ohm at " + v + " V");
        }
    }

    @Test
    void benchSupplyLimitedToFiveAmpsCapsTheCurrentIntoAShortedGpuCore() {
        // common practice: a bench supply limited to 5 A caps the current. A shorted 1.0 V core at 5 mohm would take
        // 1.0 / 0.005 = 200 A; it gets 5 A, the rail sits at 5 A x 0.005 ohm = 0.025 V, the short takes 0.125 W.
        InjectionPlan p = Planner.plan(railToGround(1.0, 0.005, 30, 5, null, null));
        assertEquals(5.0, p.currentA(), 1e-12);
        assertEquals(0.025, p.rails().get(0).volts(), 1e-12);
        assertEquals(0.125, p.shortPowerW(), 1e-12);
        assertEquals(InjectionPlan.CONSTANT_CURRENT, p.mode());
        assertEquals(EnumSet.of(PlanWarning.Code.SUPPLY_CAPS_CURRENT), codes(p));
        assertTrue(p.warnings().get(0).message().contains("200 A"), p.warnings().get(0).message());
    }

    @Test
    void acrossSwitchSplitsThePowerBetweenShortAndPathAndLeavesTheOutputRailAlone() {
        // Ohm/Joule in series: 3 A through 0.05 ohm = 0.15 V; the switch (0.048 ohm) takes 3^2 x 0.048 = 0.432 W,
        // the inductor and traces (0.002 ohm) 3^2 x 0.002 = 0.018 W, the supply gives 3 A x 0.15 V = 0.45 W.
        PlanRequest in = new PlanRequest(Topology.ACROSS_SWITCH, "VCORE", 1.0, "VIN", 12.0, 0.05, 0.002, 30, 3,
                null, null, null, false, false, null, null, null);
        InjectionPlan p = Planner.plan(in);
        assertEquals(12.0, p.setVolts(), 1e-12, "ceiling: the higher rail's nominal voltage");
        assertEquals(0.15, p.terminalV(), 1e-12);
        assertEquals(0.432, p.shortPowerW(), 1e-12);
        assertEquals(0.018, p.pathPowerW(), 1e-12);
        assertEquals(0.45, p.supplyPowerW(), 1e-12);
        assertEquals("VIN", p.rails().get(0).rail());
        assertEquals(0.15, p.rails().get(0).volts(), 1e-12);
        assertEquals("VCORE", p.rails().get(1).rail());
        assertNull(p.rails().get(1).volts(), "the output rail's voltage to ground is not changed");
        assertTrue(p.has(PlanWarning.Code.OUTPUT_RAIL_STAYS));
    }

    @Test
    void everyWarningFiresForItsOwnCaseAndNoOther() {
        // baseline: 3.3 V rail, 1 ohm, 2 W wanted (1.41 A), 30 V / 5 A supply, nothing connected: no warning
        PlanRequest base = railToGround(3.3, 1.0, 30, 5, null, 2.0);
        assertEquals(Set.of(), codes(Planner.plan(base)));
        assertEquals(EnumSet.of(PlanWarning.Code.ABOVE_NOMINAL),
                codes(Planner.plan(railToGround(3.3, 1.0, 30, 5, 5.0, 2.0))));
        assertEquals(EnumSet.of(PlanWarning.Code.CELL_CONNECTED), codes(Planner.plan(new PlanRequest(
                Topology.RAIL_TO_GROUND, "VDD", 3.3, null, null, 1.0, null, 30, 5, null, 2.0, null, true, false,
                null, null, null))));
        assertEquals(EnumSet.of(PlanWarning.Code.MAINS_CONNECTED), codes(Planner.plan(new PlanRequest(
                Topology.RAIL_TO_GROUND, "VDD", 3.3, null, null, 1.0, null, 30, 5, null, 2.0, null, false, true,
                null, null, null))));
        assertEquals(EnumSet.of(PlanWarning.Code.TOO_LITTLE_HEAT),
                codes(Planner.plan(railToGround(3.3, 1.0, 30, 5, null, 0.001))));
        assertEquals(EnumSet.of(PlanWarning.Code.SUPPLY_CAPS_CURRENT),
                codes(Planner.plan(railToGround(3.3, 1.0, 30, 1.0, null, 2.0))));
        assertEquals(EnumSet.of(PlanWarning.Code.OUTPUT_RAIL_STAYS), codes(Planner.plan(new PlanRequest(
                Topology.ACROSS_SWITCH, "VCORE", 1.0, "VIN", 5.0, 1.0, null, 30, 5, null, 2.0, null, false, false,
                null, null, null))));
        // a stop warning is never quiet: the cautions are always there too
        assertTrue(Planner.plan(base).cautions().stream().anyMatch(c -> c.contains("Disconnect the battery")));
    }

    @Test
    void voltageAboveNominalIsClampedToIt() {
        InjectionPlan p = Planner.plan(railToGround(3.3, 1.0, 30, 5, 5.0, 2.0));
        assertEquals(3.3, p.setVolts(), 1e-12);
        assertTrue(p.warnings().get(0).message().contains("5 V"), p.warnings().get(0).message());
    }

    @Test
    void supplyBelowTheNominalVoltageSetsItsOwnMaximum() {
        InjectionPlan p = Planner.plan(railToGround(12.0, 100, 5.0, 1, null, null));
        assertEquals(5.0, p.setVolts(), 1e-12);
        assertEquals(0.05, p.currentA(), 1e-12); // Ohm: 5 V / 100 ohm
    }

    @Test
    void noPlanEverSetsOrShowsAVoltageAboveTheNominalAgainstGround() {
        SplittableRandom rnd = new SplittableRandom(15);
        for (int i = 0; i < 2000; i++) {
            boolean across = rnd.nextBoolean();
            double nominal = 0.5 + rnd.nextDouble() * 12;
            double high = nominal + 0.1 + rnd.nextDouble() * 20;
            double ohms = Math.pow(10, -3 + rnd.nextDouble() * 5);
            PlanRequest in = new PlanRequest(across ? Topology.ACROSS_SWITCH : Topology.RAIL_TO_GROUND, "R", nominal,
                    across ? "H" : null, across ? high : null, ohms, rnd.nextDouble() * ohms * 0.5,
                    0.5 + rnd.nextDouble() * 60, 0.05 + rnd.nextDouble() * 30,
                    rnd.nextBoolean() ? rnd.nextDouble() * 100 + 0.01 : null,
                    rnd.nextBoolean() ? rnd.nextDouble() * 50 + 0.001 : null, null, false, false, null, null, null);
            InjectionPlan p = Planner.plan(in);
            double ceiling = across ? high : nominal;
            assertTrue(p.setVolts() <= ceiling, "setting " + p.setVolts() + " > " + ceiling);
            for (InjectionPlan.RailVoltage r : p.rails())
                if (r.volts() != null) assertTrue(r.volts() <= ceiling + 1e-12, r + " above " + ceiling);
            assertTrue(p.currentA() <= in.supplyMaxA() + 1e-12);
            // Joule: the powers add up to the supply's output I x V
            assertEquals(p.currentA() * p.terminalV(), p.supplyPowerW(), 1e-9 * Math.max(1, p.supplyPowerW()));
        }
    }

    @Test
    void captureSettingsFollowTheBoardModel() {
        // default board (1.6 mm FR-4, 70 um copper): alpha = 0.02778 / 3496.7 = 7.945e-6 m^2/s (BoardHeatingTest);
        // lock-in period pi mu^2 / alpha at mu = 3 mm: pi x 9e-6 / 7.945e-6 = 3.559 s -> 3.6 s; frame interval a
        // tenth, 0.356 -> 0.35 s; board time constant 3496.7 / (2 x 11.294) = 154.8 s, duration 3 tau -> 470 s
        InjectionPlan.Capture c = Planner.plan(railToGround(3.3, 1.0, 30, 5, null, 2.0)).capture();
        assertEquals(3.6, c.lockInPeriodS(), 1e-9);
        assertEquals(1.8, c.lockInOnS(), 1e-9);
        assertEquals(0.35, c.frameIntervalS(), 1e-9);
        assertEquals(154.8, c.boardTimeConstantS(), 0.05);
        assertEquals(470, c.durationS(), 1e-9);
        // Breitenstein and Langenkamp: the diffusion length at that period, sqrt(alpha T / pi), covers the spacing
        double alpha = new BoardHeating(70).diffusivityM2PerS();
        assertTrue(Math.sqrt(alpha * c.lockInPeriodS() / Math.PI) >= 3e-3);
    }

    @Test
    void badInputsAreRefusedNamingTheQuantity() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> railToGround(3.3, -1, 30, 5, null, null));
        assertTrue(e.getMessage().contains("measured resistance"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PlanRequest(Topology.ACROSS_SWITCH, "V", 1.0,
                "H", null, 1.0, null, 30, 5, null, null, null, false, false, null, null, null));
        assertTrue(e.getMessage().contains("higher rail's nominal voltage"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PlanRequest(Topology.ACROSS_SWITCH, "V", 5.0,
                "H", 3.3, 1.0, null, 30, 5, null, null, null, false, false, null, null, null));
        assertTrue(e.getMessage().contains("must be above"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PlanRequest(Topology.RAIL_TO_GROUND, "V", 1.0,
                null, null, 1.0, 1.5, 30, 5, null, null, null, false, false, null, null, null));
        assertTrue(e.getMessage().contains("path resistance"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> railToGround(3.3, 1, 30, 5, null, -2.0));
        assertThrows(IllegalArgumentException.class, () -> railToGround(Double.NaN, 1, 30, 5, null, null));
    }
}
