package org.risetrace.analysis;

/**
 * The lock-in correlation as a least-squares fit, shared by the per-pixel accumulator ({@link LockInMaps}) and the
 * per-part series: y(t) = sum_j c_j P_j(u) + a cos(theta) + b sin(theta), with P_j the powers of the window time
 * scaled to u in [-1, 1] (the slow trend: the board warming overall, removed as a polynomial of degree
 * {@code detrendDegree}) and theta the excitation's phase ({@link Excitation#referencePhase}).
 *
 * <p>Over whole periods of evenly spaced frames the sine and cosine are orthogonal to each other and nearly to the
 * trend, and a = (2/N) sum y cos(theta), b = (2/N) sum y sin(theta): the classic lock-in correlation
 * (Breitenstein, Warta and Langenkamp, Lock-in Thermography, Springer, section 2.2). Fitting the trend jointly
 * removes its leakage into the two correlations exactly, and uneven frame times need no resampling: the normal
 * equations use the frames' own times. With white noise of sigma per frame the standard error of a and b is
 * sigma sqrt((G^-1)_aa), which is sigma sqrt(2/N) for evenly spaced frames over whole periods.
 */
public final class LockInFit {
    private final Excitation excitation;
    private final Excitation.Window window;
    private final int degree;

    public LockInFit(Excitation excitation, Excitation.Window window, int detrendDegree) {
        if (detrendDegree < 0 || detrendDegree > 4) throw new IllegalArgumentException("detrend degree 0..4");
        this.excitation = excitation;
        this.window = window;
        this.degree = detrendDegree;
    }

    /** Number of fitted functions: the trend's powers, then cosine and sine. */
    public int size() {
        return degree + 3;
    }

    /** Index of the cosine (in-phase) coefficient; the sine (quadrature) follows. */
    public int cosIndex() {
        return degree + 1;
    }

    public Excitation excitation() { return excitation; }

    public Excitation.Window window() { return window; }

    public int degree() { return degree; }

    /** Fills b with the basis functions at time t. */
    public void basis(double tS, double[] b) {
        double half = 0.5 * (window.endS() - window.startS());
        double u = half > 0 ? (tS - window.startS() - half) / half : 0;
        double p = 1;
        for (int j = 0; j <= degree; j++) {
            b[j] = p;
            p *= u;
        }
        double th = excitation.referencePhase(tS);
        b[degree + 1] = Math.cos(th);
        b[degree + 2] = Math.sin(th);
    }

    /** Inverse of a small symmetric positive definite matrix by Gauss-Jordan elimination with partial pivoting. */
    static double[][] invert(double[][] a) {
        int n = a.length;
        double[][] m = new double[n][2 * n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a[i], 0, m[i], 0, n);
            m[i][n + i] = 1;
        }
        for (int c = 0; c < n; c++) {
            int piv = c;
            for (int r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[piv][c])) piv = r;
            if (!(Math.abs(m[piv][c]) > 1e-300)) return null;
            double[] tmp = m[c];
            m[c] = m[piv];
            m[piv] = tmp;
            double d = m[c][c];
            for (int k = 0; k < 2 * n; k++) m[c][k] /= d;
            for (int r = 0; r < n; r++) {
                if (r == c) continue;
                double f = m[r][c];
                if (f == 0) continue;
                for (int k = 0; k < 2 * n; k++) m[r][k] -= f * m[c][k];
            }
        }
        double[][] inv = new double[n][n];
        for (int i = 0; i < n; i++) System.arraycopy(m[i], n, inv[i], 0, n);
        return inv;
    }

    /**
     * One series fitted directly (a part's footprint mean, the board's mean).
     *
     * @param inPhase        a, kelvin
     * @param quadrature     b, kelvin
     * @param amplitude      sqrt(a^2 + b^2)
     * @param lagDeg         atan2(b, a) in degrees: the lag behind the excitation's fundamental
     * @param amplitudeSe    standard error of the amplitude from the residual (white noise), kelvin
     * @param betweenPeriodSe standard error of the amplitude from the spread of the per-period correlations
     *                       (sd / sqrt(periods)); NaN with fewer than 4 periods
     * @param residualSigma  rms of the residual per frame, kelvin
     * @param frames         frames in the window
     */
    public record SeriesFit(double inPhase, double quadrature, double amplitude, double lagDeg, double amplitudeSe,
                            double betweenPeriodSe, double residualSigma, int frames) {
        /** Standard error of the lag in degrees (small-error limit se_A / A). */
        public double lagSeDeg() {
            return Math.toDegrees(Math.max(amplitudeSe, Double.isFinite(betweenPeriodSe) ? betweenPeriodSe : 0) / amplitude);
        }

        /** The larger of the two amplitude errors: the residual's and, with 4 or more periods, the between-period spread. */
        public double se() {
            return Double.isFinite(betweenPeriodSe) ? Math.max(amplitudeSe, betweenPeriodSe) : amplitudeSe;
        }
    }

    /** Fits one series; frames outside the window or with a NaN value are left out. Null with too few frames. */
    public SeriesFit fit(double[] tS, double[] y) {
        int m = size();
        double[][] g = new double[m][m];
        double[] s = new double[m], b = new double[m];
        int n = 0;
        for (int i = 0; i < tS.length; i++) {
            if (!window.contains(tS[i]) || !Double.isFinite(y[i])) continue;
            basis(tS[i], b);
            for (int r = 0; r < m; r++) {
                s[r] += y[i] * b[r];
                for (int c = 0; c < m; c++) g[r][c] += b[r] * b[c];
            }
            n++;
        }
        if (n <= m) return null;
        double[][] inv = invert(g);
        if (inv == null) return null;
        double[] beta = new double[m];
        for (int r = 0; r < m; r++) for (int c = 0; c < m; c++) beta[r] += inv[r][c] * s[c];
        double rss = 0;
        double[] resid = new double[tS.length];
        for (int i = 0; i < tS.length; i++) {
            resid[i] = Double.NaN;
            if (!window.contains(tS[i]) || !Double.isFinite(y[i])) continue;
            basis(tS[i], b);
            double f = 0;
            for (int r = 0; r < m; r++) f += beta[r] * b[r];
            resid[i] = y[i] - f;
            rss += resid[i] * resid[i];
        }
        int ci = cosIndex();
        double a = beta[ci], q = beta[ci + 1];
        double sigma = Math.sqrt(rss / (n - m));
        double amp = Math.hypot(a, q);
        double se = amplitudeSe(a, q, sigma, inv[ci][ci], inv[ci + 1][ci + 1]);
        return new SeriesFit(a, q, amp, Math.toDegrees(Math.atan2(q, a)), se, betweenPeriodSe(tS, y, beta, a, q),
                sigma, n);
    }

    /**
     * Standard error of the amplitude sqrt(a^2 + b^2) from those of a and b (first-order propagation); where the
     * amplitude is zero, the mean of the two.
     */
    static double amplitudeSe(double a, double b, double sigma, double vaa, double vbb) {
        double amp = Math.hypot(a, b);
        double var = amp > 0 ? (a * a * vaa + b * b * vbb) / (amp * amp) : 0.5 * (vaa + vbb);
        return sigma * Math.sqrt(var);
    }

    /**
     * The spread between periods: each period's own in-phase and quadrature parts (the trend of the whole window
     * removed first), projected on the overall phase; their standard deviation over sqrt(periods) is an error
     * estimate that also holds for noise that is not white (drift from period to period).
     */
    private double betweenPeriodSe(double[] tS, double[] y, double[] beta, double a, double q) {
        int periods = window.periods();
        if (periods < 4) return Double.NaN;
        double amp = Math.hypot(a, q);
        double ca = amp > 0 ? a / amp : 1, sa = amp > 0 ? q / amp : 0;
        double[] b = new double[size()];
        double[][] sums = new double[periods][5]; // cc, cs, ss, yc, ys
        for (int i = 0; i < tS.length; i++) {
            if (!window.contains(tS[i]) || !Double.isFinite(y[i])) continue;
            int k = (int) Math.floor((tS[i] - window.startS()) / window.periodS() + 1e-9);
            if (k < 0 || k >= periods) continue;
            basis(tS[i], b);
            double trend = 0;
            for (int r = 0; r <= degree; r++) trend += beta[r] * b[r];
            double r = y[i] - trend, c = b[degree + 1], s = b[degree + 2];
            sums[k][0] += c * c;
            sums[k][1] += c * s;
            sums[k][2] += s * s;
            sums[k][3] += r * c;
            sums[k][4] += r * s;
        }
        double[] along = new double[periods];
        int used = 0;
        for (double[] p : sums) {
            double det = p[0] * p[2] - p[1] * p[1];
            if (!(det > 1e-12)) continue;
            double ak = (p[2] * p[3] - p[1] * p[4]) / det, bk = (p[0] * p[4] - p[1] * p[3]) / det;
            along[used++] = ak * ca + bk * sa;
        }
        if (used < 4) return Double.NaN;
        double mean = 0;
        for (int k = 0; k < used; k++) mean += along[k] / used;
        double ss = 0;
        for (int k = 0; k < used; k++) ss += (along[k] - mean) * (along[k] - mean);
        return Math.sqrt(ss / (used - 1)) / Math.sqrt(used);
    }
}
