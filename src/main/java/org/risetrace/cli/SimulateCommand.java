package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "simulate", mixinStandardHelpOptions = true, description = "Writes a simulated capture of an injected board from a scenario file.")
public final class SimulateCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace simulate: not built yet");
    }
}
