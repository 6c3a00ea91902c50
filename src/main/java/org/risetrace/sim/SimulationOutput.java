package org.risetrace.sim;

import org.risetrace.board.Board;
import org.risetrace.io.Sidecar;

import java.nio.file.Path;
import java.util.List;

/**
 * What {@link Simulator#run} wrote.
 *
 * @param directory  the output folder
 * @param frameFiles the frame files in time order
 * @param board      the board file's content (board.json)
 * @param sidecar    the sidecar's content (series.json)
 * @param truth      the ground truth (truth.json)
 */
public record SimulationOutput(Path directory, List<Path> frameFiles, Board board, Sidecar sidecar, Truth truth) {
    public Path boardFile() { return directory.resolve("board.json"); }
    public Path sidecarFile() { return directory.resolve("series.json"); }
    public Path truthFile() { return directory.resolve("truth.json"); }
}
