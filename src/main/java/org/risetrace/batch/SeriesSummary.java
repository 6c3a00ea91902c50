package org.risetrace.batch;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

import java.util.List;

/**
 * One row of summary.csv / summary.json: a series and its verdict, or the error that stopped it.
 *
 * @param series          folder relative to the batch root, '/'-separated
 * @param frames          frame files in the series (null when it could not be opened)
 * @param durationS       last frame's time minus the first's
 * @param mode            "steady", "lock-in" or "compare" (two frames; null when it failed before the analysis)
 * @param status          the verdict's status word, or "failed"
 * @param designator      the leading part's reference designator
 * @param rateKPerS       the verdict's rate (steady: the leader's initial rise rate; lock-in: as in analysis.json)
 * @param separationSigma the verdict's separation from the runner-up in combined standard errors
 * @param warnings        the series' import warnings and frames left out
 * @param error           one line: why the series failed (null when it did not)
 * @param report          report.html relative to the batch output folder (null when it failed)
 */
@JsonPropertyOrder({"series", "frames", "duration_s", "mode", "status", "designator", "rate_k_per_s",
        "separation_sigma", "warnings", "error", "report"})
public record SeriesSummary(
        @JsonProperty("series") String series,
        @JsonProperty("frames") Integer frames,
        @JsonProperty("duration_s") Double durationS,
        @JsonProperty("mode") String mode,
        @JsonProperty("status") String status,
        @JsonProperty("designator") String designator,
        @JsonProperty("rate_k_per_s") Double rateKPerS,
        @JsonProperty("separation_sigma") Double separationSigma,
        @JsonProperty("warnings") List<String> warnings,
        @JsonProperty("error") String error,
        @JsonProperty("report") String report) {
    public static final String FAILED = "failed";

    public SeriesSummary {
        warnings = warnings == null ? List.of() : List.copyOf(warnings);
    }

    public boolean failed() {
        return error != null;
    }

    static SeriesSummary failure(String series, Integer frames, Double durationS, List<String> warnings, String error) {
        return new SeriesSummary(series, frames, durationS, null, FAILED, null, null, null, warnings, error, null);
    }
}
