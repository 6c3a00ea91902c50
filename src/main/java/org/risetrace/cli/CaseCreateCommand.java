package org.risetrace.cli;

import org.risetrace.archive.Archive;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.util.concurrent.Callable;

/** {@code risetrace case create}: opens a new case. */
@Command(name = "create", mixinStandardHelpOptions = true, description = "Opens a new case and prints its number.")
public final class CaseCreateCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Option(names = "--number", paramLabel = "<case>", description = "the case number (default: the next of the year, e.g. 2026-0007)")
    String number;
    @Option(names = "--customer", paramLabel = "<text>", description = "the customer reference as the shop keeps it (no more)")
    String customer;
    @Option(names = "--device", paramLabel = "<text>", description = "the device, e.g. 'controller board DB-31'")
    String device;
    @Option(names = "--serial", paramLabel = "<text>", description = "the device's serial number")
    String serial;
    @Option(names = "--fault", paramLabel = "<text>", description = "the fault as reported")
    String fault;
    @Option(names = "--technician", paramLabel = "<name>", description = "the technician on the case (default: --by)")
    String technician;

    @Override
    public Integer call() {
        try (Archive a = archive.openOrCreate()) {
            Archive.CaseRecord r = a.createCase(new Archive.NewCase(number, customer, device, serial, fault, technician));
            spec.commandLine().getOut().println(r.caseNumber());
        }
        return Main.EXIT_OK;
    }
}
