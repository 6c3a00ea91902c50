package org.risetrace.calibration;

/**
 * Emissivity and reflected-temperature correction of apparent temperatures (what a camera set to emissivity 1
 * reports) to object temperatures, through band radiance: L(T_obj) = (L(T_app) - (1 - e) L(T_refl)) / e.
 *
 * <p>Atmospheric transmission is taken as 1 in the short forms: at bench distances under 1 m the air path absorbs
 * well under 1 % in the 7.5-14 um window (common practice). The long forms take a transmission tau and an
 * atmosphere temperature: L_app = tau (e L_obj + (1 - e) L_refl) + (1 - tau) L_atm.
 *
 * <p>Band radiance comes from {@link BandRadiance} (cached per band, table-interpolated), so these methods are cheap
 * enough to call per pixel. Arguments outside the physics (emissivity not in (0, 1], transmission not in (0, 1],
 * a temperature at or below absolute zero, or inputs whose correction would need a radiance at or below zero) raise
 * {@link IllegalArgumentException}: callers validate user input first and decide what to tell the user.
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
     * @param bandUm     camera band [from, to] micrometres (null: 7.5-14)
     */
    public static double objectCelsius(double apparentC, double emissivity, double reflectedC, double[] bandUm) {
        requireEmissivity(emissivity);
        requireCelsius("apparent", apparentC);
        requireCelsius("reflected", reflectedC);
        if (emissivity == 1.0) return apparentC;
        BandRadiance band = BandRadiance.of(bandUm);
        double lApp = band.radianceCelsius(apparentC);
        double lRefl = band.radianceCelsius(reflectedC);
        double lObj = (lApp - (1 - emissivity) * lRefl) / emissivity;
        return toCelsius(band, lObj, apparentC, emissivity, reflectedC);
    }

    /**
     * The inverse: what a camera set to emissivity 1 reports for an object at {@code objectC}:
     * L(T_app) = e L(T_obj) + (1 - e) L(T_refl).
     */
    public static double apparentCelsius(double objectC, double emissivity, double reflectedC, double[] bandUm) {
        requireEmissivity(emissivity);
        requireCelsius("object", objectC);
        requireCelsius("reflected", reflectedC);
        if (emissivity == 1.0) return objectC;
        BandRadiance band = BandRadiance.of(bandUm);
        double lApp = emissivity * band.radianceCelsius(objectC) + (1 - emissivity) * band.radianceCelsius(reflectedC);
        return band.celsius(lApp);
    }

    /**
     * Object temperature through an absorbing atmosphere:
     * L_obj = ((L_app - (1 - tau) L_atm) / tau - (1 - e) L_refl) / e.
     *
     * @param transmission atmospheric transmission tau in (0, 1]
     * @param atmosphereC  atmosphere temperature in degrees Celsius
     */
    public static double objectCelsius(double apparentC, double emissivity, double reflectedC,
                                       double transmission, double atmosphereC, double[] bandUm) {
        requireEmissivity(emissivity);
        requireTransmission(transmission);
        requireCelsius("apparent", apparentC);
        requireCelsius("reflected", reflectedC);
        requireCelsius("atmosphere", atmosphereC);
        if (transmission == 1.0) return objectCelsius(apparentC, emissivity, reflectedC, bandUm);
        BandRadiance band = BandRadiance.of(bandUm);
        double lAtPart = (band.radianceCelsius(apparentC) - (1 - transmission) * band.radianceCelsius(atmosphereC))
                / transmission;
        double lObj = (lAtPart - (1 - emissivity) * band.radianceCelsius(reflectedC)) / emissivity;
        return toCelsius(band, lObj, apparentC, emissivity, reflectedC);
    }

    /** The inverse through an absorbing atmosphere: L_app = tau (e L_obj + (1 - e) L_refl) + (1 - tau) L_atm. */
    public static double apparentCelsius(double objectC, double emissivity, double reflectedC,
                                         double transmission, double atmosphereC, double[] bandUm) {
        requireEmissivity(emissivity);
        requireTransmission(transmission);
        requireCelsius("object", objectC);
        requireCelsius("reflected", reflectedC);
        requireCelsius("atmosphere", atmosphereC);
        BandRadiance band = BandRadiance.of(bandUm);
        double lApp = transmission * (emissivity * band.radianceCelsius(objectC)
                + (1 - emissivity) * band.radianceCelsius(reflectedC))
                + (1 - transmission) * band.radianceCelsius(atmosphereC);
        return band.celsius(lApp);
    }

    /**
     * Corrects a whole raster of apparent temperatures in place or into {@code outC} (may be the same array).
     * NaN pixels stay NaN; a pixel whose correction would need a radiance at or below zero (noise far below the
     * reflected temperature on a low-emissivity surface) becomes NaN, the frame model's "no reading".
     */
    public static void objectCelsius(float[] apparentC, float[] outC, double emissivity, double reflectedC,
                                     double[] bandUm) {
        requireEmissivity(emissivity);
        requireCelsius("reflected", reflectedC);
        if (outC.length < apparentC.length) throw new IllegalArgumentException("output raster shorter than input");
        if (emissivity == 1.0) {
            if (outC != apparentC) System.arraycopy(apparentC, 0, outC, 0, apparentC.length);
            return;
        }
        BandRadiance band = BandRadiance.of(bandUm);
        double reflectedPart = (1 - emissivity) * band.radianceCelsius(reflectedC);
        double floor = Planck.bandRadiance(band.fromUm(), band.toUm(), BandRadiance.MIN_KELVIN);
        for (int i = 0; i < apparentC.length; i++) {
            float a = apparentC[i];
            if (Float.isNaN(a) || a <= -Profile.KELVIN_AT_ZERO_CELSIUS) {
                outC[i] = Float.NaN;
                continue;
            }
            double lObj = (band.radianceCelsius(a) - reflectedPart) / emissivity;
            outC[i] = lObj > floor ? (float) band.celsius(lObj) : Float.NaN;
        }
    }

    private static double toCelsius(BandRadiance band, double lObj, double apparentC, double emissivity,
                                    double reflectedC) {
        if (!(lObj > 0))
            throw new IllegalArgumentException("apparent " + apparentC + " C with emissivity " + emissivity
                    + " and reflected " + reflectedC + " C needs an object radiance <= 0, i.e. a temperature below"
                    + " absolute zero: the apparent reading is too far below the reflected temperature");
        return band.celsius(lObj);
    }

    private static void requireEmissivity(double emissivity) {
        if (!(emissivity > 0 && emissivity <= 1))
            throw new IllegalArgumentException("emissivity must be in (0, 1], not " + emissivity);
    }

    private static void requireTransmission(double transmission) {
        if (!(transmission > 0 && transmission <= 1))
            throw new IllegalArgumentException("atmospheric transmission must be in (0, 1], not " + transmission);
    }

    private static void requireCelsius(String what, double celsius) {
        if (!(celsius > -Profile.KELVIN_AT_ZERO_CELSIUS) || Double.isInfinite(celsius))
            throw new IllegalArgumentException(what + " temperature must be above absolute zero, not " + celsius + " C");
    }
}
