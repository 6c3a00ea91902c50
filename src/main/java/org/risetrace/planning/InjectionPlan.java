package org.risetrace.planning;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

import java.util.List;

/**
 * What {@link Planner#plan} works out; written as JSON by {@code risetrace plan --json} and into series.json as
 * {@code injection.plan}. Field names are snake_case; fields are only ever added.
 *
 * @param schema          "risetrace-plan/1"
 * @param inputs          what the plan was made from
 * @param setVolts        the supply's voltage setting: never above the nominal voltage of the rail it can raise
 *                        against ground
 * @param currentLimitA   the supply's current limit setting
 * @param mode            {@code constant-current} (the limit holds the current; the voltage stays below the
 *                        setting) or {@code constant-voltage} (the setting holds; the current stays below the limit)
 * @param currentA        the current that will flow
 * @param terminalV       the voltage between the two leads, I x R measured
 * @param shortPowerW     power heating the short, I^2 x (R measured - R path)
 * @param pathPowerW      power heating the rest of the path, I^2 x R path
 * @param supplyPowerW    the supply's output power, the sum
 * @param rails           each rail's voltage against ground during injection
 * @param heating         the heating estimate behind the too-little-heat check
 * @param capture         the camera settings to use
 * @param warnings        every warning that applies, in a fixed order
 * @param cautions        the safety cautions, always present
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"schema", "inputs", "set_volts", "current_limit_a", "mode", "current_a", "terminal_v",
        "short_power_w", "path_power_w", "supply_power_w", "rails", "heating", "capture", "warnings", "cautions"})
public record InjectionPlan(
        @JsonProperty("schema") String schema,
        @JsonProperty("inputs") PlanRequest inputs,
        @JsonProperty("set_volts") double setVolts,
        @JsonProperty("current_limit_a") double currentLimitA,
        @JsonProperty("mode") String mode,
        @JsonProperty("current_a") double currentA,
        @JsonProperty("terminal_v") double terminalV,
        @JsonProperty("short_power_w") double shortPowerW,
        @JsonProperty("path_power_w") double pathPowerW,
        @JsonProperty("supply_power_w") double supplyPowerW,
        @JsonProperty("rails") List<RailVoltage> rails,
        @JsonProperty("heating") Heating heating,
        @JsonProperty("capture") Capture capture,
        @JsonProperty("warnings") List<PlanWarning> warnings,
        @JsonProperty("cautions") List<String> cautions) {

    public static final String SCHEMA = "risetrace-plan/1";
    public static final String CONSTANT_CURRENT = "constant-current";
    public static final String CONSTANT_VOLTAGE = "constant-voltage";

    public InjectionPlan {
        rails = rails == null ? List.of() : List.copyOf(rails);
        warnings = warnings == null ? List.of() : List.copyOf(warnings);
        cautions = cautions == null ? List.of() : List.copyOf(cautions);
    }

    /** True when a warning with this code applies. */
    public boolean has(PlanWarning.Code code) {
        return warnings.stream().anyMatch(w -> w.code() == code);
    }

    /**
     * A rail's voltage against ground during injection.
     *
     * @param rail  its name
     * @param volts the voltage, or null when the plan does not change it
     * @param note  how it comes about
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    @JsonPropertyOrder({"rail", "volts", "note"})
    public record RailVoltage(@JsonProperty("rail") String rail, @JsonProperty("volts") Double volts,
                              @JsonProperty("note") String note) {
    }

    /**
     * The heating estimate (model in {@link BoardHeating}).
     *
     * @param model          the model in words
     * @param afterS         the time the estimate is for (60 s)
     * @param riseK          estimated rise at the spot's edge after {@code afterS}
     * @param neededK        the rise a camera of the given NETD shows clearly (a multiple of the NETD)
     * @param powerNeededW   the power in the short that gives {@code neededK}
     */
    @JsonPropertyOrder({"model", "after_s", "rise_k", "needed_k", "power_needed_w"})
    public record Heating(@JsonProperty("model") String model, @JsonProperty("after_s") double afterS,
                          @JsonProperty("rise_k") double riseK, @JsonProperty("needed_k") double neededK,
                          @JsonProperty("power_needed_w") double powerNeededW) {
    }

    /**
     * Camera settings.
     *
     * @param frameIntervalS      seconds between frames
     * @param baselineS           seconds to record before switching the supply on
     * @param durationS           seconds to record after switching on (three board time constants)
     * @param boardTimeConstantS  the board's time constant the duration comes from
     * @param lockInPeriodS       lock-in: one on/off period
     * @param lockInOnS           lock-in: seconds on in each period
     * @param lockInOffS          lock-in: seconds off in each period
     * @param lockInCycles        lock-in: periods to record
     */
    @JsonPropertyOrder({"frame_interval_s", "baseline_s", "duration_s", "board_time_constant_s", "lock_in_period_s",
            "lock_in_on_s", "lock_in_off_s", "lock_in_cycles"})
    public record Capture(@JsonProperty("frame_interval_s") double frameIntervalS,
                          @JsonProperty("baseline_s") double baselineS,
                          @JsonProperty("duration_s") double durationS,
                          @JsonProperty("board_time_constant_s") double boardTimeConstantS,
                          @JsonProperty("lock_in_period_s") double lockInPeriodS,
                          @JsonProperty("lock_in_on_s") double lockInOnS,
                          @JsonProperty("lock_in_off_s") double lockInOffS,
                          @JsonProperty("lock_in_cycles") int lockInCycles) {
    }
}
