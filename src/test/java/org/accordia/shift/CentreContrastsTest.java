package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;

/**
 * {@link CentreContrasts} on worked examples of our own (docs/shift.md section 5.1), computed by
 * hand; the t quantile t_{0.975, 3} = 3.182446 is a handbook value (e.g. R {@code qt(0.975, 3)}).
 */
class CentreContrastsTest {

    /**
     * 3 centres × 2 readers × 3 cases: y = case + centre + reader + e with centre A = 1 mm (B, C 0),
     * reader deviations ±0.1 (A), ±0.2 (B), 0 (C), case effects 0.7, −0.4, 1.1 (they cancel), and
     * e = ±ε_k (0.3, −0.5, 0.2; the two readers of a centre opposite, so every centre's case mean
     * is free of e and the per-case contrasts are constant). By hand: Δ_A = 1, Δ_B = Δ_C = −0.5;
     * s²_m = (0.01 + 0.01 + 0.04 + 0.04)/3 = 0.1/3; K = 1/2 + 2 (1/2)² / 2 = 0.75;
     * s²_δ = 0, so V = s²_m K = 0.025 and the interval is Δ ± 3.182446 × √0.025 (ν = 3).
     */
    @Test
    void balancedWorkedExample() {
        double[] caseEffect = {0.7, -0.4, 1.1};
        double[] eps = {0.3, -0.5, 0.2};
        String[] centres = {"alder", "birch", "cedar"};
        double[] centreEffect = {1, 0, 0};
        double[][] reader = {{0.1, -0.1}, {0.2, -0.2}, {0, 0}};
        List<ReaderCaseMeasure> rows = new ArrayList<>();
        for (int k = 0; k < 3; k++) {
            for (int g = 0; g < 3; g++) {
                for (int r = 0; r < 2; r++) {
                    double y = caseEffect[k] + centreEffect[g] + reader[g][r] + (r == 0 ? eps[k] : -eps[k]);
                    rows.add(new ReaderCaseMeasure(centres[g] + r, centres[g], "k" + k, y, 1.0));
                }
            }
        }
        List<CentreContrasts.Contrast> c = CentreContrasts.estimate(rows);
        assertEquals(List.of("alder", "birch", "cedar"), c.stream().map(x -> x.effect().group()).toList());
        double half = 3.182446 * Math.sqrt(0.025);
        double[] delta = {1, -0.5, -0.5};
        for (int g = 0; g < 3; g++) {
            GroupEffect e = c.get(g).effect();
            assertEquals(delta[g], e.signedSurfaceMm(), 1e-12);
            assertEquals(delta[g] - half, e.signedSurfaceLoMm(), 1e-5);
            assertEquals(delta[g] + half, e.signedSurfaceHiMm(), 1e-5);
            assertEquals(3, c.get(g).surfaceDf(), 1e-12);
            assertEquals(Math.sqrt(0.025), c.get(g).surfaceSeMm(), 1e-12);
            assertEquals(2, e.readers());
            assertEquals(3, e.cases());
            assertEquals(1.0, e.volumeRatio(), 1e-12);
        }
    }

    /** One reader per centre: a centre cannot be told apart from its reader, no interval; one centre: nothing. */
    @Test
    void degenerateDesigns() {
        List<ReaderCaseMeasure> rows = new ArrayList<>();
        for (int k = 0; k < 4; k++) {
            rows.add(new ReaderCaseMeasure("a", "alder", "k" + k, 1.0 + 0.1 * k, 1.2));
            rows.add(new ReaderCaseMeasure("b", "birch", "k" + k, 0.0, 1.0));
        }
        List<CentreContrasts.Contrast> c = CentreContrasts.estimate(rows);
        assertEquals(1.15, c.get(0).effect().signedSurfaceMm(), 1e-12);
        assertTrue(Double.isNaN(c.get(0).effect().signedSurfaceLoMm()), "no reader degrees of freedom");
        assertEquals(List.of(), CentreContrasts.estimate(rows.stream().filter(r -> r.centre().equals("alder")).toList()));
    }
}
