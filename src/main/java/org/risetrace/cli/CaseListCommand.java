package org.risetrace.cli;

import org.risetrace.archive.Archive;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.PrintWriter;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code risetrace case list}: the cases, newest first, filtered by status, opening date and text. */
@Command(name = "list", mixinStandardHelpOptions = true, description = "Lists cases, newest first.")
public class CaseListCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Option(names = "--status", paramLabel = "open|closed", description = "only cases with this status")
    String status;
    @Option(names = "--from", paramLabel = "<YYYY-MM-DD>", description = "opened on or after this day (UTC)")
    String from;
    @Option(names = "--to", paramLabel = "<YYYY-MM-DD>", description = "opened on or before this day (UTC)")
    String to;
    @Option(names = "--text", paramLabel = "<text>", description = "case number, customer reference, device, serial, "
            + "fault, technician, series notes or a part named by a verdict containing this text")
    String text;
    @Option(names = "--limit", paramLabel = "N", description = "at most N cases (default: ${DEFAULT-VALUE})")
    int limit = 1000;

    String text() {
        return text;
    }

    @Override
    public Integer call() {
        if (status != null && !Archive.STATUSES.contains(status))
            throw new CommandLine.ParameterException(spec.commandLine(), "--status must be one of " + Archive.STATUSES);
        if (limit < 1) throw new CommandLine.ParameterException(spec.commandLine(), "--limit must be at least 1");
        Archive.CaseQuery q = new Archive.CaseQuery(status, day(from, "--from"), day(to, "--to"), text(), limit);
        try (Archive a = archive.open()) {
            print(spec.commandLine().getOut(), a.listCases(q));
        }
        return Main.EXIT_OK;
    }

    /** A day typed as YYYY-MM-DD; anything else is an option out of range (exit 2), as --status is. */
    private java.time.LocalDate day(String value, String option) {
        if (value == null) return null;
        try {
            return Archive.date(value, option);
        } catch (org.risetrace.archive.ArchiveException e) {
            throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
    }

    static void print(PrintWriter o, List<Archive.CaseRecord> cases) {
        if (cases.isEmpty()) {
            o.println("no cases");
            return;
        }
        o.printf("%-14s %-10s %-7s %-28s %s%n", "case", "opened", "status", "device", "customer");
        for (Archive.CaseRecord r : cases)
            o.printf("%-14s %-10s %-7s %-28s %s%n", r.caseNumber(), r.openedAt().substring(0, 10), r.status(),
                    cut(r.device(), 28), r.customerRef() == null ? "" : r.customerRef());
        o.flush();
    }

    static String cut(String s, int n) {
        if (s == null) return "";
        return s.length() <= n ? s : s.substring(0, n - 1) + "~";
    }
}
