package org.risetrace.cli;

import org.risetrace.web.WorkbenchServer;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.IOException;
import java.io.PrintWriter;
import java.net.InetAddress;
import java.net.UnknownHostException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

/** {@code risetrace serve}: the local web workbench. */
@Command(name = "serve", mixinStandardHelpOptions = true,
        description = "Starts the web workbench: open a series, mark the board and its parts, analyse, read the verdict.")
public final class ServeCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--port", paramLabel = "N", description = "port to listen on (default: ${DEFAULT-VALUE}; 0: any free port)")
    int port = 8750;

    @Option(names = "--bind", paramLabel = "ADDR", description = "address to listen on (default: ${DEFAULT-VALUE}, this machine only); "
            + "any other address prints an access token the page asks for")
    String bind = "127.0.0.1";

    @Option(names = "--root", paramLabel = "DIR", description = "folder series are read from and board files written to; "
            + "repeatable (default: the working directory)")
    List<Path> roots;

    @Option(names = "--max-upload-mb", paramLabel = "MB", description = "largest uploaded frame file, MB (default: ${DEFAULT-VALUE})")
    int maxUploadMb = (int) (WorkbenchServer.DEFAULT_MAX_UPLOAD_BYTES >> 20);

    @CommandLine.Mixin
    ArchiveOptions archive = new ArchiveOptions();

    /**
     * The archive the archive tab shows: the one named by --archive/--archive-db or the environment, else the
     * default folder when an archive already exists there; null (no archive tab) otherwise.
     */
    org.risetrace.archive.ArchiveSettings archiveSettings() {
        java.util.Map<String, String> env = System.getenv();
        boolean named = archive.folder != null || archive.db != null
                || env.get(org.risetrace.archive.ArchiveSettings.ENV_ARCHIVE) != null
                || env.get(org.risetrace.archive.ArchiveSettings.ENV_DB) != null;
        org.risetrace.archive.ArchiveSettings s = org.risetrace.archive.ArchiveSettings.resolve(archive.folder,
                archive.db, archive.dbConfig, env);
        if (named) return s;
        return Files.isRegularFile(s.folder().resolve(org.risetrace.archive.Archive.MARKER_FILE)) ? s : null;
    }

    @Override
    public Integer call() throws IOException, InterruptedException {
        CommandLine cl = spec.commandLine();
        if (port < 0 || port > 65535) throw new CommandLine.ParameterException(cl, "--port must be 0 to 65535");
        if (maxUploadMb < 1 || maxUploadMb > 4096) throw new CommandLine.ParameterException(cl, "--max-upload-mb must be 1 to 4096");
        InetAddress address;
        try {
            address = InetAddress.getByName(bind);
        } catch (UnknownHostException e) {
            throw new CommandLine.ParameterException(cl, "--bind: unknown address '" + bind + "'");
        }
        List<Path> folders = roots == null || roots.isEmpty() ? List.of(Path.of("")) : roots;
        for (Path f : folders)
            if (!Files.isDirectory(f)) throw new CommandLine.ParameterException(cl, "--root " + f + ": not a folder");
        WorkbenchServer server;
        try {
            org.risetrace.archive.ArchiveSettings archived = archiveSettings();
            if (archived != null) { // opened once here: a wrong address or folder is said at start, not on the page
                try (org.risetrace.archive.Archive a = org.risetrace.archive.Archive.open(archived, archive.who())) {
                    a.settings();
                }
            }
            server = WorkbenchServer.start(new WorkbenchServer.Config(address, port, folders.stream()
                    .map(p -> p.toAbsolutePath()).toList(), (long) maxUploadMb << 20, archived, archive.who()));
        } catch (java.net.BindException e) {
            throw new CommandLine.ParameterException(cl, "cannot listen on " + bind + ":" + port + " (" + e.getMessage()
                    + "); try another --port");
        }
        PrintWriter out = cl.getOut();
        out.println("risetrace workbench: " + server.url());
        for (int i = 0; i < server.roots().size(); i++) out.println("root " + i + ": " + server.roots().get(i));
        out.println(server.config().archive() == null ? "no archive (start with --archive DIR for the archive tab)"
                : "archive: " + server.config().archive().folder() + (server.config().archive().dbUrl() == null
                ? " (SQLite index)" : " (index " + server.config().archive().dbUrl() + ")"));
        if (server.accessToken() != null) {
            out.println("listening beyond this machine; the page asks for this access token (shown once):");
            out.println("  " + server.accessToken());
        }
        out.println("stop with Ctrl+C");
        out.flush();
        CountDownLatch stop = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            server.close();
            stop.countDown();
        }));
        stop.await();
        return Main.EXIT_OK;
    }
}
