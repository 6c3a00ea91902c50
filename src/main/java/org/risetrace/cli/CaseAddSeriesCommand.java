package org.risetrace.cli;

import org.risetrace.archive.Archive;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace case add-series}: copies a series folder into a case. */
@Command(name = "add-series", mixinStandardHelpOptions = true,
        description = "Copies a series into a case: its frames exactly as exported, board.json, series.json and readings.csv.")
public final class CaseAddSeriesCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;
    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    @Parameters(index = "0", paramLabel = "<case>", description = "the case number")
    String number;
    @Parameters(index = "1", paramLabel = "<series-folder>", description = "folder of frames (with series.json and board.json)")
    Path folder;
    @Option(names = "--name", paramLabel = "<name>", description = "the series' name in the case (default: the folder's name)")
    String name;
    @Option(names = "--board", paramLabel = "<board.json>", description = "board file (default: board.json in the folder)")
    Path board;

    @Override
    public Integer call() {
        ArchiveOptions.named(spec, folder, "<series-folder>");
        ArchiveOptions.named(spec, board, "--board");
        try (Archive a = archive.open()) {
            Archive.Added added = a.addSeries(number, folder, name, board);
            PrintWriter o = spec.commandLine().getOut();
            PrintWriter err = spec.commandLine().getErr();
            for (String w : added.warnings()) err.println("risetrace: " + w);
            Archive.SeriesRecord s = added.series();
            long bytes = s.files().stream().mapToLong(Archive.StoredFile::sizeBytes).sum();
            o.println(added.alreadyPresent()
                    ? number + "/" + s.name() + ": already in the case with the same files; nothing changed"
                    : number + "/" + s.name() + ": " + s.fileCount() + " files stored (" + bytes + " bytes)");
            if (s.files().stream().noneMatch(f -> f.role().equals("board")))
                err.println("risetrace: warning: no board.json: the series cannot be analysed until it is added with --board");
            o.flush();
            err.flush();
        }
        return Main.EXIT_OK;
    }
}
