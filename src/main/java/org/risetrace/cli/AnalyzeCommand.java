package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "analyze", mixinStandardHelpOptions = true, description = "Finds the part heating fastest above ambient in a series.")
public final class AnalyzeCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace analyze: not built yet");
    }
}
