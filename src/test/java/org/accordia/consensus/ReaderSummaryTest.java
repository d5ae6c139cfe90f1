package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class ReaderSummaryTest {

    static ReaderPerformance row(String caseId, String reader, double sens, double ratio, double ssd) {
        return new ReaderPerformance(caseId, "liver", reader, "north", sens, 0.99, 0.9, 10, ratio, ssd, "others");
    }

    @Test
    void percentileIsType7() {
        // R: quantile(c(1,2,3,4,10), c(0.025, 0.975), type = 7) → 1.1, 9.4 (Hyndman & Fan 1996, type 7)
        double[] x = {10, 3, 1, 4, 2};
        assertEquals(1.1, ReaderSummary.percentile(x, 0.025), 1e-12);
        assertEquals(9.4, ReaderSummary.percentile(x, 0.975), 1e-12);
    }

    @Test
    void meansAndGeometricMeanOfRatios() {
        List<ReaderPerformance> rows = List.of(
            row("c1", "r1", 0.8, 2.0, 1.0),
            row("c2", "r1", 0.6, 0.5, Double.NaN),
            row("c3", "r1", Double.NaN, Double.POSITIVE_INFINITY, -0.5));
        ReaderSummary s = ReaderSummary.summarise(rows, 500, 42L).get(0);
        assertEquals(3, s.cases());
        assertEquals(500, s.resamples());
        assertEquals(0.7, s.meanSensitivity(), 1e-12);  // NaN skipped
        assertEquals(1.0, s.geoMeanVolumeRatio(), 1e-12); // sqrt(2 × 0.5); +∞ skipped
        assertEquals(0.25, s.meanSignedSurfaceMm(), 1e-12);
        assertTrue(s.sensitivityLo() >= 0.6 - 1e-12 && s.sensitivityHi() <= 0.8 + 1e-12 && s.sensitivityLo() <= s.sensitivityHi());
        assertEquals(0.99, s.specificityLo(), 1e-12);
        assertEquals(0.99, s.specificityHi(), 1e-12);
    }

    @Test
    void deterministicForASeedAndSorted() {
        List<ReaderPerformance> rows = new ArrayList<>();
        for (int c = 0; c < 12; c++) {
            rows.add(row("c" + c, "r2", 0.5 + 0.04 * c, 1 + 0.1 * c, 0.1 * c - 0.3));
            rows.add(row("c" + c, "r1", 0.9 - 0.03 * c, 1.2, 0.2));
        }
        List<ReaderSummary> a = ReaderSummary.summarise(rows, 1000, 7L);
        List<ReaderPerformance> rev = new ArrayList<>(rows);
        java.util.Collections.reverse(rev);
        List<ReaderSummary> b = ReaderSummary.summarise(rev, 1000, 7L);
        assertEquals(a, b);
        assertEquals("r1", a.get(0).reader());
        assertNotEquals(a.get(1), ReaderSummary.summarise(rows, 1000, 8L).get(1));
        ReaderSummary r2 = a.get(1);
        assertTrue(r2.sensitivityLo() < r2.meanSensitivity() && r2.meanSensitivity() < r2.sensitivityHi());
    }

    @Test
    void singleCaseCollapses() {
        ReaderSummary s = ReaderSummary.summarise(List.of(row("c1", "r1", 0.7, 1.5, 0.4)), 100, 1L).get(0);
        assertEquals(0.7, s.sensitivityLo(), 0);
        assertEquals(0.7, s.sensitivityHi(), 0);
        assertEquals(1.5, s.volumeRatioHi(), 1e-12);
    }
}
