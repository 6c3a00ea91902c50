package org.risetrace.calibration;

/**
 * One calibration point: the mean signal a target gave and the temperature it was known to have.
 *
 * @param signal    mean stored sample (count) over the target's pixels in every frame it was read in
 * @param knownC    known temperature, degrees Celsius
 * @param pixels    number of pixel readings averaged
 * @param spreadK   standard deviation of the base profile's temperatures over those readings, kelvin
 *                  (large when the region is not uniform: misplaced, or straddling the target's edge)
 * @param label     how the user wrote the target
 */
public record ReferencePoint(double signal, double knownC, long pixels, double spreadK, String label) {
    public static ReferencePoint of(double signal, double knownC) {
        return new ReferencePoint(signal, knownC, 1, 0.0, signal + "=" + knownC);
    }
}
