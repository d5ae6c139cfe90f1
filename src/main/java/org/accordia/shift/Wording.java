package org.accordia.shift;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.Locale;
import org.apache.commons.math3.distribution.BetaDistribution;

/**
 * Numbers in sentences with the precision they have: a level written as "α = 0.05" (not
 * "alpha = 0.05000"), an exact permutation p-value with its count of partitions, a Monte Carlo
 * p-value with its 95 % Clopper–Pearson interval, and a value compared with a threshold written
 * with enough decimals that the written value stands on the same side of the threshold as the
 * true one ("median pairwise Dice 0.698 is below 0.70", never "0.70 is below 0.70"). Every
 * method is deterministic and locale-free.
 */
public final class Wording {
    /** Most decimals {@link #beside} adds before giving up (the values are then written as equal). */
    private static final int MAX_EXTRA_DECIMALS = 6;

    private Wording() {
    }

    /**
     * A plain number with at most {@code significant} significant digits, trailing zeros stripped:
     * 0.05 → "0.05", 0.1 → "0.1", 0.010714 → "0.0107" (3 digits), −0.0 → "0".
     */
    public static String plain(double x, int significant) {
        if (!Double.isFinite(x)) {
            return "undefined";
        }
        if (x == 0) {
            return "0";
        }
        BigDecimal r = new BigDecimal(x).round(new MathContext(significant, RoundingMode.HALF_EVEN))
                .stripTrailingZeros();
        return r.signum() == 0 ? "0" : r.toPlainString();
    }

    /** The level of a test: "α = 0.05". */
    public static String alpha(double alpha) {
        return "α = " + plain(alpha, 4);
    }

    /**
     * {@code x} with {@code decimals} decimals, more when needed so that the written value is on the
     * same side of every threshold as {@code x} (and keeps its sign: a small negative value never
     * shows as "−0.0" or "0.0"). Thresholds are compared as written with the same decimals.
     */
    public static String beside(double x, int decimals, double... thresholds) {
        if (!Double.isFinite(x)) {
            return "undefined";
        }
        for (int d = decimals; d <= decimals + MAX_EXTRA_DECIMALS; d++) {
            double shown = round(x, d);
            boolean ok = !(shown == 0 && x != 0);
            for (double t : thresholds) {
                ok &= Double.compare(Math.signum(shown - round(t, d)), Math.signum(x - t)) == 0;
            }
            if (ok) {
                return fixed(shown, d);
            }
        }
        return fixed(round(x, decimals + MAX_EXTRA_DECIMALS), decimals + MAX_EXTRA_DECIMALS);
    }

    /**
     * The threshold with as many decimals as {@link #beside} used for {@code x}, so both read
     * alike ("0.698 is below 0.700").
     */
    public static String threshold(double t, double x, int decimals) {
        String shown = beside(x, decimals, t);
        int dot = shown.indexOf('.');
        int d = dot < 0 ? 0 : shown.length() - dot - 1;
        return fixed(round(t, d), d);
    }

    private static double round(double x, int decimals) {
        return new BigDecimal(x).setScale(decimals, RoundingMode.HALF_EVEN).doubleValue();
    }

    private static String fixed(double x, int decimals) {
        String s = String.format(Locale.ROOT, "%." + decimals + "f", x);
        return s.matches("-0(\\.0*)?") ? s.substring(1) : s;
    }

    /**
     * The permutation p-value in words with its precision:
     * <ul>
     * <li>exact: "p = 0.1 (1 of 10 distinct reader partitions, the smallest reachable)",
     * "p = 0.0107 (3 of 280 distinct reader partitions)" — the count k = p × n is exact, the decimal
     * has 3 significant digits;</li>
     * <li>Monte Carlo: "p = 0.0013 (Monte Carlo: 12 of 9,999 random reader permutations at least
     * as large; 95% interval 0.00069 to 0.0022)" — p = (1 + k)/(1 + m) (Phipson &amp; Smyth 2010) with 2
     * significant digits, and the exact Clopper–Pearson interval (Clopper &amp; Pearson 1934) of the
     * permutation p-value that infinitely many permutations would give, from k of m.</li>
     * </ul>
     */
    public static String pValue(PermutationResult t) {
        return pValue(t.pValue(), t.permutations(), t.exact(), "distinct reader partitions",
                "random reader permutations");
    }

    /**
     * As {@link #pValue(PermutationResult)} for any permutation p-value.
     *
     * @param p            the p-value (exact: k/n; Monte Carlo: (1 + k)/(1 + m))
     * @param permutations n (exact) or m (Monte Carlo)
     * @param exact        whether all n were enumerated
     * @param exactNoun    what was enumerated, e.g. "distinct reader partitions"
     * @param randomNoun   what was drawn, e.g. "random reader permutations"
     */
    public static String pValue(double p, long permutations, boolean exact, String exactNoun, String randomNoun) {
        if (Double.isNaN(p)) {
            return "p undefined";
        }
        if (exact) {
            long n = permutations;
            long k = Math.round(p * n);
            return String.format(Locale.ROOT, "p = %s (%d of %,d %s%s)", plain(p, 3), k, n, exactNoun,
                    k == 1 ? ", the smallest reachable" : "");
        }
        long m = permutations;
        long k = Math.max(0, Math.round(p * (m + 1)) - 1);
        double[] ci = clopperPearson(k, m);
        return String.format(Locale.ROOT, "p = %s (Monte Carlo: %,d of %,d %s at least as large; 95%% interval %s "
                + "to %s)", plain(p, 2), k, m, randomNoun, plain(ci[0], 2), plain(ci[1], 2));
    }

    /**
     * Exact (Clopper–Pearson) 95 % interval of a binomial proportion from k successes in n trials:
     * the 2.5 % quantile of Beta(k, n − k + 1) and the 97.5 % quantile of Beta(k + 1, n − k);
     * 0 when k = 0 and 1 when k = n.
     */
    public static double[] clopperPearson(long k, long n) {
        if (n <= 0) {
            return new double[] {Double.NaN, Double.NaN};
        }
        double lo = k == 0 ? 0 : new BetaDistribution(k, n - k + 1).inverseCumulativeProbability(0.025);
        double hi = k == n ? 1 : new BetaDistribution(k + 1, n - k).inverseCumulativeProbability(0.975);
        return new double[] {lo, hi};
    }
}
