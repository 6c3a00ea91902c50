package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * A local maximum of the rise map.
 *
 * @param xMm   sub-pixel centroid x in board millimetres
 * @param yMm   centroid y
 * @param riseK peak rise in kelvin
 * @param ref   designator of the part whose footprint holds the centroid; null for an unmarked spot
 */
public record Hotspot(
        @JsonProperty("x_mm") double xMm,
        @JsonProperty("y_mm") double yMm,
        @JsonProperty("rise_k") double riseK,
        @JsonProperty("ref") String ref) {
}
