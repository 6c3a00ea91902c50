package org.risetrace.sim;

import org.risetrace.registration.Homography;
import com.fasterxml.jackson.annotation.JsonIgnoreProperties;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

/**
 * Ground truth of a simulated series ({@code truth.json}): what the analysis must find. The analysis never reads
 * it; tests and the demo's self-check do.
 *
 * @param scenario           scenario name
 * @param seed               the seed used
 * @param sources            the fault's sources with their power while on (power_w = total power x share)
 * @param frames             per frame: file, time, true board corners and homography
 * @param partTemperaturesC  per part (marked or not), its true body temperature per frame, degrees Celsius
 * @param partEmissivity     per part, its body emissivity
 * @param unmarked           parts on the board that are not in board.json
 * @param ambientC           room temperature at the start
 * @param reflectedC         reflected apparent temperature used by the camera model
 * @param injectionStartS    when the supply was switched on
 * @param netdK              the camera's temporal noise
 * @param waveform           step or square
 * @param periodS            square-wave period (null for step)
 * @param grid               the thermal grid
 * @param energy             energy bookkeeping of the run
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonIgnoreProperties(ignoreUnknown = false)
public record Truth(
        @JsonProperty("scenario") String scenario,
        @JsonProperty("seed") long seed,
        @JsonProperty("sources") List<Source> sources,
        @JsonProperty("frames") List<TruthFrame> frames,
        @JsonProperty("parts") Map<String, double[]> partTemperaturesC,
        @JsonProperty("part_emissivity") Map<String, Double> partEmissivity,
        @JsonProperty("unmarked") List<UnmarkedPart> unmarked,
        @JsonProperty("ambient_c") double ambientC,
        @JsonProperty("reflected_c") double reflectedC,
        @JsonProperty("injection_start_s") double injectionStartS,
        @JsonProperty("netd_k") double netdK,
        @JsonProperty("waveform") String waveform,
        @JsonProperty("period_s") Double periodS,
        @JsonProperty("grid") Grid grid,
        @JsonProperty("energy") Energy energy) {

    /** A heat source: designator of a part or name of a trace, its power while on, its share of the total. */
    public record Source(@JsonProperty("ref") String ref, @JsonProperty("power_w") double powerW,
                         @JsonProperty("share") double share) {
    }

    /**
     * One frame's truth.
     *
     * @param file            frame file name
     * @param tS              seconds from the series start
     * @param ambientC        room temperature at that time
     * @param powerW          fault power at that instant
     * @param boardCornersPx  board TL, TR, BR, BL in this frame's pixels (pixel centres at integer coordinates)
     * @param boardToFrame    3 x 3 homography, board mm to frame px
     */
    public record TruthFrame(@JsonProperty("file") String file, @JsonProperty("t_s") double tS,
                             @JsonProperty("ambient_c") double ambientC, @JsonProperty("power_w") double powerW,
                             @JsonProperty("board_corners_px") double[][] boardCornersPx,
                             @JsonProperty("board_to_frame") double[][] boardToFrame) {
        public Homography homography() { return Homography.fromRows(boardToFrame); }
    }

    /** A part left out of board.json: where it is. */
    public record UnmarkedPart(@JsonProperty("ref") String ref, @JsonProperty("kind") String kind,
                               @JsonProperty("x_mm") double xMm, @JsonProperty("y_mm") double yMm,
                               @JsonProperty("w_mm") double wMm, @JsonProperty("h_mm") double hMm) {
    }

    /** The thermal grid: cells and their size. */
    public record Grid(@JsonProperty("nx") int nx, @JsonProperty("ny") int ny, @JsonProperty("dx_mm") double dxMm,
                       @JsonProperty("dy_mm") double dyMm, @JsonProperty("time_step_s") double timeStepS) {
    }

    /** Energy over the run: injected = stored + lost for the discrete scheme. */
    public record Energy(@JsonProperty("injected_j") double injectedJ, @JsonProperty("stored_j") double storedJ,
                         @JsonProperty("lost_j") double lostJ) {
    }

    /** True temperatures of one part over the frames. */
    public double[] part(String ref) {
        double[] v = partTemperaturesC.get(ref);
        if (v == null) throw new IllegalArgumentException("no part " + ref + " in the truth");
        return v;
    }

    /** The first source's designator (the part the analysis should name). */
    public String primarySource() {
        Source best = null;
        for (Source s : sources) if (best == null || s.share() > best.share()) best = s;
        return best == null ? null : best.ref();
    }

    public static Truth read(Path file) {
        try {
            return Scenario.JSON.readValue(file.toFile(), Truth.class);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read truth file: " + e.getMessage());
        }
    }
}
