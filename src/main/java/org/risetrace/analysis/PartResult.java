package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;

import java.util.List;

/**
 * One marked part's numbers. Doubles are null where they could not be measured (e.g. no onset).
 *
 * @param ref            designator
 * @param rank           1 = fastest initial rate
 * @param rateKPerS      initial rise rate, weighted least squares over the early window
 * @param rateSe         its standard error
 * @param riseK          rise above ambient at the end of the series (mean of the last frames)
 * @param onsetS         first time the rise exceeded k * noise
 * @param tauS           time constant of the fitted rise model; with two constants the slow one (the board's)
 * @param tauSe          its standard error
 * @param dtInfK         final rise of the fitted model (with two constants the sum of both amplitudes)
 * @param dtInfSe        its standard error
 * @param fitRmsK        residual RMS of the fitted model
 * @param noiseK         the part's measured noise sigma
 * @param validFraction  mean fraction of the footprint that fell inside the frames
 * @param emissivity     emissivity used for this part
 * @param warnings       plain-words warnings (low emissivity, partly outside the frame, ...)
 * @param fit            the fitted rise model in full: one or two time constants, every parameter with its error,
 *                       the F-test that chose it (null: no fit)
 */
public record PartResult(
        @JsonProperty("ref") String ref,
        @JsonProperty("rank") int rank,
        @JsonProperty("rate_k_per_s") Double rateKPerS,
        @JsonProperty("rate_se") Double rateSe,
        @JsonProperty("rise_k") Double riseK,
        @JsonProperty("onset_s") Double onsetS,
        @JsonProperty("tau_s") Double tauS,
        @JsonProperty("tau_se") Double tauSe,
        @JsonProperty("dt_inf_k") Double dtInfK,
        @JsonProperty("dt_inf_se") Double dtInfSe,
        @JsonProperty("fit_rms_k") Double fitRmsK,
        @JsonProperty("noise_k") Double noiseK,
        @JsonProperty("valid_fraction") Double validFraction,
        @JsonProperty("emissivity") Double emissivity,
        @JsonProperty("warnings") List<String> warnings,
        @JsonProperty("fit") RiseModelFit fit) {

    /** Without the full fit record (the form of earlier versions). */
    public PartResult(String ref, int rank, Double rateKPerS, Double rateSe, Double riseK, Double onsetS, Double tauS,
                      Double tauSe, Double dtInfK, Double dtInfSe, Double fitRmsK, Double noiseK, Double validFraction,
                      Double emissivity, List<String> warnings) {
        this(ref, rank, rateKPerS, rateSe, riseK, onsetS, tauS, tauSe, dtInfK, dtInfSe, fitRmsK, noiseK, validFraction,
                emissivity, warnings, null);
    }
}
