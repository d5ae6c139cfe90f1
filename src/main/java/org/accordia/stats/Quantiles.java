package org.accordia.stats;

/**
 * Sample quantiles by linear interpolation between order statistics: definition 7 of Hyndman
 * &amp; Fan (1996, "Sample Quantiles in Statistical Packages", The American Statistician
 * 50:361–365), the default of R's {@code quantile} and of numpy's {@code percentile}. For sorted
 * values {@code x[0] ≤ … ≤ x[n−1]} and {@code 0 ≤ p ≤ 1}: {@code h = (n − 1)·p},
 * {@code Q = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋])}. Empty input gives NaN.
 *
 * <p>Selection runs in expected linear time (three-way quickselect, so long runs of equal values
 * such as many zero distances cost nothing extra); the input range is reordered.
 */
public final class Quantiles {
    private Quantiles() {
    }

    /** Type-7 quantile of {@code a[0..n)}, reordering that range; NaN when {@code n == 0}. */
    public static double type7InPlace(double[] a, int n, double p) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException("p must lie in [0, 1]");
        }
        if (n == 0) {
            return Double.NaN;
        }
        double h = (n - 1) * p;
        int lo = (int) Math.floor(h);
        double frac = h - lo;
        double xlo = select(a, n, lo);
        if (frac == 0 || lo + 1 >= n) {
            return xlo;
        }
        double xhi = Double.POSITIVE_INFINITY;
        for (int i = lo + 1; i < n; i++) {
            if (a[i] < xhi) {
                xhi = a[i];
            }
        }
        return xlo + frac * (xhi - xlo);
    }

    /** Type-7 quantile of a copy of {@code values}; the input is left untouched. */
    public static double type7(double[] values, double p) {
        return type7InPlace(values.clone(), values.length, p);
    }

    /**
     * Type-7 quantile of values already sorted ascending (no copy, no reordering); NaN when empty.
     * The same interpolation as {@link #type7InPlace}.
     */
    public static double type7Sorted(double[] sorted, double p) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException("p must lie in [0, 1]");
        }
        if (sorted.length == 0) {
            return Double.NaN;
        }
        double h = (sorted.length - 1) * p;
        int lo = (int) Math.floor(h);
        int hi = Math.min(lo + 1, sorted.length - 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }

    /**
     * The median of the values that are not NaN: the middle value, or the mean of the two middle
     * values {@code (a + b) / 2} for an even count; NaN when none. The input is left untouched.
     */
    public static double median(double[] values) {
        double[] x = java.util.Arrays.stream(values).filter(d -> !Double.isNaN(d)).sorted().toArray();
        if (x.length == 0) {
            return Double.NaN;
        }
        int n = x.length;
        return n % 2 == 1 ? x[n / 2] : (x[n / 2 - 1] + x[n / 2]) / 2;
    }

    /**
     * Places the {@code k}-th smallest (0-based) of {@code a[0..n)} at index {@code k}, smaller
     * or equal values before it and greater or equal after; returns it.
     */
    static double select(double[] a, int n, int k) {
        int left = 0;
        int right = n - 1;
        while (right > left) {
            // median of three as pivot (deterministic)
            int mid = (left + right) >>> 1;
            double x = a[left];
            double y = a[mid];
            double z = a[right];
            double pivot = x < y ? (y < z ? y : Math.max(x, z)) : (x < z ? x : Math.max(y, z));
            // three-way partition: [left, lt) < pivot, [lt, gt] == pivot, (gt, right] > pivot
            int lt = left;
            int gt = right;
            int i = left;
            while (i <= gt) {
                double v = a[i];
                if (v < pivot) {
                    a[i++] = a[lt];
                    a[lt++] = v;
                } else if (v > pivot) {
                    a[i] = a[gt];
                    a[gt--] = v;
                } else {
                    i++;
                }
            }
            if (k < lt) {
                right = lt - 1;
            } else if (k > gt) {
                left = gt + 1;
            } else {
                return pivot;
            }
        }
        return a[k];
    }
}
