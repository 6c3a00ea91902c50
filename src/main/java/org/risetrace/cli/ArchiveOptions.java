package org.risetrace.cli;

import org.risetrace.archive.Archive;
import org.risetrace.archive.ArchiveSettings;
import picocli.CommandLine;
import picocli.CommandLine.Option;

import java.nio.file.Path;

/** Where the archive is and who is working: shared by every {@code risetrace case} subcommand. */
public final class ArchiveOptions {
    @Option(names = "--archive", paramLabel = "<folder>",
            description = "archive folder (default: $" + ArchiveSettings.ENV_ARCHIVE + ", else $XDG_DATA_HOME/risetrace/archive)")
    Path folder;

    @Option(names = "--archive-db", paramLabel = "<jdbc:postgresql://host/db>",
            description = "a shared PostgreSQL index for several benches (default: $" + ArchiveSettings.ENV_DB
                    + ", else SQLite in the archive folder); the user and password come from $"
                    + ArchiveSettings.ENV_DB_USER + " and $" + ArchiveSettings.ENV_DB_PASSWORD + " or "
                    + ArchiveSettings.DB_CONFIG_FILE)
    String db;

    @Option(names = "--archive-db-config", paramLabel = "<file>",
            description = "properties file with user= and password= for --archive-db (default: $XDG_CONFIG_HOME/risetrace/"
                    + ArchiveSettings.DB_CONFIG_FILE + ")")
    Path dbConfig;

    @Option(names = "--by", paramLabel = "<name>",
            description = "who does this, for the custody log (default: $RISETRACE_TECHNICIAN, else the login name)")
    String by;

    /** The command this is mixed into, for usage errors. */
    @CommandLine.Spec(CommandLine.Spec.Target.MIXEE)
    CommandLine.Model.CommandSpec mixee;

    /** Opens the archive that exists; refuses "no archive at ..." (exit 1) and creates nothing. */
    Archive open() {
        return Archive.openExisting(settings(), who());
    }

    /** Opens the archive, creating it in a new or empty folder: for {@code case create} and {@code case import} only. */
    Archive openOrCreate() {
        return Archive.open(settings(), who());
    }

    private ArchiveSettings settings() {
        // --archive '' would be the working folder: a usage error (exit 2), not an archive made there
        if (folder != null && folder.toString().isBlank())
            throw new CommandLine.ParameterException(mixee.commandLine(), "--archive names no folder (an empty value)");
        return ArchiveSettings.resolve(folder, db, dbConfig, System.getenv());
    }

    /** Refuses an empty path argument ({@code ''}) as a usage error: it would name the working folder. */
    static Path named(CommandLine.Model.CommandSpec spec, Path p, String what) {
        if (p != null && p.toString().isBlank())
            throw new CommandLine.ParameterException(spec.commandLine(), what + " names no file or folder (an empty value)");
        return p;
    }

    String who() {
        if (by != null && !by.isBlank()) return by.strip();
        String env = System.getenv("RISETRACE_TECHNICIAN");
        if (env != null && !env.isBlank()) return env.strip();
        return System.getProperty("user.name", "unknown");
    }
}
