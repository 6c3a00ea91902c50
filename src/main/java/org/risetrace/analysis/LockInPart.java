package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/**
 * One part's lock-in result (object temperature: the amplitudes carry the part's emissivity correction).
 *
 * @param ref            designator
 * @param rank           1 = highest amplitude
 * @param amplitudeK     amplitude of the periodic response at the fundamental, kelvin
 * @param amplitudeSeK   its standard error (the larger of the residual's and the between-period spread's)
 * @param snr            amplitude / standard error
 * @param lagDeg         phase lag behind the excitation's fundamental, degrees (null when the amplitude is under
 *                       k standard errors: the phase of noise means nothing)
 * @param lagSeDeg       its standard error, degrees
 * @param inPhaseK       in-phase part (0 degrees), kelvin
 * @param quadratureK    quadrature part (90 degrees behind), kelvin
 * @param emissivity     emissivity used
 * @param noiseK         residual noise of the footprint mean per frame, apparent kelvin
 */
@JsonPropertyOrder({"ref", "rank", "amplitude_k", "amplitude_se_k", "snr", "lag_deg", "lag_se_deg", "in_phase_k",
        "quadrature_k", "emissivity", "noise_k"})
public record LockInPart(@JsonProperty("ref") String ref, @JsonProperty("rank") int rank,
                         @JsonProperty("amplitude_k") double amplitudeK,
                         @JsonProperty("amplitude_se_k") double amplitudeSeK,
                         @JsonProperty("snr") double snr,
                         @JsonProperty("lag_deg") Double lagDeg,
                         @JsonProperty("lag_se_deg") Double lagSeDeg,
                         @JsonProperty("in_phase_k") double inPhaseK,
                         @JsonProperty("quadrature_k") double quadratureK,
                         @JsonProperty("emissivity") double emissivity,
                         @JsonProperty("noise_k") double noiseK) {
}
