package org.accordia.bench;

import org.apache.commons.math3.distribution.BetaDistribution;

/**
 * Exact (Clopper–Pearson) confidence interval of a binomial proportion: the lower limit is the
 * α/2 quantile of Beta(k, n − k + 1) and the upper limit the 1 − α/2 quantile of
 * Beta(k + 1, n − k), with lower = 0 when k = 0 and upper = 1 when k = n.
 * Clopper, C. J. and Pearson, E. S. (1934), "The use of confidence or fiducial limits illustrated
 * in the case of the binomial", Biometrika 26(4), 404–413. Matches R's {@code binom.test}.
 *
 * @param successes k, 0 ≤ k ≤ n
 * @param trials n ≥ 1
 * @param lower lower limit
 * @param upper upper limit
 */
public record BinomialInterval(int successes, int trials, double lower, double upper) {

    /** The 95 % interval. */
    public static BinomialInterval of95(int successes, int trials) {
        return of(successes, trials, 0.95);
    }

    /**
     * @throws IllegalArgumentException when n &lt; 1, k outside 0..n or the level outside (0, 1)
     */
    public static BinomialInterval of(int successes, int trials, double level) {
        if (trials < 1 || successes < 0 || successes > trials) {
            throw new IllegalArgumentException("need 0 <= successes <= trials and trials >= 1");
        }
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("level must lie in (0, 1)");
        }
        double a = (1 - level) / 2;
        double lo = successes == 0 ? 0
            : new BetaDistribution(null, successes, trials - successes + 1.0, 1e-14).inverseCumulativeProbability(a);
        double hi = successes == trials ? 1
            : new BetaDistribution(null, successes + 1.0, trials - successes, 1e-14).inverseCumulativeProbability(1 - a);
        return new BinomialInterval(successes, trials, lo, hi);
    }

    /** The observed proportion k / n. */
    public double rate() {
        return (double) successes / trials;
    }
}
