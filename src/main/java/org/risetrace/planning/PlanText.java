package org.risetrace.planning;

import java.util.ArrayList;
import java.util.List;

import static org.risetrace.planning.Numbers.sig;

/** A plan in lines of plain text, for the terminal (the report has its own table). */
public final class PlanText {
    private PlanText() {
    }

    public static List<String> lines(InjectionPlan p) {
        PlanRequest in = p.inputs();
        List<String> l = new ArrayList<>();
        boolean across = in.topology() == Topology.ACROSS_SWITCH;
        l.add("Injection plan (" + in.topology().word() + "): " + (across
                ? "from " + in.highRail() + " (" + sig(in.highRailNominalV()) + " V nominal) across the shorted "
                + "switch into " + in.rail() + " (" + sig(in.railNominalV()) + " V nominal)"
                : "into " + in.rail() + " (" + sig(in.railNominalV()) + " V nominal) against ground")
                + ", " + sig(in.measuredOhms()) + " ohm measured"
                + (in.pathOhms() > 0 ? " (" + sig(in.pathOhms()) + " ohm of it outside the short)" : ""));
        l.add("  supply setting    " + sig(p.setVolts()) + " V, current limit " + sig(p.currentLimitA()) + " A"
                + (across ? "  (positive on " + in.highRail() + ", negative on " + in.rail() + ")"
                : "  (positive on " + in.rail() + ", negative on ground)"));
        l.add("  supply mode       " + p.mode() + (InjectionPlan.CONSTANT_CURRENT.equals(p.mode())
                ? ": the limit holds the current, the voltage stays below the setting"
                : ": the setting holds the voltage, the current stays below the limit"));
        l.add("  current           " + sig(p.currentA()) + " A");
        l.add("  between the leads " + sig(p.terminalV()) + " V");
        l.add("  power in short    " + sig(p.shortPowerW()) + " W" + (in.pathOhms() > 0
                ? "   elsewhere in the path " + sig(p.pathPowerW()) + " W   supply " + sig(p.supplyPowerW()) + " W" : ""));
        l.add("  against ground:");
        for (InjectionPlan.RailVoltage r : p.rails())
            l.add("    " + r.rail() + "  " + (r.volts() == null ? "unchanged" : sig(r.volts()) + " V") + "  (" + r.note() + ")");
        InjectionPlan.Heating h = p.heating();
        l.add("  heating           about " + sig(h.riseK()) + " K after " + (int) h.afterS() + " s; "
                + sig(h.neededK()) + " K shows clearly, from about " + sig(h.powerNeededW()) + " W  (" + h.model() + ")");
        InjectionPlan.Capture c = p.capture();
        l.add("  capture           a frame every " + sig(c.frameIntervalS()) + " s; record " + sig(c.baselineS())
                + " s before switching on and " + sig(c.durationS()) + " s after (3 x the board's time constant "
                + sig(c.boardTimeConstantS()) + " s; the initial rates need only the first 30 s)");
        l.add("  lock-in           period " + sig(c.lockInPeriodS()) + " s (" + sig(c.lockInOnS()) + " s on, "
                + sig(c.lockInOffS()) + " s off), " + c.lockInCycles() + " periods");
        if (p.warnings().isEmpty()) {
            l.add("Warnings: none");
        } else {
            l.add("Warnings:");
            for (PlanWarning w : p.warnings())
                l.add("  [" + w.severity() + "] " + w.code().word() + ": " + w.message());
        }
        l.add("Cautions:");
        for (String s : p.cautions()) l.add("  - " + s);
        return l;
    }
}
