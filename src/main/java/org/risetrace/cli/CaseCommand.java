package org.risetrace.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/** {@code risetrace case}: the shop's evidence archive. */
@Command(name = "case", mixinStandardHelpOptions = true,
        description = "The evidence archive: cases, their original frames, analyses, customer reports and bags.",
        subcommands = {
                CaseCreateCommand.class,
                CaseListCommand.class,
                CaseSearchCommand.class,
                CaseShowCommand.class,
                CaseStatusCommand.class,
                CaseAddSeriesCommand.class,
                CaseAnalyseCommand.class,
                CaseReportCommand.class,
                CaseExportCommand.class,
                CaseImportCommand.class,
                CaseVerifyCommand.class})
public final class CaseCommand implements Runnable {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        throw new CommandLine.ParameterException(spec.commandLine(), "name a subcommand (risetrace case --help lists them)");
    }
}
