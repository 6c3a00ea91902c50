package org.risetrace.calibration;

/**
 * Planck's law for a blackbody and its integral over a wavelength band, by composite Gauss-Legendre quadrature.
 *
 * <p>Constants are the exact SI values that CODATA 2018 lists (h, c, k_B are defined exactly since the 2019 SI).
 * Radiances are per steradian: spectral radiance in W m^-2 sr^-1 m^-1, band radiance in W m^-2 sr^-1.
 * The camera's spectral response is taken as flat over its band (a rectangular band), which is what an uncooled
 * microbolometer profile states when it gives only {@code band_um}.
 */
public final class Planck {
    /** Planck constant, J s (CODATA 2018, exact). */
    public static final double H = 6.62607015e-34;
    /** Speed of light in vacuum, m/s (CODATA 2018, exact). */
    public static final double C = 299792458.0;
    /** Boltzmann constant, J/K (CODATA 2018, exact). */
    public static final double K_B = 1.380649e-23;
    /** First radiation constant for spectral radiance, 2 h c^2, W m^2 sr^-1. */
    public static final double C1L = 2.0 * H * C * C;
    /** Second radiation constant h c / k_B, m K. */
    public static final double C2 = H * C / K_B;

    /** Gauss-Legendre nodes and weights on [-1, 1], 10 points, computed once by Newton's method on P_10. */
    private static final double[] GL_X;
    private static final double[] GL_W;
    private static final int GL_N = 10;
    /** Panel width in ln(lambda); 0.05 keeps the rule exact to double precision for any band and temperature. */
    private static final double PANEL_LN = 0.05;

    static {
        GL_X = new double[GL_N];
        GL_W = new double[GL_N];
        gaussLegendre(GL_N, GL_X, GL_W);
    }

    private Planck() {
    }

    /** Spectral radiance L_lambda(lambda, T) in W m^-2 sr^-1 m^-1, lambda in metres, T in kelvin. */
    public static double spectralRadiance(double lambdaM, double kelvin) {
        double x = C2 / (lambdaM * kelvin);
        double l5 = lambdaM * lambdaM * lambdaM * lambdaM * lambdaM;
        return C1L / (l5 * Math.expm1(x));
    }

    /** dL_lambda/dT in W m^-2 sr^-1 m^-1 K^-1. */
    public static double spectralRadianceDerivative(double lambdaM, double kelvin) {
        double x = C2 / (lambdaM * kelvin);
        double l5 = lambdaM * lambdaM * lambdaM * lambdaM * lambdaM;
        double em1 = Math.expm1(x);
        if (Double.isInfinite(em1)) return 0.0;
        // d/dT [1/(e^x - 1)] = e^x / (e^x - 1)^2 * x / T, written as (1 + 1/em1) / em1 so nothing overflows
        double shape = (1.0 + 1.0 / em1) / em1;
        return C1L / l5 * shape * (x / kelvin);
    }

    /** Band radiance: integral of L_lambda over [fromUm, toUm] micrometres, W m^-2 sr^-1. */
    public static double bandRadiance(double fromUm, double toUm, double kelvin) {
        return integrate(fromUm, toUm, kelvin, false);
    }

    /** dL_band/dT in W m^-2 sr^-1 K^-1, by the same quadrature. */
    public static double bandRadianceDerivative(double fromUm, double toUm, double kelvin) {
        return integrate(fromUm, toUm, kelvin, true);
    }

    /**
     * Composite Gauss-Legendre in u = ln(lambda): L_lambda dlambda = lambda L_lambda du. The integrand is smooth and
     * single-peaked in u, so equal panels of 0.05 in u with 10 nodes each converge to rounding for any band.
     */
    private static double integrate(double fromUm, double toUm, double kelvin, boolean derivative) {
        if (!(fromUm > 0) || !(toUm > fromUm))
            throw new IllegalArgumentException("band must be [from, to] micrometres with to > from > 0, not ["
                    + fromUm + ", " + toUm + "]");
        if (!(kelvin > 0)) throw new IllegalArgumentException("temperature must be above absolute zero, not " + kelvin + " K");
        double u0 = Math.log(fromUm * 1e-6), u1 = Math.log(toUm * 1e-6);
        int panels = Math.max(4, (int) Math.ceil((u1 - u0) / PANEL_LN));
        double width = (u1 - u0) / panels, half = width / 2;
        double sum = 0;
        for (int p = 0; p < panels; p++) {
            double mid = u0 + (p + 0.5) * width;
            double panel = 0;
            for (int i = 0; i < GL_N; i++) {
                double lambda = Math.exp(mid + half * GL_X[i]);
                double f = derivative ? spectralRadianceDerivative(lambda, kelvin) : spectralRadiance(lambda, kelvin);
                panel += GL_W[i] * f * lambda;
            }
            sum += panel * half;
        }
        return sum;
    }

    /**
     * Fraction of a blackbody's total exitance emitted below wavelength lambda at temperature T, as a function of
     * lambda*T in micrometre-kelvin, from the series F = 15/pi^4 sum_n e^(-n x)/n (x^3 + 3x^2/n + 6x/n^2 + 6/n^3)
     * with x = c2/(lambda T) (the standard series for the blackbody fraction, e.g. Incropera and DeWitt).
     */
    public static double blackbodyFraction(double lambdaTumK) {
        if (!(lambdaTumK > 0)) return 0.0;
        double x = C2 * 1e6 / lambdaTumK;
        double sum = 0;
        for (int n = 1; n <= 400; n++) {
            double term = Math.exp(-n * x) / n * (x * x * x + 3 * x * x / n + 6 * x / ((double) n * n) + 6 / ((double) n * n * n));
            sum += term;
            if (term < 1e-17 * sum) break;
        }
        return 15.0 / Math.pow(Math.PI, 4) * sum;
    }

    /** Nodes and weights of the n-point Gauss-Legendre rule, by Newton's method on the Legendre polynomial. */
    static void gaussLegendre(int n, double[] x, double[] w) {
        for (int i = 0; i < (n + 1) / 2; i++) {
            double z = Math.cos(Math.PI * (i + 0.75) / (n + 0.5));
            double dp = 0;
            for (int iter = 0; iter < 100; iter++) {
                double p0 = 1, p1 = 0;
                for (int j = 1; j <= n; j++) {
                    double p2 = p1;
                    p1 = p0;
                    p0 = ((2.0 * j - 1) * z * p1 - (j - 1.0) * p2) / j;
                }
                dp = n * (z * p0 - p1) / (z * z - 1);
                double dz = p0 / dp;
                z -= dz;
                if (Math.abs(dz) < 1e-16) break;
            }
            // recompute the derivative at the converged node
            double p0 = 1, p1 = 0;
            for (int j = 1; j <= n; j++) {
                double p2 = p1;
                p1 = p0;
                p0 = ((2.0 * j - 1) * z * p1 - (j - 1.0) * p2) / j;
            }
            dp = n * (z * p0 - p1) / (z * z - 1);
            x[i] = -z;
            x[n - 1 - i] = z;
            w[i] = 2 / ((1 - z * z) * dp * dp);
            w[n - 1 - i] = w[i];
        }
    }
}
