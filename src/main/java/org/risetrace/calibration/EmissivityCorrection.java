package org.risetrace.calibration;

/**
 * Emissivity and reflected-temperature correction of apparent temperatures (what a camera set to emissivity 1
 * reports) to object temperatures, through band radiance: L(T_obj) = (L(T_app) - (1 - e) L(T_refl)) / e.
 */
public final class EmissivityCorrection {
    private EmissivityCorrection() {
    }

    /**
     * Object temperature in degrees Celsius.
     *
     * @param apparentC  apparent temperature (emissivity 1) in degrees Celsius
     * @param emissivity object emissivity in (0, 1]
     * @param reflectedC reflected apparent temperature in degrees Celsius
     * @param bandUm     camera band [from, to] micrometres
     */
    public static double objectCelsius(double apparentC, double emissivity, double reflectedC, double[] bandUm) {
        if (emissivity >= 1.0) return apparentC;
        throw new UnsupportedOperationException("band-radiance correction lands with the radiometry stage");
    }

    /**
     * The inverse: what a camera set to emissivity 1 reports for an object at {@code objectC}:
     * L(T_app) = e L(T_obj) + (1 - e) L(T_refl).
     */
    public static double apparentCelsius(double objectC, double emissivity, double reflectedC, double[] bandUm) {
        if (emissivity >= 1.0) return objectC;
        throw new UnsupportedOperationException("band-radiance correction lands with the radiometry stage");
    }
}
