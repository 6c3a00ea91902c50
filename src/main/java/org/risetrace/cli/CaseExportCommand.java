package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.BagExport;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;

import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace case export}: a case as a BagIt bag, a folder or a .zip. */
@Command(name = "export", mixinStandardHelpOptions = true,
        description = "Writes a case as a BagIt bag (RFC 8493): a folder, or a zip file when the name ends in .zip.")
public final class CaseExportCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<case>", description = "the case number")
    String number;
    @Parameters(index = "1", paramLabel = "<bag>", description = "the new bag: a folder, or NAME.zip")
    Path target;

    @Override
    public Integer call() {
        ArchiveOptions.named(spec, target, "<bag>"); // '' is the working folder: "exists already" said nothing useful
        try (Archive a = archive.open()) {
            BagExport.Result r = BagExport.export(a, number, target, "risetrace " + VersionProvider.version());
            spec.commandLine().getOut().println(number + ": bag " + r.target() + " (" + r.payloadFiles() + " payload files, "
                    + r.payloadBytes() + " bytes; manifest SHA-256 " + r.manifestSha256() + ")");
        }
        return Main.EXIT_OK;
    }
}
