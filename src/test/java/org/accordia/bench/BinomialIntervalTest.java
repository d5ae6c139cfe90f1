package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Clopper–Pearson intervals against R's {@code binom.test} (stats package, R 4.x), produced by
 * src/test/resources/fixtures/bench/binomial.R; its output is binomial.out beside it.
 */
class BinomialIntervalTest {

    @ParameterizedTest
    @CsvSource({
        // k, n, lower, upper — Rscript binomial.R (binom.test(k, n)$conf.int)
        "0, 30, 0.0000000000, 0.1157033082",
        "1, 30, 0.0008435709, 0.1721694556",
        "3, 30, 0.0211171370, 0.2652884505",
        "10, 200, 0.0242341655, 0.0900275377",
        "16, 200, 0.0464176084, 0.1266648560",
        "190, 200, 0.9099724623, 0.9757658345",
        "200, 200, 0.9817246596, 1.0000000000",
        "27, 30, 0.7347115495, 0.9788828630",
        "5, 9, 0.2120085068, 0.8630043377",
    })
    void matchesBinomTest(int k, int n, double lo, double hi) {
        BinomialInterval b = BinomialInterval.of95(k, n);
        assertEquals(lo, b.lower(), 1e-8);
        assertEquals(hi, b.upper(), 1e-8);
        assertEquals((double) k / n, b.rate(), 0);
    }

    @org.junit.jupiter.api.Test
    void rejectsImpossibleCounts() {
        assertThrows(IllegalArgumentException.class, () -> BinomialInterval.of95(3, 2));
        assertThrows(IllegalArgumentException.class, () -> BinomialInterval.of95(0, 0));
        assertThrows(IllegalArgumentException.class, () -> BinomialInterval.of(1, 2, 1.0));
    }
}
