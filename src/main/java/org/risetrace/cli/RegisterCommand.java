package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "register", mixinStandardHelpOptions = true, description = "Maps every frame of a series onto the board.")
public final class RegisterCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace register: not built yet");
    }
}
