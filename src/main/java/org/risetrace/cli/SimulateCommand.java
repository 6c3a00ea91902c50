package org.risetrace.cli;

import org.risetrace.sim.Scenario;
import org.risetrace.sim.SimulationOutput;
import org.risetrace.sim.Simulator;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace simulate --scenario <file> --out <dir>}: writes a simulated capture with its ground truth. */
@Command(name = "simulate", mixinStandardHelpOptions = true,
        description = "Writes a simulated capture of an injected board from a scenario file: frames, series.json, "
                + "board.json and truth.json.")
public final class SimulateCommand implements Callable<Integer> {
    @Option(names = "--scenario", required = true, paramLabel = "FILE", description = "scenario file (JSON)")
    Path scenario;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "output folder (created when missing)")
    Path out;

    @Option(names = "--seed", paramLabel = "N", description = "override the scenario's random seed")
    Long seed;

    @Override
    public Integer call() {
        Scenario s = Scenario.read(scenario);
        if (seed != null) s = s.withSeed(seed);
        SimulationOutput result = Simulator.run(s, out);
        System.out.println("wrote " + result.frameFiles().size() + " frames, series.json, board.json and truth.json to "
                + out + " (source " + result.truth().primarySource() + ")");
        return Main.EXIT_OK;
    }
}
