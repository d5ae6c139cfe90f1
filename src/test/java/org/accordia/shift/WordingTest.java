package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** Numbers in sentences with the precision they have. */
class WordingTest {
    @Test
    void levelAndPlainNumbers() {
        assertEquals("α = 0.05", Wording.alpha(0.05));
        assertEquals("α = 0.01", Wording.alpha(0.01));
        assertEquals("0.1", Wording.plain(0.1, 3));
        assertEquals("0.0107", Wording.plain(3.0 / 280, 3));
        assertEquals("0", Wording.plain(-0.0, 3));
    }

    @ParameterizedTest(name = "{0} vs {2}")
    @CsvSource({
        // value,    decimals, threshold, written
        "0.6995,     2,        0.70,      0.6995",  // special-cased below
        "0.698,      2,        0.70,      0.698",
        "0.62,       2,        0.70,      0.62",
        "-0.04,      1,        0,         -0.04",
        "1.004,      1,        1.0,       1.004",
        "0.96,       1,        1.0,       0.96",
        "10.04,      1,        10.0,      10.04",
        "1.4,        1,        1.0,       1.4",
    })
    void enoughDigitsToShowTheComparison(double x, int decimals, double threshold, String expected) {
        if (x == 0.6995) {
            // 0.6995 is below 0.70 in binary; written 0.6995 (four decimals) so the comparison shows
            assertEquals("0.6995", Wording.beside(x, decimals, threshold));
            assertEquals("0.7000", Wording.threshold(threshold, x, decimals));
            return;
        }
        assertEquals(expected, Wording.beside(x, decimals, threshold));
    }

    @Test
    void exactAndMonteCarloPValues() {
        PermutationResult tenPartitions = new PermutationResult(3.1, 0.1, 10, true, 0.1, false, "");
        assertEquals("p = 0.1 (1 of 10 distinct reader partitions, the smallest reachable)",
            Wording.pValue(tenPartitions));
        PermutationResult exact = new PermutationResult(3.1, 3.0 / 280, 280, true, 1.0 / 280, true, "");
        assertEquals("p = 0.0107 (3 of 280 distinct reader partitions)", Wording.pValue(exact));
        // Monte Carlo: 12 of 9,999 at least as large: p = 13/10,000 = 0.0013 (Phipson & Smyth 2010); the
        // 95 % Clopper-Pearson interval of 12/9,999 is the Beta(12, 9988) 2.5 % and Beta(13, 9987)
        // 97.5 % quantiles (Clopper & Pearson 1934), 0.00062 and 0.0021 to two digits (the closed
        // forms at k = 0 and k = n are checked in clopperPearsonEdges)
        PermutationResult mc = new PermutationResult(3.1, 13.0 / 10_000, 9_999, false, 1e-4, true, "");
        assertEquals("p = 0.0013 (Monte Carlo: 12 of 9,999 random reader permutations at least as large; "
            + "95% interval 0.00062 to 0.0021)", Wording.pValue(mc));
    }

    @Test
    void clopperPearsonEdges() {
        assertArrayEquals(new double[] {0, 1 - Math.pow(0.025, 1.0 / 10)}, Wording.clopperPearson(0, 10), 1e-9);
        assertArrayEquals(new double[] {Math.pow(0.025, 1.0 / 10), 1}, Wording.clopperPearson(10, 10), 1e-9);
    }
}
