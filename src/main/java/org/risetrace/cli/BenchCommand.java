package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "bench", mixinStandardHelpOptions = true, description = "Measures the cost of the hot paths on this machine.")
public final class BenchCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace bench: not built yet");
    }
}
