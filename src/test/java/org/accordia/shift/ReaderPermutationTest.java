package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigInteger;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The reader-level permutation test against an independent brute-force oracle that enumerates
 * all N! reader permutations and computes the pooled pseudo-F from the definitions (Anderson 2001)
 * straight from the distance matrices.
 */
class ReaderPermutationTest {

    /** Pooled pseudo-F written directly from the formulas, one case at a time. */
    static double naiveF(List<CaseDistances> cases, Map<String, String> centreOf) {
        double ssT = 0;
        double ssW = 0;
        int dfB = 0;
        int dfW = 0;
        for (CaseDistances c : cases) {
            List<String> r = c.readers();
            double[][] d = c.distances();
            int n = r.size();
            Map<String, List<Integer>> members = new HashMap<>();
            for (int i = 0; i < n; i++) {
                members.computeIfAbsent(centreOf.get(r.get(i)), k -> new ArrayList<>()).add(i);
            }
            for (int i = 0; i < n; i++) {
                for (int j = i + 1; j < n; j++) {
                    ssT += d[i][j] * d[i][j] / n;
                }
            }
            for (List<Integer> g : members.values()) {
                for (int a = 0; a < g.size(); a++) {
                    for (int b = a + 1; b < g.size(); b++) {
                        double v = d[g.get(a)][g.get(b)];
                        ssW += v * v / g.size();
                    }
                }
            }
            dfB += members.size() - 1;
            dfW += n - members.size();
        }
        return ((ssT - ssW) / dfB) / (ssW / dfW);
    }

    /** Brute force: p over all N! labelled reader permutations (each re-labels readers). */
    static double[] naivePermutationP(List<CaseDistances> cases, Map<String, String> centreOf, List<String> readers) {
        double f = naiveF(cases, centreOf);
        List<String> labels = readers.stream().map(centreOf::get).toList();
        int n = readers.size();
        int[] perm = new int[n];
        for (int i = 0; i < n; i++) {
            perm[i] = i;
        }
        long total = 0;
        long atLeast = 0;
        long sameAsObserved = 0;
        do {
            Map<String, String> permuted = new HashMap<>();
            for (int i = 0; i < n; i++) {
                permuted.put(readers.get(i), labels.get(perm[i]));
            }
            double fStar = naiveF(cases, permuted);
            total++;
            if (fStar >= f - 1e-12 * Math.abs(f)) {
                atLeast++;
            }
            if (samePartition(readers, centreOf, permuted)) {
                sameAsObserved++;
            }
        } while (nextPermutation(perm));
        return new double[] {(double) atLeast / total, (double) sameAsObserved / total};
    }

    static boolean samePartition(List<String> readers, Map<String, String> a, Map<String, String> b) {
        for (String x : readers) {
            for (String y : readers) {
                if (a.get(x).equals(a.get(y)) != b.get(x).equals(b.get(y))) {
                    return false;
                }
            }
        }
        return true;
    }

    static boolean nextPermutation(int[] p) {
        int i = p.length - 2;
        while (i >= 0 && p[i] >= p[i + 1]) {
            i--;
        }
        if (i < 0) {
            return false;
        }
        int j = p.length - 1;
        while (p[j] <= p[i]) {
            j--;
        }
        int t = p[i];
        p[i] = p[j];
        p[j] = t;
        for (int a = i + 1, b = p.length - 1; a < b; a++, b--) {
            t = p[a];
            p[a] = p[b];
            p[b] = t;
        }
        return true;
    }

    /** Readers as points: case centre + reader bias + centre offset + noise; Euclidean distances. */
    static List<CaseDistances> simulate(List<String> readers, Map<String, String> centreOf, int cases,
            double centreShift, Random random) {
        Map<String, double[]> bias = new HashMap<>();
        Map<String, double[]> offset = new HashMap<>();
        for (String r : readers) {
            bias.put(r, new double[] {0.5 * random.nextGaussian(), 0.5 * random.nextGaussian()});
            offset.computeIfAbsent(centreOf.get(r), c -> new double[] {centreShift * random.nextGaussian(),
                centreShift * random.nextGaussian()});
        }
        List<CaseDistances> out = new ArrayList<>();
        for (int c = 0; c < cases; c++) {
            double[][] pts = new double[readers.size()][2];
            for (int i = 0; i < readers.size(); i++) {
                String r = readers.get(i);
                for (int k = 0; k < 2; k++) {
                    pts[i][k] = bias.get(r)[k] + offset.get(centreOf.get(r))[k] + random.nextGaussian();
                }
            }
            out.add(new CaseDistances(String.format("case%02d", c), readers, DistancePartitionTest.euclid(pts)));
        }
        return out;
    }

    static Map<String, String> design(int centres, int readersPerCentre, List<String> readersOut) {
        Map<String, String> map = new HashMap<>();
        for (int g = 0; g < centres; g++) {
            for (int r = 0; r < readersPerCentre; r++) {
                String id = "c" + g + "r" + r;
                map.put(id, "centre" + g);
                readersOut.add(id);
            }
        }
        readersOut.sort(null);
        return map;
    }

    @Test
    void threeCentresOfTwoReadersAgreesWithBruteForce() {
        // 3 centres x 2 readers, 4 cases, one case missing a reader: exact p against all 720 permutations.
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = design(3, 2, readers);
        Random random = new Random(5);
        List<CaseDistances> cases = new ArrayList<>(simulate(readers, centreOf, 3, 0.8, random));
        List<String> partial = readers.subList(1, readers.size());
        double[][] pts = new double[partial.size()][2];
        for (double[] p : pts) {
            p[0] = random.nextGaussian();
            p[1] = random.nextGaussian();
        }
        cases.add(new CaseDistances("case99", partial, DistancePartitionTest.euclid(pts)));
        PermutationResult r = PermutationTest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        double[] naive = naivePermutationP(cases, centreOf, readers);
        assertTrue(r.exact());
        assertEquals(15, r.permutations(), "6!/(2!2!2!)/3! distinct partitions");
        assertEquals(naiveF(cases, centreOf), r.pseudoF(), 1e-10);
        assertEquals(naive[0], r.pValue(), 1e-12, "p over partitions = p over all reader permutations");
        assertEquals(naive[1], r.minP(), 1e-12, "min p = share of permutations giving the observed partition");
        assertEquals(1.0 / 15, r.minP(), 1e-12);
        assertFalse(r.canReachAlpha(), "1/15 > 0.05");
    }

    @Test
    void unequalCentresAgreeWithBruteForce() {
        // centres of 1, 2 and 3 readers (no equal sizes): 6!/(1!2!3!) = 60 partitions.
        Map<String, String> centreOf = Map.of("a", "n", "b", "e", "c", "e", "d", "s", "e", "s", "f", "s");
        List<String> readers = List.of("a", "b", "c", "d", "e", "f");
        List<CaseDistances> cases = simulate(readers, centreOf, 4, 1.0, new Random(8));
        PermutationResult r = PermutationTest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        double[] naive = naivePermutationP(cases, centreOf, readers);
        assertEquals(60, r.permutations());
        assertEquals(naive[0], r.pValue(), 1e-12);
        assertEquals(naive[1], r.minP(), 1e-12);
        assertTrue(r.canReachAlpha());
    }

    @ParameterizedTest(name = "random design {0}")
    @org.junit.jupiter.params.provider.ValueSource(ints = {1, 2, 3, 4, 5, 6, 7, 8})
    void randomDesignsWithMissingReadersAgreeWithBruteForce(int seed) {
        // 5-7 readers in 2-3 centres of random sizes, 2-4 cases, readers missing at random (at
        // least 3 per case): exact p and min p against all N! reader permutations.
        Random random = new Random(1000 + seed);
        int n = 5 + random.nextInt(3);
        int centres = 2 + random.nextInt(2);
        Map<String, String> centreOf = new HashMap<>();
        List<String> readers = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            String id = "r" + i;
            readers.add(id);
            centreOf.put(id, "g" + (i < centres ? i : random.nextInt(centres)));
        }
        List<CaseDistances> cases = new ArrayList<>();
        int caseCount = 2 + random.nextInt(3);
        for (int c = 0; c < caseCount; c++) {
            List<String> present = new ArrayList<>();
            for (String r : readers) {
                if (random.nextDouble() < 0.8 || present.size() + (n - readers.indexOf(r)) <= 3) {
                    present.add(r);
                }
            }
            double[][] pts = new double[present.size()][2];
            for (int i = 0; i < pts.length; i++) {
                double shift = centreOf.get(present.get(i)).equals("g0") ? 1.0 : 0.0;
                pts[i][0] = shift + random.nextGaussian();
                pts[i][1] = random.nextGaussian();
            }
            cases.add(new CaseDistances("k" + c, present, DistancePartitionTest.euclid(pts)));
        }
        PermutationResult r = PermutationTest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        // a reader absent from every case carries no data and is not permuted (docs/shift.md)
        List<String> used = readers.stream()
                .filter(id -> cases.stream().anyMatch(c -> c.readers().contains(id))).toList();
        double[] naive = naivePermutationP(cases, centreOf, used);
        assertTrue(r.exact());
        assertEquals(naiveF(cases, centreOf), r.pseudoF(), 1e-9 * Math.max(1, Math.abs(r.pseudoF())));
        assertEquals(naive[0], r.pValue(), 1e-12);
        assertEquals(naive[1], r.minP(), 1e-12);
    }

    @Test
    void twoCentresOfTwoReadersCannotReachAlpha() {
        // 4 readers in two pairs: the partitions {ab|cd}, {ac|bd}, {ad|bc}; min p = 1/3.
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = design(2, 2, readers);
        List<CaseDistances> cases = simulate(readers, centreOf, 6, 5.0, new Random(2));
        PermutationResult r = PermutationTest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        assertTrue(r.exact());
        assertEquals(3, r.permutations());
        assertEquals(1.0 / 3, r.minP(), 1e-15);
        assertFalse(r.canReachAlpha());
        assertTrue(r.statement().contains("cannot show a centre effect"), r.statement());
        assertTrue(r.statement().contains("is 0.333, above α = 0.05"), r.statement());
        assertEquals(naivePermutationP(cases, centreOf, readers)[0], r.pValue(), 1e-12);
    }

    @ParameterizedTest(name = "sizes {0}: {1} partitions")
    @CsvSource({
        // multinomial / product of factorials of equal-size multiplicities (common practice, combinatorics)
        "'2,2', 3",
        "'2,2,2', 15",
        "'3,3,3', 280",
        "'1,2,3', 60",
        "'2,3,5', 2520",
        "'3,5,6,6', 3259095840", // 20!/(3!5!6!6!)/2! = 6518191680/2
        "'4,4', 35",
    })
    void countsDistinctPartitions(String sizes, long expected) {
        int[] s = java.util.Arrays.stream(sizes.split(",")).mapToInt(Integer::parseInt).toArray();
        assertEquals(BigInteger.valueOf(expected), PermutationTest.distinctPartitions(s));
    }

    @Test
    void monteCarloWhenTooManyPartitions() {
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = design(3, 3, readers);
        List<CaseDistances> cases = simulate(readers, centreOf, 3, 0.0, new Random(4));
        PermutationResult mc = PermutationTest.test(cases, centreOf, 0.05, 499, 100, 9);
        assertFalse(mc.exact());
        assertEquals(499, mc.permutations());
        assertEquals(1.0 / 500, mc.minP(), 1e-15);
        PermutationResult again = PermutationTest.test(cases, centreOf, 0.05, 499, 100, 9);
        assertEquals(mc.pValue(), again.pValue(), 0.0, "seeded");
        PermutationResult exact = PermutationTest.test(cases, centreOf, 0.05, 499, 100_000, 9);
        assertEquals(280, exact.permutations());
        // Monte Carlo p within 4 binomial standard errors of the exact p
        double se = Math.sqrt(exact.pValue() * (1 - exact.pValue()) / 499);
        assertEquals(exact.pValue(), mc.pValue(), 4 * se + 2.0 / 500);
    }

    @Test
    void nullRejectionRateIsNominalAndPowerIsHigh() {
        // 3 centres x 3 readers, 4 cases: 280 partitions, P(p <= 0.05) = 14/280 = 0.05 exactly under
        // exchangeability. 500 seeded null data sets: rejection rate within alpha +- 2 SE.
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = design(3, 3, readers);
        Random random = new Random(20261202);
        int runs = 500;
        int rejectNull = 0;
        int rejectShift = 0;
        for (int i = 0; i < runs; i++) {
            if (PermutationTest.test(simulate(readers, centreOf, 4, 0.0, random), centreOf, 0.05, 999, 100_000, i)
                    .pValue() <= 0.05) {
                rejectNull++;
            }
        }
        for (int i = 0; i < 50; i++) {
            // strong centre offsets: SD 3 per axis against unit noise and reader bias 0.5
            if (PermutationTest.test(simulate(readers, centreOf, 4, 3.0, random), centreOf, 0.05, 999, 100_000, i)
                    .pValue() <= 0.05) {
                rejectShift++;
            }
        }
        double rate = (double) rejectNull / runs;
        double se = Math.sqrt(0.05 * 0.95 / runs);
        assertTrue(Math.abs(rate - 0.05) <= 2 * se, "null rejection rate " + rate);
        assertTrue(rejectShift >= 45, "power " + rejectShift + "/50");
    }
}
