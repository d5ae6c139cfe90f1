package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;

/**
 * Single-stratum partition against vegan 2.6-4's adonis2 (Debian r-cran-vegan), fixtures made by
 * {@code src/test/resources/fixtures/shift/permanova.R}; full adonis2 tables in permanova_output.txt.
 */
class DistancePartitionTest {

    /** One "case" holding the whole matrix; readers named by the matrix row names. */
    static CaseDistances single(String matrixFile, List<String> groupIds) throws IOException {
        List<String> ids = Fixtures.matrixNames(matrixFile);
        assertEquals(groupIds, ids, "grouping rows in matrix order");
        return new CaseDistances("all", ids, Fixtures.matrix(matrixFile));
    }

    static Map<String, String> groups(String file, String idColumn, String groupColumn) throws IOException {
        Map<String, String> map = new LinkedHashMap<>();
        for (CSVRecord r : Fixtures.csv(file)) {
            map.put(r.get(idColumn), r.get(groupColumn));
        }
        return map;
    }

    static Map<String, Double> adonis(String file, String column) throws IOException {
        Map<String, Double> out = new LinkedHashMap<>();
        for (CSVRecord r : Fixtures.csv(file)) {
            out.put(r.get("source"), r.get(column).equals("NA") ? Double.NaN : Double.parseDouble(r.get(column)));
        }
        return out;
    }

    @Test
    void duneManagementMatchesAdonis2() throws IOException {
        // adonis2(dune ~ Management, data = dune.env, method = "bray"): SS 1.4686 / 2.8304 / 4.2990, F = 2.7672.
        Map<String, String> g = groups("dune_management.csv", "site", "management");
        List<String> ids = new ArrayList<>(g.keySet());
        PartitionResult r = DistancePartition.partition(List.of(single("dune_bray.csv", ids)), g);
        Map<String, Double> ss = adonis("dune_adonis2.csv", "ss");
        Map<String, Double> f = adonis("dune_adonis2.csv", "f");
        assertEquals(ss.get("Management"), r.ssBetween(), 1e-10);
        assertEquals(ss.get("Residual"), r.ssWithin(), 1e-10);
        assertEquals(ss.get("Total"), r.ssTotal(), 1e-10);
        assertEquals(f.get("Management"), r.pseudoF(), 1e-9);
        assertEquals(1.4686, r.ssBetween(), 5e-5);
        assertEquals(2.7672, r.pseudoF(), 5e-5);
        assertEquals(3, r.dfBetween());
        assertEquals(16, r.dfWithin());
        // AMOVA coefficient for groups 3, 5, 6, 6 (Excoffier et al. 1992): (20 - 106/20)/3 = 4.9
        assertEquals(4.9, r.n0(), 1e-12);
        double msB = r.ssBetween() / 3;
        double msW = r.ssWithin() / 16;
        assertEquals((msB - msW) / 4.9, r.sigma2Between(), 1e-12);
        assertEquals(msW, r.sigma2Within(), 1e-12);
        assertEquals(r.sigma2Between() / (r.sigma2Between() + r.sigma2Within()), r.betweenShare(), 1e-12);
    }

    @Test
    void unequalGroupsMatchAdonis2() throws IOException {
        Map<String, String> g = groups("unequal_groups.csv", "reader", "group");
        List<String> ids = new ArrayList<>(g.keySet());
        PartitionResult r = DistancePartition.partition(List.of(single("unequal_euclid.csv", ids)), g);
        Map<String, Double> ss = adonis("unequal_adonis2.csv", "ss");
        Map<String, Double> f = adonis("unequal_adonis2.csv", "f");
        assertEquals(ss.get("g"), r.ssBetween(), 1e-9);
        assertEquals(ss.get("Residual"), r.ssWithin(), 1e-9);
        assertEquals(f.get("g"), r.pseudoF(), 1e-9);
        assertEquals(2, r.dfBetween());
        assertEquals(7, r.dfWithin());
        assertEquals((10 - (4 + 9 + 25) / 10.0) / 2, r.n0(), 1e-12);
    }

    @Test
    void permutationPValuesAgreeLooselyWithAdonis2() throws IOException {
        // vegan's p-values are Monte Carlo (9,999 free permutations, its own generator): compare
        // within about 4 Monte Carlo standard errors.
        Map<String, String> dune = groups("dune_management.csv", "site", "management");
        PermutationResult pd = PermutationTest.test(List.of(single("dune_bray.csv", new ArrayList<>(dune.keySet()))),
                dune, 0.05, 9_999, 100_000, 17);
        double vegan = adonis("dune_adonis2.csv", "p").get("Management");
        assertFalse(pd.exact(), "20 sites in groups 3/5/6/6 have far more than 100,000 partitions");
        assertEquals(9_999, pd.permutations());
        assertEquals(vegan, pd.pValue(), 0.003);

        Map<String, String> g = groups("unequal_groups.csv", "reader", "group");
        PermutationResult pu = PermutationTest.test(List.of(single("unequal_euclid.csv", new ArrayList<>(g.keySet()))),
                g, 0.05, 9_999, 100_000, 17);
        assertTrue(pu.exact());
        assertEquals(2_520, pu.permutations(), "10!/(2!3!5!) partitions, all group sizes distinct");
        assertEquals(1.0 / 2_520, pu.minP(), 1e-15);
        assertEquals(adonis("unequal_adonis2.csv", "p").get("g"), pu.pValue(), 0.015);
    }

    @Test
    void poolsCasesAsStrata() {
        // Two cases: the pooled sums and degrees of freedom are the sums of the single-case ones.
        Map<String, String> centre = Map.of("a", "x", "b", "x", "c", "y", "d", "y", "e", "z");
        CaseDistances c1 = new CaseDistances("c1", List.of("a", "b", "c", "d", "e"), euclid(new double[][] {
            {0, 0}, {0.3, 0.1}, {2, 1}, {2.2, 0.7}, {1, -1}}));
        CaseDistances c2 = new CaseDistances("c2", List.of("a", "c", "d", "e"), euclid(new double[][] {
            {0, 0.5}, {1.5, 1}, {1.1, 1.3}, {0.2, -0.4}}));
        PartitionResult one = DistancePartition.partition(List.of(c1), centre);
        PartitionResult two = DistancePartition.partition(List.of(c2), centre);
        PartitionResult both = DistancePartition.partition(List.of(c2, c1), centre);
        assertEquals(one.ssBetween() + two.ssBetween(), both.ssBetween(), 1e-12);
        assertEquals(one.ssWithin() + two.ssWithin(), both.ssWithin(), 1e-12);
        assertEquals(one.dfBetween() + two.dfBetween(), both.dfBetween());
        assertEquals(one.dfWithin() + two.dfWithin(), both.dfWithin());
        assertEquals(4, both.dfBetween(), "G1 - 1 = 2 plus G2 - 1 = 2");
        // pooled n0 = sum of per-case (N - sum n^2/N) over sum of (G - 1)
        double n0 = ((5 - 9.0 / 5) + (4 - 6.0 / 4)) / (2 + 2);
        assertEquals(n0, both.n0(), 1e-12);
        assertEquals(2, both.casesUsed());
    }

    @Test
    void undefinedDistancesDropTheReaderFromThatCaseOnly() {
        Map<String, String> centre = Map.of("a", "x", "b", "x", "c", "y", "d", "y");
        double nan = Double.NaN;
        double[][] d = {
            {0, 1, 2, nan},
            {1, 0, 2, nan},
            {2, 2, 0, nan},
            {nan, nan, nan, 0}};
        PartitionResult r = DistancePartition.partition(List.of(new CaseDistances("c1", List.of("a", "b", "c", "d"), d)),
                centre);
        // d removed: N = 3, SS_total = (1 + 4 + 4)/3, SS_within = 1/2 (pair a-b) + 0
        assertEquals(3.0, r.ssTotal(), 1e-12);
        assertEquals(0.5, r.ssWithin(), 1e-12);
        assertEquals(1, r.dfBetween());
        assertEquals(1, r.dfWithin());
        assertTrue(r.notes().get(0).contains("reader d removed"), r.notes().toString());
        assertEquals(List.of("a", "b", "c"), r.readers());
    }

    @Test
    void singleCentreCaseAddsToWithinOnly() {
        Map<String, String> centre = Map.of("a", "x", "b", "x", "c", "y");
        PartitionResult r = DistancePartition.partition(List.of(
                new CaseDistances("c1", List.of("a", "b"), new double[][] {{0, 2}, {2, 0}})), centre);
        assertEquals(0, r.dfBetween());
        assertEquals(0.0, r.ssBetween(), 1e-12);
        assertEquals(2.0, r.ssWithin(), 1e-12);
        assertTrue(Double.isNaN(r.pseudoF()));
        assertTrue(Double.isNaN(r.betweenShare()));
    }

    @Test
    void rejectsBadInput() {
        Map<String, String> centre = Map.of("a", "x");
        assertThrows(IllegalArgumentException.class, () -> DistancePartition.partition(List.of(
                new CaseDistances("c1", List.of("a", "q"), new double[][] {{0, 1}, {1, 0}})), centre));
        assertThrows(IllegalArgumentException.class,
                () -> new CaseDistances("c1", List.of("a", "b"), new double[][] {{0, 1}, {2, 0}}));
        assertThrows(IllegalArgumentException.class,
                () -> new CaseDistances("c1", List.of("a", "b"), new double[][] {{0, -1}, {-1, 0}}));
        assertThrows(IllegalArgumentException.class,
                () -> new CaseDistances("c1", List.of("a", "b"), new double[][] {{0, 1}}));
    }

    static double[][] euclid(double[][] points) {
        int n = points.length;
        double[][] d = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double s = 0;
                for (int k = 0; k < points[i].length; k++) {
                    s += (points[i][k] - points[j][k]) * (points[i][k] - points[j][k]);
                }
                d[i][j] = Math.sqrt(s);
            }
        }
        return d;
    }
}
