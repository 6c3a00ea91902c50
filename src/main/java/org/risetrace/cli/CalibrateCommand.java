package org.risetrace.cli;

import picocli.CommandLine.Command;

/** Placeholder until the stage lands. */
@Command(name = "calibrate", mixinStandardHelpOptions = true, description = "Fits a calibration profile to frames of reference targets at known temperatures.")
public final class CalibrateCommand implements Runnable {
    @Override
    public void run() {
        System.err.println("risetrace calibrate: not built yet");
    }
}
