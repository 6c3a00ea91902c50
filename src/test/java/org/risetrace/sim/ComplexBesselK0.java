package org.risetrace.sim;

/**
 * The modified Bessel function K0 of a complex argument (|arg z| &lt; pi), written here for the tests: the
 * ascending series for |z| &lt;= 10 (Abramowitz and Stegun 9.6.13 with 9.6.12) and the asymptotic expansion for
 * larger |z| (Abramowitz and Stegun 9.7.2 with mu = 0). At |z| = 10 the series loses about 8 of its 16 digits to
 * cancellation (I0 ~ 3e3 against K0 ~ 2e-5 on the real axis) and the expansion's smallest term is about e^-20, so
 * both give about 1e-8 there.
 */
final class ComplexBesselK0 {
    /** Euler-Mascheroni constant (Abramowitz and Stegun 6.1.3). */
    private static final double EULER_GAMMA = 0.5772156649015329;

    private ComplexBesselK0() {
    }

    /** K0(re + i im) as {re, im}. */
    static double[] k0(double re, double im) {
        return Math.hypot(re, im) <= 10 ? series(re, im) : asymptotic(re, im);
    }

    /** A&S 9.6.13: K0(z) = -(ln(z/2) + gamma) I0(z) + sum_k (z^2/4)^k / (k!)^2 H_k, H_k = 1 + 1/2 + ... + 1/k. */
    static double[] series(double re, double im) {
        double qr = (re * re - im * im) / 4, qi = 2 * re * im / 4; // z^2 / 4
        double tr = 1, ti = 0, i0r = 1, i0i = 0, sr = 0, si = 0, harmonic = 0;
        for (int k = 1; k < 300; k++) {
            double nr = (tr * qr - ti * qi) / ((double) k * k), ni = (tr * qi + ti * qr) / ((double) k * k);
            tr = nr;
            ti = ni;
            harmonic += 1.0 / k;
            i0r += tr;
            i0i += ti;
            sr += tr * harmonic;
            si += ti * harmonic;
            if (Math.hypot(tr, ti) * harmonic < 1e-18 * Math.max(1, Math.hypot(sr, si))) break;
        }
        double lr = Math.log(Math.hypot(re, im) / 2) + EULER_GAMMA, li = Math.atan2(im, re); // ln(z/2) + gamma
        return new double[]{-(lr * i0r - li * i0i) + sr, -(lr * i0i + li * i0r) + si};
    }

    /**
     * A&S 9.7.2 with mu = 4 nu^2 = 0: K0(z) ~ sqrt(pi / (2z)) e^-z sum_k a_k, a_0 = 1, a_k = a_{k-1} (-(2k-1)^2) / (8 k z),
     * summed while the terms decrease.
     */
    static double[] asymptotic(double re, double im) {
        double mod = Math.hypot(re, im), arg = Math.atan2(im, re);
        double sr = 1, si = 0, ar = 1, ai = 0, last = 1;
        for (int k = 1; k < 60; k++) {
            double f = -(2.0 * k - 1) * (2.0 * k - 1) / (8.0 * k);
            // a_k = a_{k-1} * f / z
            double zr = re / (mod * mod), zi = -im / (mod * mod); // 1/z
            double nr = f * (ar * zr - ai * zi), ni = f * (ar * zi + ai * zr);
            double size = Math.hypot(nr, ni);
            if (size >= last) break;
            ar = nr;
            ai = ni;
            sr += ar;
            si += ai;
            last = size;
            if (size < 1e-17) break;
        }
        // sqrt(pi / (2z)) e^-z
        double amp = Math.sqrt(Math.PI / (2 * mod)) * Math.exp(-re), ph = -arg / 2 - im;
        double pr = amp * Math.cos(ph), pi = amp * Math.sin(ph);
        return new double[]{pr * sr - pi * si, pr * si + pi * sr};
    }
}
