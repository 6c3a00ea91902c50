package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "compare", mixinStandardHelpOptions = true, description = "Compares a before and an after frame part by part.")
public final class CompareCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace compare: not built yet");
    }
}
