package org.risetrace.analysis;

import org.risetrace.calibration.EmissivityCorrection;

import java.util.function.Function;

/**
 * How the analysis turns a part's apparent temperature into an object temperature: the emissivity of the part's
 * material (or the profile's default) and the band-radiance correction of the calibration stage.
 */
public interface EmissivityModel {

    /** A part's emissivity, the half-width of its plausible range, and where it comes from. */
    record Emissivity(double value, double uncertainty, String source) {
    }

    /** The emissivity for a part's material name (null: none given). */
    Emissivity forMaterial(String material);

    /** Object temperature for an apparent one. */
    double objectCelsius(double apparentC, double emissivity, double reflectedC);

    /** No correction at all: object temperature = apparent temperature (emissivity 1). */
    static EmissivityModel none() {
        return new EmissivityModel() {
            @Override public Emissivity forMaterial(String material) { return new Emissivity(1.0, 0.0, "not corrected"); }
            @Override public double objectCelsius(double apparentC, double e, double reflectedC) { return apparentC; }
        };
    }

    /**
     * Materials looked up by {@code lookup} (null result: unknown there), the default emissivity for parts without
     * a material, and {@link EmissivityCorrection#objectCelsius} in the camera band.
     */
    static EmissivityModel of(Function<String, Emissivity> lookup, double defaultEmissivity, double[] bandUm) {
        return new EmissivityModel() {
            @Override public Emissivity forMaterial(String material) {
                Emissivity e = material == null ? null : lookup.apply(material);
                return e != null ? e : new Emissivity(defaultEmissivity, 0.0, "profile default");
            }
            @Override public double objectCelsius(double apparentC, double e, double reflectedC) {
                return e >= 1.0 ? apparentC : EmissivityCorrection.objectCelsius(apparentC, e, reflectedC, bandUm);
            }
        };
    }
}
