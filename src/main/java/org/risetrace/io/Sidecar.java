package org.risetrace.io;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.JsonNode;

import java.util.Map;

/**
 * The optional series sidecar {@code series.json} beside the frames. Every field is optional.
 *
 * @param profile        calibration profile by name or path (relative to the series folder)
 * @param frameIntervalS seconds between frames, used when neither sidecar times nor image metadata give times
 * @param spanC          series-wide [low, high] degrees Celsius for 8-bit span frames
 * @param reflectedC     reflected apparent temperature in degrees Celsius (default: ambient)
 * @param frames         per-frame entries by file name: time and/or span
 * @param injection      the injection record
 * @param notes          free text
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Sidecar(
        @JsonProperty("profile") String profile,
        @JsonProperty("frame_interval_s") Double frameIntervalS,
        @JsonProperty("span_c") double[] spanC,
        @JsonProperty("reflected_c") Double reflectedC,
        @JsonProperty("frames") Map<String, FrameEntry> frames,
        @JsonProperty("injection") Injection injection,
        @JsonProperty("notes") String notes) {

    public static Sidecar empty() {
        return new Sidecar(null, null, null, null, null, null, null);
    }

    /**
     * Per-frame sidecar entry.
     *
     * @param tS    seconds from the series start
     * @param spanC [low, high] degrees Celsius for an auto-ranged 8-bit frame
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record FrameEntry(@JsonProperty("t_s") Double tS, @JsonProperty("span_c") double[] spanC) {
    }

    /**
     * How current was injected.
     *
     * @param startS        injection start in series seconds (frames before it are the baseline)
     * @param fromRail      rail the supply's positive lead went to
     * @param toRail        rail (or ground) the negative lead went to
     * @param volts         supply voltage setting
     * @param currentLimitA supply current limit in amperes
     * @param supply        supply model, free text
     * @param notes         free text
     * @param plan          the injection plan {@code risetrace plan --write-series} worked out (a JSON object; its
     *                      fields are checked by the planning stage, {@code org.risetrace.planning.SeriesInjection})
     * @param periodS       periodic (lock-in) injection: seconds from one switch-on to the next; the first switch-on
     *                      is {@code startS} (0 when absent)
     * @param onS           periodic injection: seconds on in each period (default: half the period)
     * @param switchS       periodic injection as recorded instead: the switching times in series seconds, on, off,
     *                      on, off, ... (a logging supply or switch); they must keep one period
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Injection(
            @JsonProperty("start_s") Double startS,
            @JsonProperty("from_rail") String fromRail,
            @JsonProperty("to_rail") String toRail,
            @JsonProperty("volts") Double volts,
            @JsonProperty("current_limit_a") Double currentLimitA,
            @JsonProperty("supply") String supply,
            @JsonProperty("notes") String notes,
            @JsonProperty("plan") JsonNode plan,
            @JsonProperty("period_s") Double periodS,
            @JsonProperty("on_s") Double onS,
            @JsonProperty("switch_s") double[] switchS) {

        /** A steady (step) injection record, without plan or period. */
        public Injection(Double startS, String fromRail, String toRail, Double volts, Double currentLimitA,
                         String supply, String notes) {
            this(startS, fromRail, toRail, volts, currentLimitA, supply, notes, null, null, null, null);
        }

        /** A steady injection record with the plan that set it. */
        public Injection(Double startS, String fromRail, String toRail, Double volts, Double currentLimitA,
                         String supply, String notes, JsonNode plan) {
            this(startS, fromRail, toRail, volts, currentLimitA, supply, notes, plan, null, null, null);
        }

        /** A periodic (lock-in) injection record without plan. */
        public Injection(Double startS, String fromRail, String toRail, Double volts, Double currentLimitA,
                         String supply, String notes, Double periodS, Double onS, double[] switchS) {
            this(startS, fromRail, toRail, volts, currentLimitA, supply, notes, null, periodS, onS, switchS);
        }

        /** True when the record describes a periodic (lock-in) injection. */
        @com.fasterxml.jackson.annotation.JsonIgnore
        public boolean periodic() {
            return periodS != null || switchS != null;
        }
    }
}
