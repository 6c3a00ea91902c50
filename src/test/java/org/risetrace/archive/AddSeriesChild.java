package org.risetrace.archive;

import java.nio.file.Path;
import java.util.Map;

/**
 * A bench in a child JVM (for the concurrency and crash tests): opens the archive (SQLite when the first argument
 * is "sqlite", else that PostgreSQL address, the user from the environment), prints "open", then adds each named
 * series folder to the case, printing each name when it is in.
 * Arguments: db-or-sqlite archive-folder case folder...
 */
public final class AddSeriesChild {
    private AddSeriesChild() { }

    public static void main(String[] args) {
        String db = args[0].equals("sqlite") ? null : args[0];
        ArchiveSettings s = ArchiveSettings.resolve(Path.of(args[1]), db, null, System.getenv());
        try (Archive a = Archive.open(s, "child-" + ProcessHandle.current().pid())) {
            System.out.println("open");
            System.out.flush();
            for (int i = 3; i < args.length; i++) {
                Path folder = Path.of(args[i]);
                a.addSeries(args[2], folder, null, null);
                System.out.println("in " + folder.getFileName());
                System.out.flush();
            }
        }
        Map.of(); // nothing else
    }
}
