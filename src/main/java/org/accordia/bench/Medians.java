package org.accordia.bench;

import java.util.Arrays;

/** Medians of timing samples (the median of an even count is the mean of the two middle values). */
public final class Medians {
    private Medians() {
    }

    /** Median of the samples; NaN when there are none. Does not modify the input. */
    public static double of(long[] samples) {
        if (samples.length == 0) {
            return Double.NaN;
        }
        long[] s = samples.clone();
        Arrays.sort(s);
        int n = s.length;
        return n % 2 == 1 ? s[n / 2] : (s[n / 2 - 1] + (double) s[n / 2]) / 2;
    }

    /** Median of the samples; NaN when there are none. Does not modify the input. */
    public static double of(double[] samples) {
        return org.accordia.stats.Quantiles.median(samples);
    }
}
