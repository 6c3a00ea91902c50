package org.risetrace.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.risetrace.planning.InjectionPlan;
import org.risetrace.planning.PlanRequest;
import org.risetrace.planning.PlanText;
import org.risetrace.planning.Planner;
import org.risetrace.planning.SeriesInjection;
import org.risetrace.planning.Topology;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace plan}: supply settings, warnings and capture settings for an injection. Parses, calls {@link Planner}, prints. */
@Command(name = "plan", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Works out a safe injection: the supply's voltage and current settings, the current and power "
                + "in the short, each rail's voltage against ground, warnings, and the camera settings.",
                "It never sets a voltage above the nominal voltage of the rail the supply can raise against ground. "
                        + "Local electrical codes and licensed practice come first."},
        exitCodeListHeading = "%nExit codes:%n",
        exitCodeList = {"0:plan printed (read its warnings)", "1:an input was rejected (one line on stderr names it)",
                "2:usage error or a value out of range"})
public final class PlanCommand implements Callable<Integer> {
    @Option(names = "--topology", required = true, paramLabel = "rail-to-ground|across-switch",
            description = "rail-to-ground: positive on the rail, negative on ground. across-switch: positive on a "
                    + "higher rail, negative on the converter's output rail, through the shorted high-side switch.")
    String topology;

    @Option(names = "--rail", paramLabel = "NAME", description = "the rail injected into (across-switch: the output rail)")
    String rail;

    @Option(names = "--rail-volts", required = true, paramLabel = "V", description = "that rail's nominal voltage")
    double railVolts;

    @Option(names = "--high-rail", paramLabel = "NAME", description = "across-switch: the higher rail (the converter's input)")
    String highRail;

    @Option(names = "--high-rail-volts", paramLabel = "V", description = "across-switch: the higher rail's nominal voltage")
    Double highRailVolts;

    @Option(names = "--ohms", required = true, paramLabel = "R",
            description = "resistance measured between the two points the leads go to")
    double ohms;

    @Option(names = "--path-ohms", paramLabel = "R",
            description = "of it, the part outside the short (inductor DCR, traces); default 0")
    Double pathOhms;

    @Option(names = "--supply-volts", required = true, paramLabel = "V", description = "the most voltage the supply gives")
    double supplyVolts;

    @Option(names = "--supply-amps", required = true, paramLabel = "A", description = "the most current the supply gives (or you allow)")
    double supplyAmps;

    @Option(names = "--set-volts", paramLabel = "V", description = "the voltage you want to set (default: the rail's nominal)")
    Double setVolts;

    @Option(names = "--power", paramLabel = "W", description = "the power wanted in the short (default: what the supply's current gives)")
    Double power;

    @Option(names = "--netd", paramLabel = "K", description = "the camera's NETD in kelvin (default: " + PlanRequest.DEFAULT_NETD_K + ")")
    Double netd;

    @Option(names = "--battery-connected", description = "a battery (lithium cell) is still connected to the board")
    boolean batteryConnected;

    @Option(names = "--mains-connected", description = "the mains input is still connected")
    boolean mainsConnected;

    @Option(names = "--spot-radius-mm", paramLabel = "MM", description = "radius the camera sees of the short's package (default: " + PlanRequest.DEFAULT_SPOT_RADIUS_MM + ")")
    Double spotRadiusMm;

    @Option(names = "--copper-um", paramLabel = "UM", description = "total plane copper of the board in micrometres (default: " + PlanRequest.DEFAULT_COPPER_UM + ")")
    Double copperUm;

    @Option(names = "--part-spacing-mm", paramLabel = "MM", description = "distance between neighbouring parts to tell apart (default: " + PlanRequest.DEFAULT_PART_SPACING_MM + ")")
    Double partSpacingMm;

    @Option(names = "--json", description = "print the plan as one JSON document on stdout; messages go to stderr")
    boolean json;

    @Option(names = "--write-series", paramLabel = "FOLDER",
            description = "write the plan into FOLDER/series.json as its injection record (the old file is kept as "
                    + SeriesInjection.BACKUP_FILE + ")")
    Path writeSeries;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        PlanRequest request;
        try {
            request = new PlanRequest(Topology.of(topology), rail, railVolts, highRail, highRailVolts, ohms, pathOhms,
                    supplyVolts, supplyAmps, setVolts, power, netd, batteryConnected, mainsConnected, spotRadiusMm,
                    copperUm, partSpacingMm);
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
        InjectionPlan plan = Planner.plan(request);
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (json) {
            out.println(new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(plan));
        } else {
            for (String line : PlanText.lines(plan)) out.println(line);
        }
        out.flush();
        if (writeSeries != null) {
            Path file = SeriesInjection.write(writeSeries, plan);
            err.println("risetrace: wrote the plan into " + file + " (injection record)");
        }
        err.flush();
        return Main.EXIT_OK;
    }
}
