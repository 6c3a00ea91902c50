package org.risetrace.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/** {@code risetrace board}: board file tools. */
@Command(name = "board", mixinStandardHelpOptions = true, description = "Board file tools.",
        subcommands = {BoardImportPlacementCommand.class, BoardCheckCommand.class})
public final class BoardCommand implements Runnable {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        throw new CommandLine.ParameterException(spec.commandLine(), "name a board command: import-placement, check");
    }
}
