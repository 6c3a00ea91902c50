package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "inspect", mixinStandardHelpOptions = true, description = "Prints what each frame holds: container, size, bit depth, profile, temperatures, time.")
public final class InspectCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace inspect: not built yet");
    }
}
