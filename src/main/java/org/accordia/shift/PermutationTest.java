package org.accordia.shift;

import java.math.BigInteger;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;

/**
 * Permutation test of a centre effect on the pooled pseudo-F of {@link DistancePartition}.
 *
 * <p>Exchangeable units are the readers, not the reader-case cells: the same readers read every
 * case, so a reader's cases are not independent of each other. Under the null hypothesis of no
 * centre effect, the reader → centre labels are exchangeable; one permutation re-assigns the
 * labels (keeping each centre's number of readers) and applies the same assignment to every case
 * (cases are strata in the statistic, not in the permutation). Statistic: pooled pseudo-F.
 *
 * <p>The pseudo-F depends only on the partition of readers into groups, not on which centre name a
 * group carries. All distinct partitions with the observed group sizes (unlabelled: groups of
 * equal size are interchangeable) are enumerated exactly when there are at most
 * {@code exactLimit} of them; each partition stands for the same number Π_s m_s! of labelled
 * assignments (m_s = number of centres with s readers), so the p-value over partitions equals the
 * p-value over labelled assignments. Exact p = #{partitions with F* ≥ F}/#partitions (the observed
 * partition is one of them), smallest reachable p = 1/#partitions. Otherwise Monte Carlo with
 * {@code m} seeded random assignments, p = (1 + #{F* ≥ F})/(1 + m) (Phipson &amp; Smyth 2010,
 * common practice), smallest p = 1/(m + 1). Ties: F* counts as ≥ F when F* ≥ F − 1e-12·|F|
 * (common practice against floating-point ties).
 *
 * <p>Anderson 2001 (Austral Ecology 26:32–46); Manly, Randomization, Bootstrap and Monte Carlo
 * Methods in Biology (common practice for exact enumeration).
 */
public final class PermutationTest {
    static final double RELATIVE_TIE_TOLERANCE = 1e-12;

    private PermutationTest() {
    }

    /** Runs the test with the settings' α, permutation count, exact limit and seed. */
    public static PermutationResult test(List<CaseDistances> cases, Map<String, String> readerCentre,
            ShiftSettings settings) {
        return test(cases, readerCentre, settings.alpha(), settings.permutations(), settings.exactLimit(),
                settings.seed());
    }

    /**
     * Runs the test.
     *
     * @param alpha        significance level (for {@code canReachAlpha} and the statement)
     * @param monteCarlo   random permutations when enumeration is too large
     * @param exactLimit   enumerate when the number of distinct partitions is at most this
     * @param seed         seed of the Monte Carlo generator
     */
    public static PermutationResult test(List<CaseDistances> cases, Map<String, String> readerCentre,
            double alpha, int monteCarlo, long exactLimit, long seed) {
        DistancePartition.Design design = DistancePartition.Design.of(cases, readerCentre);
        int groups = design.groupCount();
        int[] observed = design.observedGroups();
        int n = observed.length;
        if (groups < 2) {
            return new PermutationResult(Double.NaN, Double.NaN, 0, true, 1.0, false,
                    "Only one centre has readers with defined distances; there is no between-centre "
                            + "comparison to test.");
        }
        double[] sum = new double[groups];
        int[] size = new int[groups];
        double f = design.pseudoF(observed, sum, size);
        int[] groupSizes = new int[groups];
        for (int g : observed) {
            groupSizes[g]++;
        }
        BigInteger partitions = distinctPartitions(groupSizes);
        if (Double.isNaN(f)) {
            return new PermutationResult(f, Double.NaN, 0, true, 1.0 / partitions.doubleValue(), false,
                    "The pseudo-F is undefined (no within-centre or no between-centre degrees of freedom, "
                            + "or all distances are zero); nothing to test.");
        }
        long count;
        long total;
        boolean exact = partitions.compareTo(BigInteger.valueOf(exactLimit)) <= 0;
        double p;
        double minP;
        if (exact) {
            long[] counters = new long[2];
            int[] assign = new int[n];
            int[] remaining = groupSizes.clone();
            enumerate(0, assign, remaining, groupSizes, design, f, sum, size, counters);
            count = counters[0];
            total = counters[1];
            if (total != partitions.longValueExact()) {
                throw new IllegalStateException("enumeration count " + total + " != " + partitions);
            }
            p = (double) count / total;
            minP = 1.0 / total;
        } else {
            SplittableRandom random = new SplittableRandom(seed);
            int[] assign = observed.clone();
            count = 0;
            for (int i = 0; i < monteCarlo; i++) {
                for (int k = n - 1; k > 0; k--) {
                    int j = random.nextInt(k + 1);
                    int t = assign[k];
                    assign[k] = assign[j];
                    assign[j] = t;
                }
                if (atLeast(design.pseudoF(assign, sum, size), f)) {
                    count++;
                }
            }
            total = monteCarlo;
            p = (1.0 + count) / (1.0 + monteCarlo);
            minP = 1.0 / (1.0 + monteCarlo);
        }
        boolean reach = minP <= alpha;
        String statement = reach ? "" : unreachable(groupSizes, design, total, exact, minP, alpha);
        return new PermutationResult(f, p, total, exact, minP, reach, statement);
    }

    /** Number of distinct unlabelled partitions of Σ sizes readers into groups of these sizes. */
    public static BigInteger distinctPartitions(int[] groupSizes) {
        int n = 0;
        for (int s : groupSizes) {
            n += s;
        }
        BigInteger result = factorial(n);
        Map<Integer, Integer> multiplicity = new TreeMap<>();
        for (int s : groupSizes) {
            result = result.divide(factorial(s));
            multiplicity.merge(s, 1, Integer::sum);
        }
        for (int m : multiplicity.values()) {
            result = result.divide(factorial(m));
        }
        return result;
    }

    static boolean atLeast(double fStar, double f) {
        if (Double.isInfinite(f)) {
            return fStar == f;
        }
        return fStar >= f - RELATIVE_TIE_TOLERANCE * Math.abs(f);
    }

    /**
     * Assigns readers 0..n−1 in order; a reader may open an empty group only when no earlier group
     * of the same size is still empty, so equal-sized groups are ordered by their smallest member
     * and each unlabelled partition is produced exactly once.
     */
    private static void enumerate(int reader, int[] assign, int[] remaining, int[] groupSizes,
            DistancePartition.Design design, double f, double[] sum, int[] size, long[] counters) {
        if (reader == assign.length) {
            counters[1]++;
            if (atLeast(design.pseudoF(assign, sum, size), f)) {
                counters[0]++;
            }
            return;
        }
        for (int g = 0; g < remaining.length; g++) {
            if (remaining[g] == 0) {
                continue;
            }
            if (remaining[g] == groupSizes[g] && earlierEmptyTwin(g, remaining, groupSizes)) {
                continue;
            }
            remaining[g]--;
            assign[reader] = g;
            enumerate(reader + 1, assign, remaining, groupSizes, design, f, sum, size, counters);
            remaining[g]++;
        }
    }

    private static boolean earlierEmptyTwin(int g, int[] remaining, int[] groupSizes) {
        for (int h = 0; h < g; h++) {
            if (groupSizes[h] == groupSizes[g] && remaining[h] == groupSizes[h]) {
                return true;
            }
        }
        return false;
    }

    private static String unreachable(int[] groupSizes, DistancePartition.Design design, long total,
            boolean exact, double minP, double alpha) {
        StringBuilder sizes = new StringBuilder();
        for (int g = 0; g < groupSizes.length; g++) {
            if (g > 0) {
                sizes.append(", ");
            }
            sizes.append(design.centres.get(g)).append(": ").append(groupSizes[g]);
        }
        String how = exact
                ? "the readers can be split between the centres in only " + total + " distinct way"
                        + (total == 1 ? "" : "s")
                : "only " + total + " random permutations were drawn";
        return String.format(Locale.ROOT,
                "With readers per centre (%s) %s, so the smallest attainable p-value is %s, above "
                        + "%s: this design cannot show a centre effect at that level whatever the "
                        + "data, and a non-significant result is not evidence that there is no shift.",
                sizes, how, Wording.plain(minP, 3), Wording.alpha(alpha));
    }

    private static BigInteger factorial(int n) {
        BigInteger r = BigInteger.ONE;
        for (int i = 2; i <= n; i++) {
            r = r.multiply(BigInteger.valueOf(i));
        }
        return r;
    }
}
