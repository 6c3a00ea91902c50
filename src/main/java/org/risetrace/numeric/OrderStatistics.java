package org.risetrace.numeric;

/**
 * Order statistics of the first n values of an array by selection instead of sorting: the k-th smallest in linear
 * expected time (Hoare's FIND, Communications of the ACM 4(7), 1961). The per-frame statistics (a part's 95th
 * percentile, the ambient's median, the aligner's robust centres) need one or two order statistics of a few hundred
 * to a few thousand values, where a full sort spent most of its time ordering values nobody reads. Results equal
 * those of sorting first; the values must not be NaN. Every method reorders the first n values.
 */
public final class OrderStatistics {
    private OrderStatistics() {
    }

    /**
     * The k-th smallest (0-based) of the first n values, 0 when n is 0. Afterwards v[i] <= v[k] for i < k and
     * v[i] >= v[k] for k < i < n.
     */
    public static float select(float[] v, int n, int k) {
        if (n == 0) return 0;
        if (k < 0 || k >= n) throw new IllegalArgumentException("k = " + k + " outside 0.." + (n - 1));
        int lo = 0, hi = n - 1;
        while (lo < hi) {
            float pivot = v[(lo + hi) >>> 1];
            int i = lo, j = hi;
            while (i <= j) {
                while (v[i] < pivot) i++;
                while (v[j] > pivot) j--;
                if (i <= j) { float t = v[i]; v[i] = v[j]; v[j] = t; i++; j--; }
            }
            if (k <= j) hi = j;
            else if (k >= i) lo = i;
            else break; // v[j + 1 .. i - 1] all equal the pivot, k among them
        }
        return v[k];
    }

    /**
     * The linearly interpolated q-quantile of the first n values (n >= 1), the "R-7" definition (Hyndman and Fan,
     * The American Statistician 50(4), 1996; the default of R and of spreadsheet PERCENTILE): with h = (n - 1) q,
     * x[floor h] + (h - floor h) (x[floor h + 1] - x[floor h]) over the sorted values.
     */
    public static double percentile(float[] v, int n, double q) {
        if (n < 1) throw new IllegalArgumentException("no values");
        double h = (n - 1) * q;
        int lo = (int) Math.floor(h);
        float a = select(v, n, lo);
        if (lo + 1 >= n) return a;
        float b = v[lo + 1]; // the next order statistic: the smallest value after position lo
        for (int i = lo + 2; i < n; i++) if (v[i] < b) b = v[i];
        return a + (h - lo) * (b - a);
    }

    /** The median of the first n values (n >= 1): the middle one, or the mean of the two middle ones. */
    public static double median(float[] v, int n) {
        if (n < 1) throw new IllegalArgumentException("no values");
        int mid = n / 2;
        float upper = select(v, n, mid);
        if ((n & 1) == 1) return upper;
        float lower = v[0]; // the largest value before position mid
        for (int i = 1; i < mid; i++) if (v[i] > lower) lower = v[i];
        return 0.5 * (lower + upper);
    }
}
