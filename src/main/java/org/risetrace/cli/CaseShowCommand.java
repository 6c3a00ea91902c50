package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.Custody;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.util.concurrent.Callable;

/** {@code risetrace case show}: one case with its series, verdicts, documents and custody log. */
@Command(name = "show", mixinStandardHelpOptions = true, description = "Shows a case: its series, verdicts, reports and custody log.")
public final class CaseShowCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<case>", description = "the case number")
    String number;

    @Option(names = "--files", description = "also list every stored file with its SHA-256")
    boolean files;

    @Override
    public Integer call() {
        try (Archive a = archive.open()) {
            Archive.CaseDetail d = a.show(number);
            PrintWriter o = spec.commandLine().getOut();
            Archive.CaseRecord r = d.record();
            o.println("case " + r.caseNumber() + " (" + r.status() + ")");
            line(o, "opened", r.openedAt());
            line(o, "closed", r.closedAt());
            line(o, "customer", r.customerRef());
            line(o, "device", r.device());
            line(o, "serial", r.serialNumber());
            line(o, "fault", r.fault());
            line(o, "technician", r.technician());
            o.println();
            o.println("series (" + d.series().size() + ")");
            for (Archive.SeriesRecord s : d.series()) {
                long frames = s.files().stream().filter(f -> f.role().equals("frame")).count();
                o.println("  " + s.name() + ": " + frames + " frames, " + (s.fileCount() - frames)
                        + " other files, added " + s.addedAt() + " by " + s.addedBy());
                if (s.notes() != null) o.println("    notes: " + s.notes());
                if (files)
                    for (Archive.StoredFile f : s.files())
                        o.println("    " + f.sha256() + "  " + f.fileName() + " (" + f.role() + ", " + f.sizeBytes() + " bytes)");
            }
            o.println();
            o.println("analyses (" + d.analyses().size() + ")");
            for (Archive.AnalysisRecord an : d.analyses()) {
                o.println("  " + an.id() + ": series " + an.seriesName() + ", " + an.mode() + ", " + an.analysedAt()
                        + " by " + an.analysedBy() + " (risetrace " + an.toolVersion() + ")");
                o.println("    " + (an.verdictStatus() == null ? "no verdict" : an.verdictStatus()) + ": " + an.headline());
                if (files)
                    for (Archive.OutputRecord out : an.outputs())
                        o.println("    " + out.sha256() + "  " + out.name() + " (" + out.sizeBytes() + " bytes)");
            }
            if (!d.documents().isEmpty()) {
                o.println();
                o.println("documents (" + d.documents().size() + ")");
                for (Archive.OutputRecord out : d.documents())
                    o.println("  " + out.id() + ": " + out.kind() + " " + out.name() + ", " + out.madeAt()
                            + (files ? "  " + out.sha256() : ""));
            }
            o.println();
            o.println("custody log (" + d.custody().size() + " entries)");
            for (Custody.Entry e : d.custody())
                o.println("  " + e.seq() + "  " + e.loggedAt() + "  " + e.who() + "  " + e.action() + "  "
                        + (e.subject() == null ? "" : e.subject()) + (e.detail() == null ? "" : "  " + e.detail()));
            o.flush();
        }
        return Main.EXIT_OK;
    }

    private static void line(PrintWriter o, String label, String value) {
        if (value != null) o.printf("  %-11s %s%n", label + ":", value);
    }
}
