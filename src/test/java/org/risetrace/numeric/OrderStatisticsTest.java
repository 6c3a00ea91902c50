package org.risetrace.numeric;

import org.apache.commons.math3.stat.descriptive.rank.Median;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;

import java.util.Arrays;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class OrderStatisticsTest {
    /** Random values, or few distinct ones (ties are where a selection's partitioning goes wrong). */
    private static float[] values(Random rnd, int n, boolean ties) {
        float[] f = new float[n];
        for (int i = 0; i < n; i++) f[i] = ties ? rnd.nextInt(4) : (float) rnd.nextGaussian();
        return f;
    }

    private static double[] widen(float[] f) {
        double[] d = new double[f.length];
        for (int i = 0; i < f.length; i++) d[i] = f[i];
        return d;
    }

    @Test
    void percentileMatchesCommonsMathAtEveryCount() {
        // commons-math3 Percentile with EstimationType.R_7 (Hyndman and Fan 1996, definition 7) is the reference;
        // small counts are where the definitions differ most (R-7 interpolates between order statistics)
        Random rnd = new Random(9);
        Percentile r7 = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
        for (boolean ties : new boolean[]{false, true})
            for (int n = 1; n <= 60; n++) {
                float[] f = values(rnd, n, ties);
                double[] d = widen(f);
                for (double q : new double[]{0, 0.05, 0.5, 0.95, 1})
                    assertEquals(r7.evaluate(d, Math.max(1e-9, 100 * q)), OrderStatistics.percentile(f.clone(), n, q),
                            1e-6, "n " + n + " q " + q + " ties " + ties);
            }
    }

    @Test
    void percentileEqualsTheSortedFormulaBitForBit() {
        // the R-7 definition (Hyndman and Fan 1996) evaluated on the values sorted by the JDK's Arrays.sort, in the
        // float arithmetic the samplers used before selection replaced the sort: the analysis' numbers do not move
        Random rnd = new Random(3);
        for (int trial = 0; trial < 300; trial++) {
            int n = 1 + rnd.nextInt(3000);
            float[] f = values(rnd, n, trial % 3 == 0);
            float[] sorted = Arrays.copyOf(f, n);
            Arrays.sort(sorted);
            double q = trial % 2 == 0 ? 0.95 : rnd.nextDouble();
            double h = (n - 1) * q;
            int lo = (int) Math.floor(h), hi = Math.min(n - 1, lo + 1);
            double expected = sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
            assertEquals(expected, OrderStatistics.percentile(f, n, q), 0.0, "n " + n + " q " + q);
        }
    }

    @Test
    void selectPartitionsAroundTheKthSmallest() {
        // the k-th smallest by definition: position k of the values sorted by the JDK's Arrays.sort
        Random rnd = new Random(5);
        for (int trial = 0; trial < 300; trial++) {
            int n = 1 + rnd.nextInt(500);
            float[] f = values(rnd, n, trial % 2 == 0);
            float[] sorted = f.clone();
            Arrays.sort(sorted);
            int k = rnd.nextInt(n);
            float v = OrderStatistics.select(f, n, k);
            assertEquals(sorted[k], v, 0f);
            for (int i = 0; i < k; i++) assertTrue(f[i] <= v, "left of k");
            for (int i = k + 1; i < n; i++) assertTrue(f[i] >= v, "right of k");
            float[] after = f.clone();
            Arrays.sort(after);
            assertTrue(Arrays.equals(sorted, after), "a permutation of the input");
        }
    }

    @Test
    void selectLeavesValuesBeyondNAlone() {
        float[] f = {5, 4, 3, 2, 1, -100, -200};
        assertEquals(3f, OrderStatistics.select(f, 5, 2));
        assertEquals(-100f, f[5]);
        assertEquals(-200f, f[6]);
        assertEquals(0f, OrderStatistics.select(new float[0], 0, 0), "nothing to select");
        assertThrows(IllegalArgumentException.class, () -> OrderStatistics.select(f, 5, 5));
    }

    @Test
    void mediansMatchCommonsMath() {
        // commons-math3 Median: the middle value, the mean of the two middle ones for an even count
        Random rnd = new Random(11);
        Median median = new Median();
        for (int n = 1; n <= 80; n++) {
            float[] f = values(rnd, n, n % 3 == 0);
            double[] d = widen(f);
            assertEquals(median.evaluate(d), OrderStatistics.median(f.clone(), n), 1e-6, "n " + n);
            float[] sorted = f.clone();
            Arrays.sort(sorted);
            double sortedMedian = (n & 1) == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
            assertEquals(sortedMedian, OrderStatistics.median(f.clone(), n), 0.0, "as from the sorted values, n " + n);
        }
        assertThrows(IllegalArgumentException.class, () -> OrderStatistics.median(new float[3], 0));
    }
}
