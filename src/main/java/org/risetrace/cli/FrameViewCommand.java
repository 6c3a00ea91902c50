package org.risetrace.cli;

import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.report.FrameView;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code risetrace frame-view}: one frame as a false-colour PNG with a pixel grid, to read corners off. */
@Command(name = "frame-view", mixinStandardHelpOptions = true,
        description = "Writes a frame as a false-colour PNG with a pixel grid, coordinates and a colour scale in "
                + "degrees Celsius, so the board's corners can be read off for board.json.")
public final class FrameViewCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "<frame>", description = "the frame file (a series.json beside it gives the profile)")
    Path frame;

    @Option(names = "--out", required = true, paramLabel = "<file.png>", description = "the PNG to write")
    Path out;

    @Option(names = "--force", description = "write over an existing file of that name (never over the frame itself)")
    boolean force;

    @Option(names = "--grid", paramLabel = "N", description = "a grid line and coordinate every N frame pixels (default: ${DEFAULT-VALUE})")
    int gridPx = 10;

    @Option(names = "--scale", paramLabel = "S", description = "screen pixels per frame pixel, odd, 1 to 15 (default: about 960 pixels across)")
    Integer scale;

    @Option(names = "--profile", paramLabel = "<name|file>", description = "calibration profile (overrides series.json)")
    String profile;

    @Override
    public Integer call() {
        if (gridPx < 2) throw new CommandLine.ParameterException(spec.commandLine(), "--grid must be at least 2");
        if (scale != null && (scale < 1 || scale > 15 || scale % 2 == 0))
            throw new CommandLine.ParameterException(spec.commandLine(), "--scale must be odd, 1 to 15");
        if (!Files.isRegularFile(frame)) throw new InputRejected(frame, "frame file not found");
        checkTarget(frame, out, force);
        Path sidecar = frame.toAbsolutePath().getParent().resolve("series.json");
        Series s = Series.open(List.of(frame), Files.isRegularFile(sidecar) ? sidecar : null, profile);
        Frame f = s.read(0);
        int sc = scale != null ? scale : FrameView.defaultScale(f.width());
        double[] range = FrameView.range(f);
        String title = String.format(Locale.ROOT, "%s, %d x %d px, grid every %d px through pixel centres "
                + "(centres at whole numbers), %.2f to %.2f \u00b0C", frame.getFileName(), f.width(), f.height(),
                gridPx, range[0], range[1]);
        try {
            FrameView.writePng(FrameView.render(f, sc, gridPx, title), out);
        } catch (java.io.UncheckedIOException e) {
            throw new InputRejected(out, "cannot write the PNG: " + e.getCause().getMessage());
        }
        spec.commandLine().getOut().println(String.format(Locale.ROOT, "%s: %d x %d px at %d screen px per pixel, "
                + "grid every %d px, %.2f to %.2f \u00b0C", out, f.width(), f.height(), sc, gridPx, range[0], range[1]));
        spec.commandLine().getOut().flush();
        return Main.EXIT_OK;
    }

    /**
     * The PNG may not replace what the user has: a folder, the frame it is drawn from (a radiometric original would
     * be lost to a false-colour picture), or without --force any other existing file (common practice: a tool
     * never writes over a file it was not asked to replace).
     */
    static void checkTarget(Path frame, Path out, boolean force) {
        if (Files.isDirectory(out)) throw new InputRejected(out, "is a folder", "name a .png file to write");
        if (!Files.exists(out)) return;
        try {
            if (Files.isSameFile(frame, out))
                throw new InputRejected(out, "is the frame being drawn", "name another file; the frame stays as it is");
        } catch (java.io.IOException e) {
            throw new InputRejected(out, "cannot be checked: " + e.getMessage());
        }
        if (!force) throw new InputRejected(out, "exists already", "name a new file, or pass --force to replace it");
    }
}
