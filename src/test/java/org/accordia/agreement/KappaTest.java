package org.accordia.agreement;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class KappaTest {

    /**
     * Fleiss (1971) formula on the worked example of the Wikipedia entry "Fleiss' kappa" (10
     * subjects, 14 raters, 5 categories): κ = 0.2099 as printed there; recomputed independently by
     * fixtures/agreement/make_fixtures.py with numpy ({@code /usr/bin/python3 make_fixtures.py}),
     * giving 0.20993070442195522.
     */
    @Test
    void fleissWorkedExample() {
        long[][] table = {
            {0, 0, 0, 0, 14}, {0, 2, 6, 4, 2}, {0, 0, 3, 5, 6}, {0, 3, 9, 2, 0}, {2, 2, 8, 1, 1},
            {7, 7, 0, 0, 0}, {3, 2, 6, 3, 0}, {2, 5, 3, 2, 2}, {6, 5, 2, 1, 0}, {0, 2, 2, 3, 7}
        };
        assertEquals(0.20993070442195522, Kappa.fleiss(table), 1e-12);
        assertEquals(0.2099, Kappa.fleiss(table), 5e-5);
    }

    /** Cohen's kappa, 2×2 table 20/5/10/15: p_o = 0.7, p_e = (25·30 + 25·20)/50² = 0.5, κ = 0.4 (hand-computed; numpy gives 0.3999999999999999). */
    @Test
    void cohenTwoByTwo() {
        assertEquals(0.40, Kappa.cohen(new long[][] {{20, 5}, {10, 15}}), 1e-12);
    }

    @Test
    void fleissFromHistogramEqualsTableForm() {
        // three readers, patterns 000 x4, 111 x3, 011 x2, 001 x1 -> per voxel (in, out) counts
        PatternHistogram h = new PatternHistogram(3, new long[] {0, 1, 3, 7}, new long[] {4, 1, 2, 3});
        long[][] table = {
            {0, 3}, {0, 3}, {0, 3}, {0, 3}, {3, 0}, {3, 0}, {3, 0}, {2, 1}, {2, 1}, {1, 2}
        };
        assertEquals(Kappa.fleiss(table), Kappa.fleiss(h), 1e-14);
    }

    @Test
    void degenerateInputIsNaN() {
        // every rating in one category: chance agreement 1, kappa undefined
        assertTrue(Double.isNaN(Kappa.fleiss(new long[][] {{3, 0}, {3, 0}})));
        assertTrue(Double.isNaN(Kappa.fleiss(new long[0][])));
        assertTrue(Double.isNaN(Kappa.fleiss(new long[][] {{1, 0}})));
        assertTrue(Double.isNaN(Kappa.cohen(new long[][] {{0, 0}, {0, 0}})));
        assertTrue(Double.isNaN(Kappa.fleiss(new PatternHistogram(2, new long[] {3}, new long[] {5}))));
        // perfect agreement with both categories present: 1
        assertEquals(1.0, Kappa.fleiss(new long[][] {{2, 0}, {0, 2}}), 1e-15);
    }
}
