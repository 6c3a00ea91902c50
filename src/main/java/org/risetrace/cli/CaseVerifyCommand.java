package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.Verifier;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.util.concurrent.Callable;

/** {@code risetrace case verify}: re-hashes every stored file and checks the records against the custody log. */
@Command(name = "verify", mixinStandardHelpOptions = true,
        description = "Re-hashes every stored original and output, checks the records against the custody log, and "
                + "names each mismatch. Exit code " + CaseVerifyCommand.EXIT_DAMAGED + " when anything is wrong.")
public final class CaseVerifyCommand implements Callable<Integer> {
    /** The archive is damaged: at least one mismatch was named. */
    public static final int EXIT_DAMAGED = 4;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", arity = "0..1", paramLabel = "<case>", description = "only this case (default: the whole archive)")
    String number;

    @Override
    public Integer call() {
        try (Archive a = archive.open()) {
            Verifier.Report r = Verifier.verify(a, number);
            PrintWriter o = spec.commandLine().getOut();
            for (String p : r.problems()) o.println("DAMAGED: " + p);
            for (String n : r.notes()) o.println("note: " + n);
            o.println((r.clean() ? "whole: " : r.problems().size() + " problems: ") + r.filesChecked() + " stored files ("
                    + r.bytesChecked() + " bytes) re-hashed, " + r.recordsChecked() + " records checked against "
                    + r.entries() + " custody entries; custody log head " + r.chainHead());
            o.flush();
            return r.clean() ? Main.EXIT_OK : EXIT_DAMAGED;
        }
    }
}
