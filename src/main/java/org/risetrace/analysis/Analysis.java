package org.risetrace.analysis;

import org.risetrace.board.Board;
import org.risetrace.registration.BoardRaster;

import java.util.List;

/**
 * Everything a report needs: the analysis.json document plus the curves and maps behind it.
 *
 * @param result     the analysis.json document
 * @param board      the board file used
 * @param curves     rise curves of every part, in rank order
 * @param riseMap    rise map (last frames minus baseline, smoothed), kelvin of object temperature
 * @param onsetMap   per board pixel, seconds from injection start when its rise first exceeded the threshold; null
 *                   for a two-frame comparison (one frame after heating gives every risen pixel the same onset)
 * @param lastFrame  the last usable frame rectified into board space (absolute degrees Celsius)
 */
public record Analysis(AnalysisResult result, Board board, List<RiseCurve> curves,
                       BoardMap riseMap, BoardMap onsetMap, BoardRaster lastFrame) {

    /** This analysis with other frame records in the result. */
    public Analysis withFrames(List<FrameRecord> records) {
        return new Analysis(result.withFrames(records), board, curves, riseMap, onsetMap, lastFrame);
    }

    /** This analysis with another result (the same maps and curves). */
    public Analysis withResult(AnalysisResult other) {
        return new Analysis(other, board, curves, riseMap, onsetMap, lastFrame);
    }

    /** This analysis with its series folder's bench readings in the result (null: none). */
    public Analysis withBenchReadings(org.risetrace.planning.BenchReadings readings) {
        return new Analysis(result.withBenchReadings(readings), board, curves, riseMap, onsetMap, lastFrame);
    }
}
