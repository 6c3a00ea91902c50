package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * The answer: which part heats fastest and how clearly.
 *
 * @param status           identified, inconclusive or no-heating
 * @param ref              the leading part (null when nothing rises)
 * @param rateKPerS        the leader's initial rise rate
 * @param runnerUpRef      the second part by rate (null when fewer than two parts)
 * @param separationSigma  (leader rate - runner-up rate) / combined standard error
 * @param reason           plain words: why this status
 */
public record Verdict(
        @JsonProperty("status") VerdictStatus status,
        @JsonProperty("ref") String ref,
        @JsonProperty("rate_k_per_s") Double rateKPerS,
        @JsonProperty("runner_up_ref") String runnerUpRef,
        @JsonProperty("separation_sigma") Double separationSigma,
        @JsonProperty("reason") String reason) {
}
