package org.risetrace.planning;

import java.util.ArrayList;
import java.util.List;

import static org.risetrace.planning.Numbers.sig;

/**
 * Works out an injection: the supply's settings, the current and powers (Ohm's law I = V / R and Joule's law
 * P = I^2 R), each rail's voltage against ground, the warnings and the capture settings. Never sets a voltage above
 * the nominal voltage of the rail the supply can raise against ground.
 *
 * <p>Supply model: a bench supply holds whichever of its two settings binds first. Into a resistance R it gives
 * I = min(current limit, V set / R); when the limit binds (constant-current) the voltage between the leads is
 * I R, below the setting; if the short opens, the voltage rises to the setting, which is why the setting never
 * exceeds the nominal voltage.
 */
public final class Planner {
    /** The time the heating check looks at: a minute. */
    static final double CHECK_AFTER_S = 60.0;
    /** A rise of this many NETDs stands clearly above the camera's noise (the analysis asks for 3 sigma). */
    static final double NETD_MULTIPLE = 5.0;
    /** Record this many lock-in periods: the signal-to-noise ratio grows as the square root of the periods. */
    static final int LOCK_IN_CYCLES = 10;
    /** Frames per lock-in period: at least 10, so each period's waveform is sampled well above Nyquist's 2. */
    static final int FRAMES_PER_PERIOD = 10;
    /** Frame interval bounds, s: 10 frames/s is within reach of bench cameras; 2 frames/s at the least. */
    static final double MIN_FRAME_INTERVAL_S = 0.1, MAX_FRAME_INTERVAL_S = 0.5;
    /** Baseline before switching on, s (and at least 10 frames). */
    static final double BASELINE_S = 10.0;

    private Planner() {
    }

    public static InjectionPlan plan(PlanRequest in) {
        List<PlanWarning> warnings = new ArrayList<>();
        boolean across = in.topology() == Topology.ACROSS_SWITCH;
        double ceilingV = in.ceilingV();
        String groundRail = in.railAgainstGround();

        // the voltage setting: what was asked, never above the nominal voltage against ground, within the supply
        double asked = in.requestedV() == null ? ceilingV : in.requestedV();
        if (asked > ceilingV) {
            warnings.add(PlanWarning.of(PlanWarning.Code.ABOVE_NOMINAL, "asked for " + sig(asked) + " V, above "
                    + groundRail + "'s nominal " + sig(ceilingV) + " V against ground: the setting is "
                    + sig(ceilingV) + " V instead"));
            asked = ceilingV;
        }
        double setV = Math.min(asked, in.supplyMaxV());

        // Ohm's law for the current each setting allows, Joule's law for the current the wanted power needs
        double r = in.measuredOhms(), rShort = in.shortOhms(), rPath = in.pathOhms();
        double byVoltageA = setV / r;
        double byPowerA = in.wantedPowerW() == null ? Double.POSITIVE_INFINITY : Math.sqrt(in.wantedPowerW() / rShort);
        double limitA = Math.min(in.supplyMaxA(), byPowerA);
        double currentA = Math.min(limitA, byVoltageA);
        String mode = byVoltageA > limitA ? InjectionPlan.CONSTANT_CURRENT : InjectionPlan.CONSTANT_VOLTAGE;
        double terminalV = byVoltageA > limitA ? currentA * r : setV;
        double shortW = currentA * currentA * rShort, pathW = currentA * currentA * rPath;

        if (in.supplyMaxA() < Math.min(byPowerA, byVoltageA)) {
            String wanted = byPowerA <= byVoltageA
                    ? "the wanted " + sig(in.wantedPowerW()) + " W needs " + sig(byPowerA) + " A"
                    : "the short would take " + sig(byVoltageA) + " A at " + sig(setV) + " V";
            warnings.add(PlanWarning.of(PlanWarning.Code.SUPPLY_CAPS_CURRENT, "the supply's " + sig(in.supplyMaxA())
                    + " A limit caps the current: " + wanted + "; it gets " + sig(currentA) + " A, "
                    + sig(shortW) + " W in the short"));
        }
        if (in.batteryConnected())
            warnings.add(PlanWarning.of(PlanWarning.Code.CELL_CONNECTED, "a battery is still connected: disconnect "
                    + "it (a lithium cell above all) before injecting; a cell can drive fault currents no supply "
                    + "limit stops, and can catch fire"));
        if (in.mainsConnected())
            warnings.add(PlanWarning.of(PlanWarning.Code.MAINS_CONNECTED, "the mains input is still connected: "
                    + "unplug it before injecting; mains-side parts can hold lethal voltages and the bench supply's "
                    + "leads may be tied to earth"));

        // the heating check
        BoardHeating board = new BoardHeating(in.copperUm());
        double spotM = in.spotRadiusMm() * 1e-3;
        double risePerW = board.riseK(1.0, spotM, CHECK_AFTER_S);
        double neededK = NETD_MULTIPLE * in.netdK();
        double riseK = shortW * risePerW;
        double neededW = neededK / risePerW;
        if (riseK < neededK) {
            double neededA = Math.sqrt(neededW / rShort);
            double neededV = neededA * r;
            String how = neededV <= ceilingV
                    ? "; that needs about " + sig(neededA) + " A (" + sig(neededV) + " V between the leads)"
                    : "; that needs " + sig(neededA) + " A, which would take " + sig(neededV) + " V, above the "
                    + sig(ceilingV) + " V nominal: heating cannot show this short at a safe voltage";
            warnings.add(PlanWarning.of(PlanWarning.Code.TOO_LITTLE_HEAT, sig(shortW) + " W in the short warms a "
                    + sig(2 * in.spotRadiusMm()) + " mm spot by about " + sig(riseK) + " K in "
                    + (int) CHECK_AFTER_S + " s (an optimistic board model), less than the " + sig(neededK)
                    + " K (" + (int) NETD_MULTIPLE + " x NETD " + sig(in.netdK()) + " K) the camera shows clearly: "
                    + "aim for at least " + sig(neededW) + " W" + how));
        }

        // rails against ground
        List<InjectionPlan.RailVoltage> rails = new ArrayList<>();
        if (across) {
            rails.add(new InjectionPlan.RailVoltage(in.highRail(), terminalV, "about I x R above ground, as the "
                    + "output rail stays near ground; rises to the " + sig(setV) + " V setting if the short opens"));
            rails.add(new InjectionPlan.RailVoltage(in.rail(), null, "stays where it was before injection "
                    + "(0 V on an unpowered board): the supply's negative lead floats on it"));
            warnings.add(PlanWarning.of(PlanWarning.Code.OUTPUT_RAIL_STAYS, "across the switch, " + in.rail()
                    + "'s voltage to ground stays where it was: the current runs from " + in.highRail()
                    + " through the shorted switch into " + in.rail() + " and back to the supply, not through "
                    + in.rail() + "'s loads; only " + in.highRail() + " rises against ground, to about "
                    + sig(terminalV) + " V"));
        } else {
            rails.add(new InjectionPlan.RailVoltage(in.rail(), terminalV, "I x R; rises to the " + sig(setV)
                    + " V setting if the short opens"));
        }

        // capture settings
        double periodS = board.lockInPeriodS(in.partSpacingMm() * 1e-3);
        double intervalS = Math.max(MIN_FRAME_INTERVAL_S, Math.min(MAX_FRAME_INTERVAL_S, periodS / FRAMES_PER_PERIOD));
        intervalS = Math.floor(intervalS * 100 + 1e-9) / 100;
        periodS = Math.max(periodS, FRAMES_PER_PERIOD * intervalS);
        periodS = Math.ceil(periodS * 10 - 1e-9) / 10;
        double tauS = board.boardTimeConstantS();
        double durationS = Math.ceil(3 * tauS / 10) * 10;
        double baselineS = Math.max(BASELINE_S, 10 * intervalS);
        InjectionPlan.Capture capture = new InjectionPlan.Capture(intervalS, baselineS, durationS, tauS, periodS,
                periodS / 2, periodS / 2, LOCK_IN_CYCLES);
        InjectionPlan.Heating heating = new InjectionPlan.Heating("line source in a 1.6 mm FR-4 board with "
                + sig(in.copperUm()) + " um of plane copper, rise at " + sig(in.spotRadiusMm())
                + " mm from the short, no loss to air (overstates the rise)", CHECK_AFTER_S, riseK, neededK, neededW);

        return new InjectionPlan(InjectionPlan.SCHEMA, in, setV, limitA, mode, currentA, terminalV, shortW, pathW,
                shortW + pathW, rails, heating, capture, warnings, cautions(in, setV));
    }

    /** The cautions every plan carries. */
    static List<String> cautions(PlanRequest in, double setV) {
        List<String> c = new ArrayList<>();
        c.add("Disconnect the battery (a lithium cell above all) and the mains input before injecting; discharge "
                + "bulk capacitors.");
        c.add("Set the current limit before connecting the leads, start low (a few hundred milliamps) and raise it "
                + "step by step.");
        c.add("Never inject between a rail and ground above that rail's nominal voltage: here at most "
                + sig(in.ceilingV()) + " V on " + in.railAgainstGround() + ".");
        if (in.topology() == Topology.ACROSS_SWITCH)
            c.add("Everything on " + in.highRail() + " sees up to the " + sig(setV) + " V setting: converters fed "
                    + "from it may start, within their own ratings.");
        c.add("Hot parts burn: a shorted part can pass 100 \u00b0C within seconds; do not touch the board while "
                + "injecting or while it cools.");
        c.add("These settings are a calculation from your inputs, not a guarantee: local electrical codes and "
                + "licensed practice come first.");
        return c;
    }
}
