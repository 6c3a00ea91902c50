package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.BagImport;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace case import}: a case from a bag, checked whole first. */
@Command(name = "import", mixinStandardHelpOptions = true,
        description = "Reads a case from a bag made by 'case export' (a folder or a .zip); every checksum is verified "
                + "and the bag is refused whole on any error.")
public final class CaseImportCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<bag>", description = "the bag folder or zip file")
    Path bag;
    @Option(names = "--max-files", paramLabel = "N", description = "refuse a bag of more files (default: ${DEFAULT-VALUE})")
    int maxFiles = BagImport.Limits.defaults().maxEntries();
    @Option(names = "--max-bytes", paramLabel = "N", description = "refuse a bag that unpacks to more bytes (default: ${DEFAULT-VALUE})")
    long maxBytes = BagImport.Limits.defaults().maxTotalBytes();

    @Override
    public Integer call() {
        if (maxFiles < 1 || maxBytes < 1)
            throw new CommandLine.ParameterException(spec.commandLine(), "--max-files and --max-bytes must be positive");
        ArchiveOptions.named(spec, bag, "<bag>");
        // a missing bag is said before a new archive is created for it
        if (!java.nio.file.Files.exists(bag, java.nio.file.LinkOption.NOFOLLOW_LINKS))
            throw new org.risetrace.frame.InputRejected(bag, "bag not found", "name the bag folder or .zip file");
        try (Archive a = archive.openOrCreate()) {
            BagImport.Result r = BagImport.importBag(a, bag, new BagImport.Limits(maxFiles, maxBytes));
            spec.commandLine().getOut().println(r.caseNumber() + ": imported from " + bag + " (" + r.series() + " series, "
                    + r.analyses() + " analyses, " + r.files() + " files, " + r.bytes() + " bytes)");
        }
        return Main.EXIT_OK;
    }
}
