package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "board", mixinStandardHelpOptions = true, description = "Board file tools.")
public final class BoardCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace board: not built yet");
    }
}
