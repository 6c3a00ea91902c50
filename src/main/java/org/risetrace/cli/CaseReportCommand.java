package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.CustomerReport;
import org.risetrace.archive.Shop;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace case report}: the customer report of a case, stored with the case and written to a file. */
@Command(name = "report", mixinStandardHelpOptions = true,
        description = "Makes the customer report of a case: the shop's header, the findings in plain words, the maps, "
                + "the safety cautions; printable on A4 or Letter. Stored with the case and written to --out.")
public final class CaseReportCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<case>", description = "the case number")
    String number;
    @Option(names = "--out", paramLabel = "<file.html>", description = "where to write it (default: customer-report-CASE.html)")
    Path out;
    @Option(names = "--shop", paramLabel = "<shop.json>",
            description = "the shop's name and contact (default: shop.json in the archive, else $XDG_CONFIG_HOME/risetrace/shop.json)")
    Path shop;
    @Option(names = "--paper", paramLabel = "a4|letter", description = "paper for printing (default: a4)")
    String paper = "a4";

    @Override
    public Integer call() {
        CustomerReport.Paper p = switch (paper.toLowerCase(java.util.Locale.ROOT)) {
            case "a4" -> CustomerReport.Paper.A4;
            case "letter" -> CustomerReport.Paper.LETTER;
            default -> throw new CommandLine.ParameterException(spec.commandLine(), "--paper must be a4 or letter");
        };
        Path target = out != null ? out : Path.of("customer-report-" + number + ".html");
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS))
            throw new org.risetrace.frame.InputRejected(target, "exists already", "name another file with --out");
        try (Archive a = archive.open()) {
            Shop s = Shop.load(shop, a.settings().folder(), System.getenv());
            CustomerReport.Made made = CustomerReport.make(a, number, s, p);
            try {
                Files.writeString(target, made.html(), StandardCharsets.UTF_8, java.nio.file.StandardOpenOption.CREATE_NEW);
            } catch (IOException e) {
                throw new org.risetrace.frame.InputRejected(target, "cannot write the report: " + e.getMessage());
            }
            spec.commandLine().getOut().println(number + ": customer report " + target + " (stored as document "
                    + made.record().id() + ", SHA-256 " + made.record().sha256() + ")");
        }
        return Main.EXIT_OK;
    }
}
