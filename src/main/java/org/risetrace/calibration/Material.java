package org.risetrace.calibration;

import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * A surface material and its emissivity in the long-wave (8-14 um) band.
 *
 * @param name        name as board files refer to it (matched case-insensitively, '-', '_' and spaces alike)
 * @param emissivity  hemispherical-normal emissivity in (0, 1]
 * @param uncertainty half-width of the plausible range of the emissivity, >= 0
 * @param source      where the value comes from
 */
public record Material(
        @JsonProperty("name") String name,
        @JsonProperty("emissivity") double emissivity,
        @JsonProperty("uncertainty") double uncertainty,
        @JsonProperty("source") String source) {

    /** Emissivity below which a reading is unreliable and the part should be covered with tape (issue threshold). */
    public static final double UNRELIABLE_BELOW = 0.5;

    /** True when the emissivity is too low for a trustworthy reading. */
    public boolean unreliable() {
        return emissivity < UNRELIABLE_BELOW;
    }
}
