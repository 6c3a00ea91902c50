package org.risetrace.cli;

import picocli.CommandLine.Option;

import java.nio.file.Path;

/** Options every analysing command shares: where results go, JSON on stdout, and the profile override. */
final class OutputOptions {
    @Option(names = "--out", paramLabel = "<dir>", description = "output folder (default: risetrace-out/<series name>, or risetrace-out/compare)")
    Path out;

    @Option(names = "--json", description = "print analysis.json on stdout; messages go to stderr")
    boolean json;

    @Option(names = "--force", description = "replace an earlier analysis in the output folder (default: refuse)")
    boolean force;

    @Option(names = "--profile", paramLabel = "<name|file>", description = "calibration profile (overrides series.json)")
    String profile;
}
