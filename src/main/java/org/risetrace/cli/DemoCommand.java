package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "demo", mixinStandardHelpOptions = true, description = "Analyses every bundled sample series and writes their reports.")
public final class DemoCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace demo: not built yet");
    }
}
