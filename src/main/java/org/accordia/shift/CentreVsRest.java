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
 * <p><b>Family-wise error: sequentially rejective, the rejected centre leaves the rest.</b> Holm's
 * step-down procedure (Holm 1979, Scand J Statist 6:65–70) with one change: after each rejection
 * the rejected centre's readers leave the study before the next step, so "the rest" is recomputed
 * (in the spirit of sequential outlier tests, Rosner 1983, Technometrics 25:165–172). Step j
 * (j = 1, 2, ...) with k active centres: each active centre is tested against the other active
 * centres' readers; the smallest p is compared with α/k (Holm's threshold at that step); when it
 * passes, that centre is rejected (flag candidate) and removed; otherwise, or when only two
 * centres remain (two centres cannot say which one departs), the procedure stops. Adjusted p of a
 * rejected centre: the running maximum of k·p over the steps so far; of a centre still active at
 * the stop: max(running maximum, k·p) with its p from the last step.
 *
 * <p>Why the removal: with a shifted centre d still in "the rest", an innocent centre c's split
 * can beat the splits that mix d's readers (when d's readers disperse less among themselves than
 * the others do, as larger spheres do under 1 − Jaccard), so its p can reach 2/84 in one of about
 * twenty studies, and plain Holm (which then tests c at α/2) let innocent centres through in a
 * simulation (docs/shift.md, section 6). Once d has left, the remaining centres are compared among
 * themselves, where the permutation test is exact. Under the global null the first step alone
 * decides (Bonferroni at α/G, FWER ≤ α); under partial nulls an innocent centre can only be
 * rejected by having the smallest p while a shifted centre is still active (rare when the shift
 * is large enough to matter) or in the exact test among innocent centres (≤ α): the strong
 * control is checked by simulation, not proven.
 *
 * <p>With two centres the two splits are the same partition and the family is one test (the pair
 * differs, which one cannot be said): no adjustment.
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
     * @param rejected        whether the procedure rejected this centre (it departs from the rest)
     */
    public record Result(String centre, int readers, double pseudoF, double pValue, double adjustedP,
            long permutations, boolean exact, double minP, boolean canReachAlpha, boolean rejected) {

        /** Whether the centre's own test rejected at the family-wise level α the procedure ran at. */
        public boolean rejects(double alpha) {
            return rejected;
        }
    }

    /** How the family-wise error rate is controlled, in words, for the given number of centres. */
    public static String method(int centres) {
        return centres == 2 ? "one test for the pair (two centres: the two splits are the same partition)"
                : "Holm step-down over the " + centres + " centre-vs-rest tests, each rejected centre removed from "
                        + "the rest before the next step";
    }

    /**
     * The tests of every centre with a usable reader, sorted by centre name: the sequentially
     * rejective procedure described in the class comment.
     *
     * @param cases         per-case distance matrices
     * @param readerCentre  reader → centre
     * @param alpha         the family-wise level
     * @param monteCarlo    random splits when enumeration is too large
     * @param exactLimit    enumerate when the number of distinct splits is at most this
     * @param seed          seed of the Monte Carlo generator (step j, centre i uses
     *                      seed + 7919 · (i + 1) + 104729 · j)
     */
    public static List<Result> test(List<CaseDistances> cases, Map<String, String> readerCentre, double alpha,
            int monteCarlo, long exactLimit, long seed) {
        DistancePartition.Design design = DistancePartition.Design.of(cases, readerCentre);
        List<String> centres = design.centres;
        int g = centres.size();
        List<Result> out = new ArrayList<>();
        if (g < 2) {
            return out;
        }
        Map<String, Result> decided = new TreeMap<>();
        if (g == 2) {
            // one split, one test: no adjustment
            for (Result r : step(cases, readerCentre, centres, alpha, monteCarlo, exactLimit, seed)) {
                decided.put(r.centre(), with(r, r.pValue(), r.minP() <= alpha * (1 + 1e-12),
                        r.pValue() <= alpha * (1 + 1e-12)));
            }
        } else {
            List<String> active = new ArrayList<>(centres);
            double running = 0;
            for (int step = 0; ; step++) {
                List<Result> raw = step(cases, readerCentre, active, alpha, monteCarlo, exactLimit,
                        seed + 104_729L * step);
                int family = active.size();
                Result best = raw.stream().filter(r -> !Double.isNaN(r.pValue()))
                        .min(Comparator.comparingDouble(Result::pValue).thenComparing(Result::centre)).orElse(null);
                boolean rejects = best != null && family * best.pValue() <= alpha * (1 + 1e-12);
                if (rejects) {
                    running = Math.max(running, Math.min(1.0, family * best.pValue()));
                    decided.put(best.centre(), with(best, running, true, true));
                    active.remove(best.centre());
                }
                if (!rejects || active.size() <= 2) {
                    // the centres still active keep their p from this step, adjusted as at Holm's later steps;
                    // two centres left cannot say which one departs, so the procedure stops there
                    for (Result r : raw) {
                        if (active.contains(r.centre())) {
                            double adj = Double.isNaN(r.pValue()) ? Double.NaN
                                    : Math.max(running, Math.min(1.0, family * r.pValue()));
                            decided.put(r.centre(), with(r, adj, family * r.minP() <= alpha * (1 + 1e-12), false));
                        }
                    }
                    break;
                }
            }
        }
        out.addAll(decided.values());
        out.sort(Comparator.comparing(Result::centre));
        return out;
    }

    private static Result with(Result r, double adjusted, boolean reach, boolean rejected) {
        return new Result(r.centre(), r.readers(), r.pseudoF(), r.pValue(), adjusted, r.permutations(), r.exact(),
                r.minP(), reach, rejected);
    }

    /** One step: each active centre against the other active centres' readers (unadjusted). */
    private static List<Result> step(List<CaseDistances> cases, Map<String, String> readerCentre, List<String> active,
            double alpha, int monteCarlo, long exactLimit, long seed) {
        List<CaseDistances> kept = restrict(cases, readerCentre, active);
        DistancePartition.Design design = DistancePartition.Design.of(kept, readerCentre);
        TreeSet<String> used = new TreeSet<>(design.readers);
        List<Result> raw = new ArrayList<>();
        for (int i = 0; i < active.size(); i++) {
            String c = active.get(i);
            Map<String, String> split = new TreeMap<>();
            int members = 0;
            for (var e : readerCentre.entrySet()) {
                boolean in = e.getValue().equals(c);
                split.put(e.getKey(), in ? "0" : "1");
                members += in && used.contains(e.getKey()) ? 1 : 0;
            }
            PermutationResult t = PermutationTest.test(kept, split, alpha, monteCarlo, exactLimit,
                    seed + 7919L * (i + 1));
            raw.add(new Result(c, members, t.pseudoF(), t.pValue(), Double.NaN, t.permutations(), t.exact(), t.minP(),
                    false, false));
        }
        return raw;
    }

    /** The cases with only the readers of the given centres (cases left with fewer than two readers dropped). */
    static List<CaseDistances> restrict(List<CaseDistances> cases, Map<String, String> readerCentre,
            List<String> centres) {
        List<CaseDistances> out = new ArrayList<>();
        for (CaseDistances c : cases) {
            List<Integer> keep = new ArrayList<>();
            for (int i = 0; i < c.readers().size(); i++) {
                if (centres.contains(readerCentre.get(c.readers().get(i)))) {
                    keep.add(i);
                }
            }
            if (keep.size() == c.readers().size()) {
                out.add(c);
                continue;
            }
            if (keep.size() < 2) {
                continue;
            }
            double[][] d = new double[keep.size()][keep.size()];
            List<String> ids = new ArrayList<>();
            for (int a = 0; a < keep.size(); a++) {
                ids.add(c.readers().get(keep.get(a)));
                for (int b = 0; b < keep.size(); b++) {
                    d[a][b] = c.distance(keep.get(a), keep.get(b));
                }
            }
            out.add(new CaseDistances(c.caseId(), ids, d));
        }
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
