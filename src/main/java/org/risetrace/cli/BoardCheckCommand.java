package org.risetrace.cli;

import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;

import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code risetrace board check}: validates a board file and prints what it holds. */
@Command(name = "check", mixinStandardHelpOptions = true, description = "Validates a board file.")
public final class BoardCheckCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "<board.json>")
    Path file;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        // a board straight from placement import has no outline yet: valid as far as it goes, with a warning
        // saying what is missing (analyze and register still refuse it)
        Board b = BoardFile.readWithoutOutline(file, Materials.load().names());
        spec.commandLine().getOut().printf(java.util.Locale.ROOT, "%s: %s, %.1f x %.1f mm, %d parts, %d ambient areas, reference %s%n",
                file, b.name(), b.widthMm(), b.heightMm(), b.partsOrEmpty().size(), b.ambientOrEmpty().size(),
                b.outline() == null ? "none (no outline yet)" : b.outline().frame());
        if (b.outline() == null)
            spec.commandLine().getErr().println("risetrace: warning: " + file + " has no outline yet: add \"outline\" with the reference"
                    + " frame's name and the four board corners in its pixels (risetrace frame-view writes the frame"
                    + " with a pixel grid to read them off) before analyze or register");
        return Main.EXIT_OK;
    }
}
