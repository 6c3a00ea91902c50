package org.risetrace.calibration;

import java.util.Arrays;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Band radiance of a blackbody over one camera band, and its inverse, fast enough for every pixel of every frame.
 *
 * <p>Between {@value #TABLE_FROM_C} and {@value #TABLE_TO_C} degrees Celsius the radiance and its temperature
 * derivative are tabulated every {@value #STEP_K} K by quadrature ({@link Planck#bandRadiance}) and interpolated by
 * cubic Hermite polynomials; the inverse finds the table interval through an index of equal steps in L (the
 * column is monotone) and solves the interval's cubic by Newton's method. The interpolation error is about 1e-11
 * relative in L and 1e-9 K in T (the step is small against the curvature of L(T)); outside the table both
 * directions fall back to quadrature and a bracketed Newton's method.
 *
 * <p>Instances are immutable and thread-safe; {@link #of(double[])} caches one per band.
 */
public final class BandRadiance {
    /** Default band of uncooled microbolometer cameras, micrometres (common practice). */
    public static final double[] DEFAULT_BAND_UM = {7.5, 14.0};
    public static final double TABLE_FROM_C = -60.0;
    public static final double TABLE_TO_C = 600.0;
    public static final double STEP_K = 0.5;
    /** Below this temperature band radiance in the thermal infrared underflows; the model is not used there. */
    static final double MIN_KELVIN = 5.0;
    static final double MAX_KELVIN = 1.0e5;

    private static final Map<Band, BandRadiance> CACHE = new ConcurrentHashMap<>();
    private static volatile BandRadiance last;

    private final double fromUm, toUm;
    private final double t0Kelvin;
    private final double[] radiance;     // W m^-2 sr^-1 at t0 + i * STEP_K
    private final double[] derivative;   // dL/dT at the same nodes, W m^-2 sr^-1 K^-1
    /**
     * Index of the table interval at the start of each of {@link #BINS} equal steps in L: the inverse's first guess.
     * In the long-wave band the steps are finer than the table's smallest radiance step, so the guess is the
     * interval or the one before; in shorter bands the search walks on a few intervals at the cold end.
     */
    private final char[] binStart;
    private final double binsPerRadiance;
    private static final int BINS = 1 << 16;

    private record Band(double fromUm, double toUm) {
    }

    private BandRadiance(double fromUm, double toUm) {
        this.fromUm = fromUm;
        this.toUm = toUm;
        this.t0Kelvin = TABLE_FROM_C + Profile.KELVIN_AT_ZERO_CELSIUS;
        int n = (int) Math.round((TABLE_TO_C - TABLE_FROM_C) / STEP_K) + 1;
        radiance = new double[n];
        derivative = new double[n];
        for (int i = 0; i < n; i++) {
            double t = t0Kelvin + i * STEP_K;
            radiance[i] = Planck.bandRadiance(fromUm, toUm, t);
            derivative[i] = Planck.bandRadianceDerivative(fromUm, toUm, t);
        }
        binsPerRadiance = BINS / (radiance[n - 1] - radiance[0]);
        binStart = new char[BINS + 1];
        int i = 0;
        for (int b = 0; b <= BINS; b++) {
            double atBin = radiance[0] + b / binsPerRadiance;
            while (i < n - 2 && radiance[i + 1] <= atBin) i++;
            binStart[b] = (char) i;
        }
    }

    /** The band's converter; {@code bandUm} null means {@link #DEFAULT_BAND_UM}. */
    public static BandRadiance of(double[] bandUm) {
        if (bandUm == null) return of(DEFAULT_BAND_UM[0], DEFAULT_BAND_UM[1]);
        if (bandUm.length != 2) throw new IllegalArgumentException("band must be [from, to] micrometres, got "
                + Arrays.toString(bandUm));
        return of(bandUm[0], bandUm[1]);
    }

    public static BandRadiance of(double fromUm, double toUm) {
        BandRadiance l = last;
        if (l != null && l.fromUm == fromUm && l.toUm == toUm) return l;
        if (!(fromUm > 0) || !(toUm > fromUm) || Double.isInfinite(toUm))
            throw new IllegalArgumentException("band must be [from, to] micrometres with to > from > 0, not ["
                    + fromUm + ", " + toUm + "]");
        BandRadiance b = CACHE.computeIfAbsent(new Band(fromUm, toUm), k -> new BandRadiance(k.fromUm, k.toUm));
        last = b;
        return b;
    }

    public double fromUm() { return fromUm; }

    public double toUm() { return toUm; }

    /** Band radiance in W m^-2 sr^-1 of a blackbody at {@code kelvin}. */
    public double radiance(double kelvin) {
        double pos = (kelvin - t0Kelvin) / STEP_K;
        int i = (int) Math.floor(pos);
        if (!(pos >= 0) || i >= radiance.length - 1) {
            if (kelvin == t0Kelvin + (radiance.length - 1) * STEP_K) return radiance[radiance.length - 1];
            return Planck.bandRadiance(fromUm, toUm, requireKelvin(kelvin));
        }
        double s = pos - i;
        double s2 = s * s, s3 = s2 * s;
        double h00 = 2 * s3 - 3 * s2 + 1, h10 = s3 - 2 * s2 + s, h01 = -2 * s3 + 3 * s2, h11 = s3 - s2;
        return h00 * radiance[i] + h10 * STEP_K * derivative[i] + h01 * radiance[i + 1] + h11 * STEP_K * derivative[i + 1];
    }

    /** dL/dT in W m^-2 sr^-1 K^-1 at {@code kelvin} (quadrature). */
    public double derivative(double kelvin) {
        return Planck.bandRadianceDerivative(fromUm, toUm, requireKelvin(kelvin));
    }

    public double radianceCelsius(double celsius) {
        return radiance(celsius + Profile.KELVIN_AT_ZERO_CELSIUS);
    }

    public double celsius(double bandRadiance) {
        return kelvin(bandRadiance) - Profile.KELVIN_AT_ZERO_CELSIUS;
    }

    /**
     * The blackbody temperature in kelvin whose band radiance is {@code bandRadiance}.
     *
     * @throws IllegalArgumentException for a radiance that is not positive (it would need a temperature at or below
     *                                  absolute zero) or below the radiance of a {@value #MIN_KELVIN} K blackbody
     */
    public double kelvin(double bandRadiance) {
        int top = radiance.length - 1;
        if (bandRadiance >= radiance[0] && bandRadiance <= radiance[top]) {
            // the bin gives the first table interval that may hold the radiance; step on to the right one
            int bin = (int) ((bandRadiance - radiance[0]) * binsPerRadiance);
            int lo = binStart[Math.min(BINS, bin)];
            while (lo > 0 && radiance[lo] > bandRadiance) lo--;
            while (lo < top - 1 && radiance[lo + 1] <= bandRadiance) lo++;
            double l0 = radiance[lo], l1 = radiance[lo + 1];
            double d0 = derivative[lo] * STEP_K, d1 = derivative[lo + 1] * STEP_K;
            double s = (bandRadiance - l0) / (l1 - l0);
            // Newton's method on the interval's cubic Hermite polynomial; the cubic is nearly linear, so 2-3 steps
            for (int iter = 0; iter < 8; iter++) {
                double s2 = s * s, s3 = s2 * s;
                double p = (2 * s3 - 3 * s2 + 1) * l0 + (s3 - 2 * s2 + s) * d0 + (-2 * s3 + 3 * s2) * l1 + (s3 - s2) * d1;
                double dp = (6 * s2 - 6 * s) * l0 + (3 * s2 - 4 * s + 1) * d0 + (-6 * s2 + 6 * s) * l1 + (3 * s2 - 2 * s) * d1;
                double ds = (p - bandRadiance) / dp;
                s -= ds;
                if (Math.abs(ds) < 1e-12) break; // 5e-13 K
            }
            return t0Kelvin + (lo + s) * STEP_K;
        }
        return exactKelvin(bandRadiance);
    }

    /** Inverse by quadrature: Newton's method on ln L(T), kept inside a bisection bracket. */
    double exactKelvin(double bandRadiance) {
        if (!(bandRadiance > 0) || Double.isInfinite(bandRadiance))
            throw new IllegalArgumentException("band radiance " + bandRadiance
                    + " W/(m^2 sr) would need a temperature at or below absolute zero");
        double lo = MIN_KELVIN, hi = MAX_KELVIN;
        double target = Math.log(bandRadiance);
        if (target < Math.log(Planck.bandRadiance(fromUm, toUm, lo)))
            throw new IllegalArgumentException("band radiance " + bandRadiance + " W/(m^2 sr) is that of a blackbody"
                    + " below " + MIN_KELVIN + " K, outside the radiometric model");
        if (target > Math.log(Planck.bandRadiance(fromUm, toUm, hi)))
            throw new IllegalArgumentException("band radiance " + bandRadiance + " W/(m^2 sr) is that of a blackbody"
                    + " above " + MAX_KELVIN + " K, outside the radiometric model");
        double t = bandRadiance < radiance[0] ? t0Kelvin / 2 : t0Kelvin + radiance.length * STEP_K;
        for (int iter = 0; iter < 200; iter++) {
            double l = Planck.bandRadiance(fromUm, toUm, t);
            double f = Math.log(l) - target;
            if (f > 0) hi = t;
            else lo = t;
            double step = f / (Planck.bandRadianceDerivative(fromUm, toUm, t) / l);
            double next = t - step;
            if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
            if (Math.abs(next - t) < 1e-10 * t) return next;
            t = next;
        }
        return t;
    }

    private static double requireKelvin(double kelvin) {
        if (!(kelvin > 0) || Double.isInfinite(kelvin))
            throw new IllegalArgumentException("temperature must be above absolute zero, not " + kelvin + " K");
        return kelvin;
    }

    @Override
    public String toString() {
        return "BandRadiance[" + fromUm + "-" + toUm + " um]";
    }
}
