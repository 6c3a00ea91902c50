package org.risetrace.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;

/** {@code risetrace case search TEXT}: {@code case list --text TEXT} with the text as the argument. */
@Command(name = "search", mixinStandardHelpOptions = true,
        description = "Lists the cases whose number, customer reference, device, serial, fault, technician, series "
                + "notes or verdict part contain the text.")
public final class CaseSearchCommand extends CaseListCommand {
    @Parameters(index = "0", paramLabel = "<text>", description = "the text to look for (any letter case)")
    String words;

    @Override
    String text() {
        return words;
    }
}
