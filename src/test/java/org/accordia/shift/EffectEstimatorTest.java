package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import org.junit.jupiter.api.Test;

class EffectEstimatorTest {

    @Test
    void pointEstimatesWeighCasesEqually() {
        // centre A: case 1 has two readers (1.0 and 3.0 mm -> case mean 2.0), case 2 one reader (4.0 mm):
        // effect = (2 + 4)/2 = 3.0 mm; volume ratios 2 and 0.5 on case 1 (log mean 0), 1.5 on case 2:
        // geometric mean = exp((0 + log 1.5)/2) = sqrt(1.5).
        List<ReaderCaseMeasure> rows = List.of(
                new ReaderCaseMeasure("a1", "A", "k1", 1.0, 2.0),
                new ReaderCaseMeasure("a2", "A", "k1", 3.0, 0.5),
                new ReaderCaseMeasure("a1", "A", "k2", 4.0, 1.5),
                new ReaderCaseMeasure("b1", "B", "k1", -1.0, 1.0),
                new ReaderCaseMeasure("b1", "B", "k2", Double.NaN, 0.0));
        List<GroupEffect> effects = EffectEstimator.byCentre(rows, 200, 3);
        GroupEffect a = effects.get(0);
        assertEquals("A", a.group());
        assertEquals(2, a.readers());
        assertEquals(2, a.cases());
        assertEquals(3.0, a.signedSurfaceMm(), 1e-12);
        assertEquals(Math.sqrt(1.5), a.volumeRatio(), 1e-12);
        GroupEffect b = effects.get(1);
        assertEquals(-1.0, b.signedSurfaceMm(), 1e-12);
        assertEquals(1.0, b.volumeRatio(), 1e-12);
        assertTrue(Double.isNaN(b.signedSurfaceLoMm()), "one usable case: no interval");
        // bootstrap replicates of A take the values 2, 3 or 4: the interval lies within [2, 4]
        assertTrue(a.signedSurfaceLoMm() >= 2.0 && a.signedSurfaceHiMm() <= 4.0);
        List<GroupEffect> readers = EffectEstimator.byReader(rows, 200, 3);
        assertEquals(List.of("a1", "a2", "b1"), readers.stream().map(GroupEffect::group).toList());
        assertEquals(2.5, readers.get(0).signedSurfaceMm(), 1e-12);
    }

    @Test
    void percentileIntervalAgreesWithNormalTheoryOnLargeSamples() {
        // 60 cases, one reader per case, normal signed distances: the bootstrap percentile interval of
        // the mean is close to mean +- 1.96 sd/sqrt(n) (Efron & Tibshirani 1993, ch. 13).
        Random random = new Random(12);
        List<ReaderCaseMeasure> rows = new ArrayList<>();
        double[] v = new double[60];
        for (int c = 0; c < 60; c++) {
            v[c] = 1.4 + 0.8 * random.nextGaussian();
            rows.add(new ReaderCaseMeasure("r", "X", String.format("k%02d", c), v[c], Math.exp(0.1 + 0.05 * random.nextGaussian())));
        }
        GroupEffect e = EffectEstimator.byCentre(rows, 4000, 7).get(0);
        double mean = java.util.Arrays.stream(v).average().orElseThrow();
        double sd = Math.sqrt(java.util.Arrays.stream(v).map(x -> (x - mean) * (x - mean)).sum() / 59);
        double half = 1.96 * sd / Math.sqrt(60);
        assertEquals(mean, e.signedSurfaceMm(), 1e-12);
        assertEquals(mean - half, e.signedSurfaceLoMm(), 0.15 * half);
        assertEquals(mean + half, e.signedSurfaceHiMm(), 0.15 * half);
        GroupEffect again = EffectEstimator.byCentre(rows, 4000, 7).get(0);
        assertEquals(e, again, "seeded");
    }

    @Test
    void describesDirectionInWords() {
        GroupEffect outside = new GroupEffect("north", "north", 3, 12, 1.4, 1.1, 1.7, 1.18, 1.12, 1.25);
        assertEquals("draws 1.4 mm [1.1, 1.7] outside the other centres; volumes 18% [12%, 25%] larger than the other centres",
                outside.describe("the other centres"));
        GroupEffect inside = new GroupEffect("south", "south", 3, 12, -1.4, -1.7, -1.1, 0.8, 0.7, 0.9);
        assertEquals("draws 1.4 mm [1.1, 1.7] inside the other centres; volumes 20% [10%, 30%] smaller than the other centres",
                inside.describe("the other centres"));
        assertTrue(outside.surfaceBeyond(1.0));
        assertTrue(outside.volumeBeyond(10));
        assertTrue(!outside.volumeBeyond(15));
        assertTrue(inside.surfaceBeyond(1.0));
        assertTrue(inside.volumeBeyond(5));
    }
}
