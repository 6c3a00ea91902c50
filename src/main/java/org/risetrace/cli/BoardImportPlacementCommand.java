package org.risetrace.cli;

import org.risetrace.board.BoardFile;
import org.risetrace.board.PlacementImport;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;

/** {@code risetrace board import-placement}: a board.json parts list from a placement (centroid) CSV. */
@Command(name = "import-placement", mixinStandardHelpOptions = true,
        description = "Builds board.json's parts list from a placement (centroid) CSV; the outline is left to mark.")
public final class BoardImportPlacementCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "<csv>")
    Path csv;

    @Option(names = "--designator-col", paramLabel = "NAME", description = "default: Designator, Ref, RefDes, Reference")
    String designatorCol;
    @Option(names = "--x-col", paramLabel = "NAME", description = "default: X, Mid X, PosX, Center X")
    String xCol;
    @Option(names = "--y-col", paramLabel = "NAME", description = "default: Y, Mid Y, PosY, Center Y")
    String yCol;
    @Option(names = "--rotation-col", paramLabel = "NAME", description = "default: Rotation, Rot, Angle")
    String rotationCol;
    @Option(names = "--side-col", paramLabel = "NAME", description = "default: Side, Layer")
    String sideCol;
    @Option(names = "--units", paramLabel = "mm|mil", description = "unit of values without a suffix (default: mm)")
    String units = "mm";
    @Option(names = "--origin", paramLabel = "X,Y", split = ",", arity = "1",
            description = "placement coordinates of the board's top-left corner (default: 0,<height> with y up)")
    double[] origin;
    @Option(names = "--y-up", description = "placement y grows upwards (default)")
    boolean yUp;
    @Option(names = "--y-down", description = "placement y grows downwards")
    boolean yDown;
    @Option(names = "--side", paramLabel = "top|bottom|all", description = "parts to keep (default: top)")
    String side = "top";
    @Option(names = "--footprint", paramLabel = "PREFIX=WxH",
            description = "part size in mm by designator prefix, e.g. C=1.6x0.8 U=5x5 (repeatable)")
    List<String> footprints = List.of();
    @Option(names = "--size-mm", paramLabel = "W,H", split = ",", description = "board size in mm")
    double[] sizeMm;
    @Option(names = "--name", description = "board name (default: the CSV file's name)")
    String name;
    @Option(names = "--out", paramLabel = "<board.json>", description = "default: board.json beside the CSV")
    Path out;
    @Option(names = "--force", description = "replace an existing output file")
    boolean force;

    @Override
    public Integer call() {
        if (yUp && yDown) throw new CommandLine.ParameterException(spec.commandLine(), "--y-up and --y-down exclude each other");
        if (origin != null && origin.length != 2)
            throw new CommandLine.ParameterException(spec.commandLine(), "--origin takes X,Y");
        if (sizeMm != null && sizeMm.length != 2)
            throw new CommandLine.ParameterException(spec.commandLine(), "--size-mm takes W,H");
        Map<String, double[]> fp = new LinkedHashMap<>();
        for (String f : footprints) {
            try {
                Map.Entry<String, double[]> e = PlacementImport.parseFootprint(f);
                fp.put(e.getKey(), e.getValue());
            } catch (IllegalArgumentException e) {
                throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
            }
        }
        PlacementImport.Options o = new PlacementImport.Options(designatorCol, xCol, yCol, rotationCol, sideCol, units,
                origin == null ? null : origin[0], origin == null ? null : origin[1], !yDown, side, fp, sizeMm, name);
        PlacementImport.Result r = PlacementImport.read(csv, o);
        Path target = out != null ? out : csv.toAbsolutePath().resolveSibling("board.json");
        if (Files.exists(target) && !force)
            throw new org.risetrace.frame.InputRejected(target, "exists already", "use --force to replace it or --out");
        BoardFile.write(r.board(), target);
        for (String n : r.notes()) spec.commandLine().getErr().println("risetrace: note: " + n);
        spec.commandLine().getOut().println(r.board().partsOrEmpty().size() + " parts -> " + target);
        return Main.EXIT_OK;
    }
}
