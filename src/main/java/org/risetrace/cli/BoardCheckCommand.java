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
        Board b = BoardFile.read(file, Materials.load().names());
        spec.commandLine().getOut().printf(java.util.Locale.ROOT, "%s: %s, %.1f x %.1f mm, %d parts, %d ambient areas, reference %s%n",
                file, b.name(), b.widthMm(), b.heightMm(), b.partsOrEmpty().size(), b.ambientOrEmpty().size(),
                b.outline().frame());
        return Main.EXIT_OK;
    }
}
