package org.accordia.shift;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * Per-centre evidence: each centre against the rest, with the family-wise error rate controlled
 * across centres.
 *
 * <p><b>Statistic and permutations.</b> For centre c the readers are split in two groups, c's
 * readers and all other readers, and the pooled pseudo-F of that two-group partition is computed
 * from the per-case distance matrices exactly as the omnibus test does ({@link DistancePartition},
 * Anderson 2001). Its reference distribution is that of {@link PermutationTest}: readers are the
 * exchangeable units, one permutation chooses which n_c readers play "centre c" and is applied to
 * every case; all C(N, n_c) distinct subsets are enumerated when there are at most
 * {@code exactLimit} of them (for n_c = N − n_c the two groups are interchangeable and half of them
 * suffice), seeded Monte Carlo otherwise; the smallest reachable p is 1/#subsets (exact) or
 * 1/(m + 1) (Monte Carlo).
 *
 * <p><b>Why the mirror effect stays out.</b> When another centre d draws Δ wider, an innocent
 * centre c looks Δ/(G−1) narrower than the rest, but so does every other subset of readers that
 * leaves d's readers in the rest: the "rest" group then holds d's readers and disperses as much as
 * it does for c, so c's split is just one of many equally extreme splits and its p is large. In a
 * one-dimensional idealisation with G = 3 × 3 readers and Δ much larger than the noise, 39 of the 84
 * subsets are at least as extreme as an innocent centre's (p ≈ 0.46), while the shifted centre's
 * own split is the single most extreme one (p = 1/84). The strong family-wise error control in
 * such partial-null configurations is not a theorem here (a shifted centre makes the "rest" a
 * mixture); it is checked by simulation (docs/shift.md, section 6).
 *
 * <p><b>Family-wise error.</b> Holm's step-down procedure over the G centre-vs-rest p-values
 * (Holm 1979, Scand J Statist 6:65–70): sorted ascending, adjusted p_(i) = max_{j≤i} min(1,
 * (G − j + 1) p_(j)); a centre's test rejects when its adjusted p ≤ α. Holm needs no assumption on
 * the dependence between the G tests. With two centres the two splits are the same partition and
 * the family is one test (the pair differs, which one cannot be said): no adjustment.
 *
 * <p><b>Reachability.</b> A centre that departs alone is rejected only when G · p ≤ α, so its
 * test {@code canReachAlpha} when G · minP ≤ α (minP ≤ α for two centres). A centre with one reader
 * in a study of N readers has minP = 1/N: with fewer than 20 readers it can never be flagged by
 * its own test, and its effect cannot be told apart from its reader's bias anyway.
 */
public final class CentreVsRest {
    private CentreVsRest() {
    }

    /**
     * One centre's test.
     *
     * @param centre          centre name
     * @param readers         the centre's readers with usable distances
     * @param pseudoF         pooled pseudo-F of the split centre vs the rest
     * @param pValue          permutation p-value of that split (NaN when not applicable)
     * @param adjustedP       Holm-adjusted p-value (equal to pValue with two centres)
     * @param permutations    distinct splits enumerated (exact) or random splits drawn
     * @param exact           whether all distinct splits were enumerated
     * @param minP            the smallest p this split can produce
     * @param canReachAlpha   whether the centre, departing alone, can reach α after the adjustment
     */
    public record Result(String centre, int readers, double pseudoF, double pValue, double adjustedP,
            long permutations, boolean exact, double minP, boolean canReachAlpha) {

        /** Whether the centre's own adjusted test rejects at α. */
        public boolean rejects(double alpha) {
            return canReachAlpha && adjustedP <= alpha;
        }
    }

    /** How the family-wise error rate is controlled, in words, for the given number of centres. */
    public static String method(int centres) {
        return centres == 2 ? "one test for the pair (two centres: the two splits are the same partition)"
                : "Holm step-down over the " + centres + " centre-vs-rest tests";
    }

    /**
     * The tests of every centre with a usable reader, sorted by centre name.
     *
     * @param cases         per-case distance matrices
     * @param readerCentre  reader → centre
     * @param alpha         the family-wise level
     * @param monteCarlo    random splits when enumeration is too large
     * @param exactLimit    enumerate when the number of distinct splits is at most this
     * @param seed          seed of the Monte Carlo generator (centre i uses seed + 7919 · (i + 1))
     */
    public static List<Result> test(List<CaseDistances> cases, Map<String, String> readerCentre, double alpha,
            int monteCarlo, long exactLimit, long seed) {
        DistancePartition.Design design = DistancePartition.Design.of(cases, readerCentre);
        List<String> centres = design.centres;
        int g = centres.size();
        List<Result> raw = new ArrayList<>();
        if (g < 2) {
            return raw;
        }
        TreeSet<String> used = new TreeSet<>(design.readers);
        for (int i = 0; i < g; i++) {
            String c = centres.get(i);
            Map<String, String> split = new TreeMap<>();
            int members = 0;
            for (var e : readerCentre.entrySet()) {
                boolean in = e.getValue().equals(c);
                split.put(e.getKey(), in ? "0" : "1");
                members += in && used.contains(e.getKey()) ? 1 : 0;
            }
            PermutationResult t = PermutationTest.test(cases, split, alpha, monteCarlo, exactLimit,
                    seed + 7919L * (i + 1));
            raw.add(new Result(c, members, t.pseudoF(), t.pValue(), Double.NaN, t.permutations(), t.exact(), t.minP(),
                    false));
        }
        double[] adjusted = g == 2 ? raw.stream().mapToDouble(Result::pValue).toArray()
                : holm(raw.stream().mapToDouble(Result::pValue).toArray());
        int family = g == 2 ? 1 : g;
        List<Result> out = new ArrayList<>();
        for (int i = 0; i < g; i++) {
            Result r = raw.get(i);
            out.add(new Result(r.centre(), r.readers(), r.pseudoF(), r.pValue(), adjusted[i], r.permutations(),
                    r.exact(), r.minP(), family * r.minP() <= alpha * (1 + 1e-12)));
        }
        out.sort(Comparator.comparing(Result::centre));
        return out;
    }

    /**
     * Holm-adjusted p-values (Holm 1979) in the input order: sorted ascending, the i-th smallest
     * (1-based) gets max over j ≤ i of min(1, (m − j + 1) p_(j)), m the number of finite p-values.
     * NaN stays NaN and does not count in m. Ties keep their input order (the result is the same).
     */
    public static double[] holm(double[] p) {
        Integer[] order = new Integer[p.length];
        int m = 0;
        for (int i = 0; i < p.length; i++) {
            order[i] = i;
            m += Double.isNaN(p[i]) ? 0 : 1;
        }
        java.util.Arrays.sort(order, Comparator.comparingDouble((Integer i) -> Double.isNaN(p[i])
                ? Double.POSITIVE_INFINITY : p[i]));
        double[] out = new double[p.length];
        double running = 0;
        for (int k = 0; k < p.length; k++) {
            int i = order[k];
            if (Double.isNaN(p[i])) {
                out[i] = Double.NaN;
                continue;
            }
            running = Math.max(running, Math.min(1.0, (m - k) * p[i]));
            out[i] = running;
        }
        return out;
    }
}
