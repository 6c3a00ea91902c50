package org.risetrace.cli;

import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.registration.RegistrationConfig;
import org.risetrace.registration.RegistrationReport;
import org.risetrace.registration.SeriesRegistration;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code risetrace register}: maps every frame of a series onto the board and writes registration.json. */
@Command(name = "register", mixinStandardHelpOptions = true,
        description = "Maps every frame of a series onto the board and writes registration.json.")
public final class RegisterCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "<series-folder>", description = "folder of frames (with series.json)")
    Path folder;

    @Option(names = "--board", paramLabel = "<board.json>", description = "board file (default: board.json in the folder)")
    Path boardFile;

    @Option(names = "--out", paramLabel = "<dir>", description = "where registration.json goes (default: the folder)")
    Path out;

    @Option(names = "--force", description = "replace an earlier registration.json (and rectified/ frames) in <out>")
    boolean force;

    @Option(names = "--write-rectified", description = "also write each usable frame in board space as a 16-bit PNG "
            + "in centikelvin under <out>/rectified/")
    boolean writeRectified;

    @Option(names = "--px-per-mm", paramLabel = "X", description = "resolution of rectified frames (default: the "
            + "reference frame's own scale)")
    double pxPerMm;

    @Option(names = "--method", paramLabel = "auto|features|search", description = "how each frame's first estimate is found: auto (from the previous frame's mapping, then a coarse search over the board's position and scale, then image features), features (always from image features matched to the reference and a robust fit), search (coarse search only, for boards with few features) (default: auto)")
    String method = "auto";

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        if (pxPerMm != 0 && !(Double.isFinite(pxPerMm) && pxPerMm > 0))
            throw new picocli.CommandLine.ParameterException(spec.commandLine(),
                    "--px-per-mm must be a positive number, got " + pxPerMm);
        Series series = Series.open(folder);
        for (String w : series.warnings()) spec.commandLine().getErr().println("risetrace: warning: " + w);
        Path bf = boardFile != null ? boardFile : folder.resolve("board.json");
        Board board = BoardFile.read(bf, Materials.load().names());
        int refIndex = -1;
        for (int i = 0; i < series.size(); i++) if (series.fileName(i).equals(board.outline().frame())) refIndex = i;
        if (refIndex < 0)
            throw new InputRejected(bf, "reference frame '" + board.outline().frame() + "' (outline.frame) is not in "
                    + folder, "name one of the series' frame files");
        if (writeRectified && pxPerMm > 0) { // as analyze: a raster too coarse for any part is refused
            org.risetrace.analysis.MemoryBudget.requireResolvesParts(board, pxPerMm, bf);
            org.risetrace.analysis.MemoryBudget.boardRasterPixels(board, pxPerMm, bf);
        }
        Frame reference = series.read(refIndex);
        Path dir = out != null ? out : folder;
        // an earlier registration.json (perhaps edited, perhaps the only record of a run) is not replaced unasked
        Path earlier = dir.resolve(SeriesRegistration.FILE_NAME);
        if (Files.exists(earlier) && !force)
            throw new InputRejected(earlier, "exists already", "pass --force to replace it, or --out another folder");
        if (writeRectified && !force && Files.isDirectory(dir.resolve("rectified")))
            throw new InputRejected(dir.resolve("rectified"), "exists already",
                    "pass --force to replace its frames, or --out another folder");
        RegistrationConfig config;
        try {
            config = RegistrationConfig.defaults().withMethod(method);
        } catch (IllegalArgumentException e) {
            throw new picocli.CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
        RegistrationReport report = SeriesRegistration.run(board, reference, series.size(), series::read,
                series::fileName, series::tSeconds, config,
                writeRectified ? dir.resolve("rectified") : null, pxPerMm);
        Path file = dir.resolve(SeriesRegistration.FILE_NAME);
        SeriesRegistration.write(report, file);
        RegistrationReport.Summary s = report.summary();
        spec.commandLine().getOut().printf(Locale.ROOT, "%d frames: %d ok, %d weak, %d failed, %d marked; mean check residual %s px -> %s%n",
                s.frames(), s.ok(), s.weak(), s.failed(), s.marked(),
                s.meanRmsPx() == null ? "n/a" : String.format(Locale.ROOT, "%.3f", s.meanRmsPx()), file);
        for (RegistrationReport.Entry e : report.frames())
            if (e.reason() != null && !e.status().word().equals("marked") && !e.status().word().equals("ok"))
                spec.commandLine().getOut().println("  " + e.file() + ": " + e.status().word() + ": " + e.reason());
        return Main.EXIT_OK;
    }
}
