package org.accordia.agreement;

import org.accordia.stats.Quantiles;
import org.accordia.study.ReaderId;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

class QuantilesAndFormatTest {

    /**
     * Type 7 of Hyndman & Fan (1996): values from numpy 1.24.2 (Debian python3-numpy), e.g.
     * {@code /usr/bin/python3 -c "import numpy as np; print(np.percentile([1,2,3,4,10],95))"} → 8.799999999999999.
     */
    @ParameterizedTest
    @CsvSource({
        "1 2 3 4 10, 0.95, 8.799999999999999",
        "1 2 3 4 10, 0.5, 3.0",
        "5, 0.95, 5.0",
        "0 0 0 0 1, 0.95, 0.7999999999999998",
        "3 1 2, 0.0, 1.0",
        "3 1 2, 1.0, 3.0",
    })
    void type7LikeNumpy(String values, double p, double expected) {
        double[] v = Arrays.stream(values.split(" ")).mapToDouble(Double::parseDouble).toArray();
        assertEquals(expected, Quantiles.type7(v, p), 1e-12);
    }

    @Test
    void selectionMatchesSortOnRandomInput() {
        Random rnd = new Random(3);
        for (int t = 0; t < 500; t++) {
            int n = 1 + rnd.nextInt(60);
            double[] v = new double[n];
            for (int i = 0; i < n; i++) {
                v[i] = rnd.nextInt(5) == 0 ? 0 : rnd.nextInt(7); // many ties
            }
            double[] s = v.clone();
            Arrays.sort(s);
            double p = rnd.nextDouble();
            double h = (n - 1) * p;
            int lo = (int) Math.floor(h);
            double expected = lo + 1 < n ? s[lo] + (h - lo) * (s[lo + 1] - s[lo]) : s[lo];
            assertEquals(expected, Quantiles.type7(v, p), 1e-12);
        }
        assertTrue(Double.isNaN(Quantiles.type7(new double[0], 0.5)));
    }

    @Test
    void relativeVolumeDifference() {
        PairMetrics p = PairMetrics.of("case1", "whole", new ReaderId("r1", "north"), new ReaderId("r2", "south"),
            3, 1, 1, 0.5, new SurfaceMetrics(1.5, 1.25, 1.0, 2.0 / 3.0, 0.75, 1.0), 1.0);
        assertEquals(1.0, p.relativeVolumeDifference(), 1e-15); // (3 - 1) / ((3 + 1) / 2)
        assertEquals(0.5, p.dice(), 1e-15); // 2*1 / (3 + 1)
    }
}
