package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.CustomerReport;
import org.risetrace.archive.Shop;
import org.risetrace.frame.InputRejected;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
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
        ArchiveOptions.named(spec, out, "--out");
        ArchiveOptions.named(spec, shop, "--shop");
        Path target = out != null ? out : Path.of("customer-report-" + number + ".html");
        checkTarget(target);
        try (Archive a = archive.open()) {
            Shop s = Shop.load(shop, a.settings().folder(), System.getenv());
            String html = CustomerReport.render(a, number, s, p);
            // the file first, then the archive: a report that could not be written is neither stored nor logged (it
            // would travel in bags as one the customer had)
            write(target, html);
            Archive.OutputRecord stored;
            try {
                stored = CustomerReport.store(a, number, html);
            } catch (RuntimeException e) {
                try {
                    Files.deleteIfExists(target); // nor is a report handed out that the archive does not keep
                } catch (IOException suppressed) {
                    e.addSuppressed(suppressed);
                }
                throw e;
            }
            spec.commandLine().getOut().println(number + ": customer report " + target + " (stored as document "
                    + stored.id() + ", SHA-256 " + stored.sha256() + ")");
        }
        return Main.EXIT_OK;
    }

    /**
     * Refuses, before the archive is opened, a report file that could not be written: one that exists (never
     * overwritten), one whose folder is missing or not a folder, one in a folder the user may not write to.
     */
    static void checkTarget(Path target) {
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS))
            throw new InputRejected(target, "exists already", "name another file with --out");
        Path folder = target.toAbsolutePath().getParent();
        if (folder == null || !Files.isDirectory(folder))
            throw new InputRejected(target, "cannot write the report: there is no folder " + folder,
                    "name a file in an existing folder with --out");
        if (!Files.isWritable(folder))
            throw new InputRejected(target, "cannot write the report: no permission to write in " + folder,
                    "name a file in a folder of yours with --out");
    }

    /** Writes a new file; a failure halfway removes what was written. */
    private static void write(Path target, String html) {
        boolean created = false;
        try (OutputStream o = Files.newOutputStream(target, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE)) {
            created = true;
            o.write(html.getBytes(StandardCharsets.UTF_8));
        } catch (FileAlreadyExistsException e) {
            throw new InputRejected(target, "exists already", "name another file with --out");
        } catch (IOException e) {
            if (created) {
                try {
                    Files.deleteIfExists(target);
                } catch (IOException suppressed) {
                    e.addSuppressed(suppressed);
                }
            }
            throw new InputRejected(target, "cannot write the report: " + e.getClass().getSimpleName()
                    + (e.getMessage() == null ? "" : " " + e.getMessage()), null, e);
        }
    }
}
