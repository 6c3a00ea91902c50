package org.risetrace.cli;

import org.risetrace.archive.Archive;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;

import java.util.concurrent.Callable;

/** {@code risetrace case status}: closes or reopens a case. */
@Command(name = "status", mixinStandardHelpOptions = true, description = "Sets a case's status: open or closed.")
public final class CaseStatusCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<case>", description = "the case number")
    String number;
    @Parameters(index = "1", paramLabel = "open|closed", description = "the new status")
    String status;

    @Override
    public Integer call() {
        if (!Archive.STATUSES.contains(status))
            throw new CommandLine.ParameterException(spec.commandLine(), "the status must be one of " + Archive.STATUSES);
        try (Archive a = archive.open()) {
            a.setStatus(number, status);
            spec.commandLine().getOut().println(number + ": " + status);
        }
        return Main.EXIT_OK;
    }
}
