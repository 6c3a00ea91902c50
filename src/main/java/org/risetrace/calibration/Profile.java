package org.risetrace.calibration;

import com.fasterxml.jackson.annotation.JsonIgnoreProperties;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * A calibration profile: how a camera's exported samples map to temperature, and what the camera can resolve.
 *
 * <p>Encodings: {@code linear} (integer counts, T = gain * count + offset in {@code unit}), {@code float}
 * (samples are temperatures in {@code unit}), {@code span} (8-bit grey, T linear from span_c[0] at 0 to span_c[1]
 * at 255, the span given here, by the sidecar or per frame), {@code matrix} (text matrices of temperatures in unit).
 *
 * @param name               profile name (file name without .json)
 * @param description        free text
 * @param encoding           linear, float, span or matrix
 * @param gain               per count (linear)
 * @param offset             added after gain (linear)
 * @param unit               "K" or "C": the unit of gain*count+offset, or of float samples
 * @param spanC              optional default [low, high] in degrees Celsius for span encoding
 * @param netdK              the camera's noise-equivalent temperature difference in kelvin
 * @param bandUm             spectral band [from, to] in micrometres
 * @param defaultEmissivity  emissivity assumed where no material is given
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonIgnoreProperties(ignoreUnknown = false)
public record Profile(
        @JsonProperty("name") String name,
        @JsonProperty("description") String description,
        @JsonProperty("encoding") String encoding,
        @JsonProperty("gain") Double gain,
        @JsonProperty("offset") Double offset,
        @JsonProperty("unit") String unit,
        @JsonProperty("span_c") double[] spanC,
        @JsonProperty("netd_k") double netdK,
        @JsonProperty("band_um") double[] bandUm,
        @JsonProperty("default_emissivity") double defaultEmissivity) {

    public static final double KELVIN_AT_ZERO_CELSIUS = 273.15;

    public boolean kelvin() { return "K".equalsIgnoreCase(unit); }

    /** Temperature in degrees Celsius for an integer count under a linear encoding. */
    public double countToCelsius(double count) {
        double v = gain * count + offset;
        return kelvin() ? v - KELVIN_AT_ZERO_CELSIUS : v;
    }

    /** The count that a linear encoding stores for a temperature (not rounded). */
    public double celsiusToCount(double celsius) {
        double v = kelvin() ? celsius + KELVIN_AT_ZERO_CELSIUS : celsius;
        return (v - offset) / gain;
    }
}
