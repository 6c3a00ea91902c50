package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

import java.util.List;

/**
 * The lock-in section of analysis.json ("lock_in"; README, "Lock-in analysis").
 *
 * @param excitation            the injection's timing and where it came from
 * @param windowStartS          start of the whole periods analysed, series seconds
 * @param windowEndS            their end
 * @param periods               whole periods analysed
 * @param framesUsed            frames inside them that mapped onto the board
 * @param detrend               how the slow trend was removed
 * @param noise                 how the noise was measured
 * @param sensitivityK          smallest amplitude detectable at 3 sigma in one board pixel (median over the board),
 *                              apparent kelvin
 * @param bestPartSensitivityK  the same for a part's footprint mean (median over the parts), object kelvin
 * @param periodsToHalve        total periods that would halve the sensitivity (4 x periods: noise falls as 1/sqrt)
 * @param verdict               the lock-in verdict
 * @param steadyVerdict         the steady analysis' verdict on the same frames, for comparison
 * @param parts                 per part, by amplitude
 * @param hotspots              maxima of the smoothed amplitude map, strongest first (rise_k = amplitude)
 */
@JsonPropertyOrder({"excitation", "window_start_s", "window_end_s", "periods", "frames_used", "detrend", "noise",
        "sensitivity_k", "part_sensitivity_k", "periods_to_halve_sensitivity", "verdict", "steady_verdict", "parts",
        "hotspots"})
public record LockInResult(@JsonProperty("excitation") Excitation excitation,
                           @JsonProperty("window_start_s") double windowStartS,
                           @JsonProperty("window_end_s") double windowEndS,
                           @JsonProperty("periods") int periods,
                           @JsonProperty("frames_used") int framesUsed,
                           @JsonProperty("detrend") String detrend,
                           @JsonProperty("noise") String noise,
                           @JsonProperty("sensitivity_k") Double sensitivityK,
                           @JsonProperty("part_sensitivity_k") Double bestPartSensitivityK,
                           @JsonProperty("periods_to_halve_sensitivity") int periodsToHalve,
                           @JsonProperty("verdict") Verdict verdict,
                           @JsonProperty("steady_verdict") Verdict steadyVerdict,
                           @JsonProperty("parts") List<LockInPart> parts,
                           @JsonProperty("hotspots") List<Hotspot> hotspots) {
}
