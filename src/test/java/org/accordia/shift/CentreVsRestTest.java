package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The per-centre test ({@link CentreVsRest}) against independent oracles:
 * <ul>
 * <li>p-values: brute force over ALL N! labelled reader permutations, each centre's split
 * (centre vs rest) relabelled and its pooled pseudo-F recomputed from the definitions
 * (Anderson 2001) by {@link ReaderPermutationTest#naiveF}, which shares no code with the
 * production partition enumerator; the sequential procedure (rejected centres leave the rest)
 * written out again from its documentation;</li>
 * <li>Holm adjustment: R's {@code p.adjust(method = "holm")} (fixture {@code holm.R} and its
 * output) and a direct definition (min-rank formula) on the brute-force p-values.</li>
 * </ul>
 */
class CentreVsRestTest {

    /** Brute-force p of centre c's split: share of the N! permutations with F* ≥ F. */
    static double bruteForceP(List<CaseDistances> cases, Map<String, String> centreOf, List<String> readers,
            String centre) {
        Map<String, String> split = new HashMap<>();
        for (String r : readers) {
            split.put(r, centreOf.get(r).equals(centre) ? "in" : "out");
        }
        return ReaderPermutationTest.naivePermutationP(cases, split, readers)[0];
    }

    /** Holm by its definition: adj_i = max over p_j ≤ p_i of min(1, (m − r_j + 1) p_j), r_j the min rank. */
    static double[] holmByDefinition(double[] p) {
        int m = p.length;
        double[] out = new double[m];
        for (int i = 0; i < m; i++) {
            double best = 0;
            for (int j = 0; j < m; j++) {
                if (p[j] <= p[i]) {
                    int rank = 1;
                    for (double q : p) {
                        rank += q < p[j] ? 1 : 0;
                    }
                    best = Math.max(best, Math.min(1, (m - rank + 1) * p[j]));
                }
            }
            out[i] = best;
        }
        return out;
    }

    /** The cases with only the readers of the given centres, written out independently of the production code. */
    static List<CaseDistances> keepCentres(List<CaseDistances> cases, Map<String, String> centreOf, List<String> keep) {
        List<CaseDistances> out = new ArrayList<>();
        for (CaseDistances c : cases) {
            List<String> ids = new ArrayList<>();
            for (String r : c.readers()) {
                if (keep.contains(centreOf.get(r))) {
                    ids.add(r);
                }
            }
            if (ids.size() < 2) {
                continue;
            }
            double[][] all = c.distances();
            double[][] d = new double[ids.size()][ids.size()];
            for (int a = 0; a < ids.size(); a++) {
                for (int b = 0; b < ids.size(); b++) {
                    d[a][b] = all[c.readers().indexOf(ids.get(a))][c.readers().indexOf(ids.get(b))];
                }
            }
            out.add(new CaseDistances(c.caseId(), ids, d));
        }
        return out;
    }

    /**
     * The documented procedure by brute force: {centre → {p, adjusted p, rejected}}. Step with k
     * active centres: every active centre's brute-force p against the other active readers; the
     * smallest (ties: first by name) is rejected when k·p ≤ α and leaves; stop when none is rejected
     * or two centres remain. Two centres in all: one test, no adjustment.
     */
    static Map<String, double[]> bruteForceProcedure(List<CaseDistances> cases, Map<String, String> centreOf,
            List<String> centres, double alpha) {
        Map<String, double[]> out = new TreeMap<>();
        List<String> active = new ArrayList<>(centres);
        double running = 0;
        while (true) {
            List<CaseDistances> kept = keepCentres(cases, centreOf, active);
            List<String> readers = new ArrayList<>();
            for (CaseDistances c : kept) {
                for (String r : c.readers()) {
                    if (!readers.contains(r)) {
                        readers.add(r);
                    }
                }
            }
            readers.sort(null);
            Map<String, Double> p = new TreeMap<>();
            for (String c : active) {
                p.put(c, bruteForceP(kept, centreOf, readers, c));
            }
            if (centres.size() == 2) {
                p.forEach((c, v) -> out.put(c, new double[] {v, v, v <= alpha ? 1 : 0}));
                return out;
            }
            int k = active.size();
            String best = active.stream().min((x, y) -> p.get(x).equals(p.get(y)) ? x.compareTo(y)
                    : Double.compare(p.get(x), p.get(y))).orElseThrow();
            boolean rejects = k * p.get(best) <= alpha;
            if (rejects) {
                running = Math.max(running, Math.min(1, k * p.get(best)));
                out.put(best, new double[] {p.get(best), running, 1});
                active.remove(best);
            }
            if (!rejects || active.size() <= 2) {
                for (String c : active) {
                    out.put(c, new double[] {p.get(c), Math.max(running, Math.min(1, k * p.get(c))), 0});
                }
                return out;
            }
        }
    }

    static void checkAgainstBruteForce(List<CaseDistances> cases, Map<String, String> centreOf, List<String> readers) {
        checkAgainstBruteForce(cases, centreOf, readers, 0.05);
    }

    static void checkAgainstBruteForce(List<CaseDistances> cases, Map<String, String> centreOf, List<String> readers,
            double alpha) {
        List<CentreVsRest.Result> got = CentreVsRest.test(cases, centreOf, alpha, 999, 100_000, 1);
        List<String> centres = got.stream().map(CentreVsRest.Result::centre).toList();
        // the first step is plain centre-vs-rest over all readers: p as Holm's input
        double[] first = new double[centres.size()];
        for (int i = 0; i < centres.size(); i++) {
            first[i] = bruteForceP(cases, centreOf, readers, centres.get(i));
        }
        Map<String, double[]> oracle = bruteForceProcedure(cases, centreOf, centres, alpha);
        for (int i = 0; i < centres.size(); i++) {
            double[] o = oracle.get(centres.get(i));
            CentreVsRest.Result r = got.get(i);
            assertTrue(r.exact());
            assertEquals(o[0], r.pValue(), 1e-12, "p, centre " + centres.get(i));
            assertEquals(o[1], r.adjustedP(), 1e-12, "adjusted, centre " + centres.get(i));
            assertEquals(o[2] == 1, r.rejected(), "rejected, centre " + centres.get(i));
            if (oracle.values().stream().noneMatch(v -> v[2] == 1)) {
                // nothing rejected: every p is the all-reader centre-vs-rest p
                assertEquals(first[i], r.pValue(), 1e-12);
            }
        }
    }

    @Test
    void threeCentresOfTwoReadersAgreeWithBruteForce() {
        // 3 x 2 readers, 4 cases, Euclidean points; 720 permutations per centre
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = ReaderPermutationTest.design(3, 2, readers);
        Random random = new Random(3);
        List<CaseDistances> cases = ReaderPermutationTest.simulate(readers, centreOf, 4, 1.0, random);
        checkAgainstBruteForce(cases, centreOf, readers);
        // C(6, 2) = 15 splits per centre; the smallest p 1/15 times 3 centres cannot reach 0.05
        CentreVsRest.Result r = CentreVsRest.test(cases, centreOf, 0.05, 999, 100_000, 1).get(0);
        assertEquals(15, r.permutations());
        assertEquals(1.0 / 15, r.minP(), 1e-12);
        assertFalse(r.canReachAlpha());
    }

    @Test
    void unequalCentresWithAOneReaderCentreAgreeWithBruteForce() {
        // sizes 1 / 2 / 3 / 1 (7 readers, 5,040 permutations), one shifted centre, a missing reader
        Map<String, String> centreOf = new TreeMap<>();
        String[][] roster = {{"a1"}, {"b1", "b2"}, {"c1", "c2", "c3"}, {"d1"}};
        String[] names = {"alder", "birch", "cedar", "dogwood"};
        List<String> readers = new ArrayList<>();
        for (int g = 0; g < roster.length; g++) {
            for (String r : roster[g]) {
                centreOf.put(r, names[g]);
                readers.add(r);
            }
        }
        readers.sort(null);
        Random random = new Random(11);
        List<CaseDistances> cases = new ArrayList<>(ReaderPermutationTest.simulate(readers, centreOf, 3, 1.5, random));
        List<String> fewer = new ArrayList<>(readers);
        fewer.remove("c2");
        cases.addAll(ReaderPermutationTest.simulate(fewer, centreOf, 1, 1.5, random).stream()
                .map(c -> new CaseDistances("extra", c.readers(), c.distances())).toList());
        checkAgainstBruteForce(cases, centreOf, readers);
        List<CentreVsRest.Result> got = CentreVsRest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        assertEquals(7, got.get(0).permutations(), "a one-reader centre: C(7, 1) splits");
        assertEquals(1.0 / 7, got.get(0).minP(), 1e-12);
    }

    /**
     * The sequential steps: four centres of two readers (8! = 40,320 permutations per brute-force
     * p), one or two centres shifted, run at α = 0.25 so that the small design rejects and the
     * rejected centre's readers leave before the next step (C(8, 2) = 28 splits, then C(6, 2) = 15).
     */
    @ParameterizedTest(name = "seed {0}")
    @ValueSource(ints = {1, 2})
    void sequentialStepsAgreeWithBruteForce(int seed) {
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = ReaderPermutationTest.design(4, 2, readers);
        Random random = new Random(100 + seed);
        List<CaseDistances> cases = new ArrayList<>();
        for (int k = 0; k < 3; k++) {
            double[][] pts = new double[readers.size()][2];
            for (int i = 0; i < pts.length; i++) {
                String c = centreOf.get(readers.get(i));
                pts[i][0] = (c.equals("centre1") ? 3 : 0) + (seed % 2 == 0 && c.equals("centre3") ? -2 : 0)
                        + 0.5 * random.nextGaussian();
                pts[i][1] = 0.5 * random.nextGaussian();
            }
            cases.add(new CaseDistances("k" + k, readers, DistancePartitionTest.euclid(pts)));
        }
        checkAgainstBruteForce(cases, centreOf, readers, 0.25);
        List<CentreVsRest.Result> got = CentreVsRest.test(cases, centreOf, 0.25, 999, 100_000, 1);
        assertTrue(got.get(1).rejected(), got.toString());
    }

    @ParameterizedTest(name = "seed {0}")
    @ValueSource(ints = {1, 2, 3})
    void twoCentresAreOneTestEqualToTheOmnibus(int seed) {
        List<String> readers = new ArrayList<>();
        Map<String, String> centreOf = ReaderPermutationTest.design(2, 3, readers);
        List<CaseDistances> cases = ReaderPermutationTest.simulate(readers, centreOf, 5, 1.0, new Random(seed));
        checkAgainstBruteForce(cases, centreOf, readers);
        List<CentreVsRest.Result> got = CentreVsRest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        PermutationResult omnibus = PermutationTest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        for (CentreVsRest.Result r : got) {
            assertEquals(omnibus.pValue(), r.pValue(), 1e-12);
            assertEquals(r.pValue(), r.adjustedP(), 0.0, "two centres: one test, no adjustment");
            assertEquals(10, r.permutations(), "C(6, 3)/2 = 10 splits");
            assertFalse(r.canReachAlpha(), "min p = 0.1");
        }
    }

    @Test
    void holmMatchesR() throws Exception {
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                getClass().getResourceAsStream("/fixtures/shift/holm_output.txt"), StandardCharsets.UTF_8))) {
            String line;
            int rows = 0;
            while ((line = in.readLine()) != null) {
                String[] parts = line.split("\\|");
                double[] p = Arrays.stream(parts[0].trim().split(" +")).mapToDouble(Double::parseDouble).toArray();
                double[] expected = Arrays.stream(parts[1].trim().split(" +")).mapToDouble(Double::parseDouble).toArray();
                double[] got = CentreVsRest.holm(p);
                for (int i = 0; i < p.length; i++) {
                    assertEquals(expected[i], got[i], 1e-15, line);
                }
                assertEquals(Arrays.toString(holmByDefinition(p)), Arrays.toString(got), line);
                rows++;
            }
            assertEquals(5, rows);
        }
        double[] withNan = CentreVsRest.holm(new double[] {0.01, Double.NaN, 0.02});
        assertEquals(0.02, withNan[0], 1e-15, "NaN does not count in m");
        assertTrue(Double.isNaN(withNan[1]));
    }

    /**
     * The mirror stays out of an innocent centre's test: three centres of three readers, one drawing
     * far away; the shifted centre's split is the most extreme of C(9, 3) = 84 (p = 1/84, Holm 3/84),
     * the innocent centres' p-values are not small (here 0.14 and 0.37: their readers' own biases).
     */
    @Test
    void innocentCentresOfAShiftedStudyGetLargePValues() {
        Map<String, String> centreOf = new TreeMap<>();
        List<String> readers = new ArrayList<>();
        for (String c : List.of("east", "north", "south")) {
            for (int r = 1; r <= 3; r++) {
                centreOf.put(c + r, c);
                readers.add(c + r);
            }
        }
        Random random = new Random(7);
        Map<String, Double> bias = new HashMap<>();
        readers.forEach(r -> bias.put(r, 0.3 * random.nextGaussian()));
        List<CaseDistances> cases = new ArrayList<>();
        for (int k = 0; k < 12; k++) {
            double[] x = new double[readers.size()];
            for (int i = 0; i < x.length; i++) {
                String r = readers.get(i);
                x[i] = bias.get(r) + (centreOf.get(r).equals("north") ? 3.0 : 0) + 0.3 * random.nextGaussian();
            }
            double[][] d = new double[x.length][x.length];
            for (int i = 0; i < x.length; i++) {
                for (int j = 0; j < x.length; j++) {
                    d[i][j] = Math.abs(x[i] - x[j]);
                }
            }
            cases.add(new CaseDistances("k" + k, readers, d));
        }
        List<CentreVsRest.Result> got = CentreVsRest.test(cases, centreOf, 0.05, 999, 100_000, 1);
        assertEquals(1.0 / 84, got.get(1).pValue(), 1e-12);
        assertEquals(3.0 / 84, got.get(1).adjustedP(), 1e-12);
        assertTrue(got.get(1).rejects(0.05));
        assertFalse(got.get(0).rejects(0.05) || got.get(2).rejects(0.05), got.toString());
        assertTrue(got.get(0).pValue() > 0.1 && got.get(2).pValue() > 0.1, got.toString());
    }
}
