package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class BinaryStapleTest {

    /**
     * Oracle: the EM equations of Warfield, Zou &amp; Wells 2004 (eqs. for W_i, p_j, q_j) applied
     * voxel by voxel with plain products, no histogram, no logarithms; same start (W = fraction of
     * readers, M-step first), same prior and stopping rule.
     */
    static double[][] perVoxelOracle(boolean[][] d, double g, double tol, int maxIter) {
        int r = d.length;
        int n = d[0].length;
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            int k = 0;
            for (int j = 0; j < r; j++) {
                k += d[j][i] ? 1 : 0;
            }
            w[i] = (double) k / r;
        }
        double[] p = new double[r];
        double[] q = new double[r];
        double[] lp = new double[r];
        double[] lq = new double[r];
        for (int iter = 1; iter <= maxIter; iter++) {
            for (int j = 0; j < r; j++) {
                double pn = 0;
                double pd = 0;
                double qn = 0;
                double qd = 0;
                for (int i = 0; i < n; i++) {
                    if (d[j][i]) {
                        pn += w[i];
                    } else {
                        qn += 1 - w[i];
                    }
                    pd += w[i];
                    qd += 1 - w[i];
                }
                p[j] = pn / pd;
                q[j] = qn / qd;
            }
            for (int i = 0; i < n; i++) {
                double a = g;
                double b = 1 - g;
                for (int j = 0; j < r; j++) {
                    a *= d[j][i] ? p[j] : 1 - p[j];
                    b *= d[j][i] ? 1 - q[j] : q[j];
                }
                w[i] = a / (a + b);
            }
            boolean done = iter > 1;
            for (int j = 0; j < r; j++) {
                done &= Math.abs(p[j] - lp[j]) <= tol && Math.abs(q[j] - lq[j]) <= tol;
            }
            lp = p.clone();
            lq = q.clone();
            if (done) {
                break;
            }
        }
        double[][] out = new double[3][];
        out[0] = p;
        out[1] = q;
        out[2] = w;
        return out;
    }

    static double meanFraction(boolean[][] d) {
        double s = 0;
        for (boolean[] m : d) {
            for (boolean b : m) {
                s += b ? 1 : 0;
            }
        }
        return s / (d.length * (double) d[0].length);
    }

    @ParameterizedTest(name = "seed {0}, {1} readers")
    @CsvSource({"1,3", "2,5", "3,7", "4,9", "5,12", "6,2"})
    void histogramMatchesPerVoxelOracle(long seed, int readers) {
        SplittableRandom rnd = new SplittableRandom(seed);
        boolean[][] d = Fixtures.randomMasks(rnd, readers, 14, 12, 6);
        PatternHistogram h = Fixtures.histogram(d);
        StapleResult res = BinaryStaple.run(h);
        double[][] o = perVoxelOracle(d, meanFraction(d), 1e-10, 10_000);
        assertTrue(res.converged());
        assertArrayEquals(o[0], res.sensitivity(), 1e-9);
        assertArrayEquals(o[1], res.specificity(), 1e-9);
        for (int i = 0; i < d[0].length; i++) {
            assertEquals(o[2][i], res.weightOfPattern(Fixtures.pattern(d, i)), 1e-9, "voxel " + i);
        }
        // fixed prior too
        StapleResult fixed = BinaryStaple.run(h, StapleOptions.defaults().withFixedPrior(0.3));
        double[][] of = perVoxelOracle(d, 0.3, 1e-10, 10_000);
        assertEquals(0.3, fixed.prior());
        assertArrayEquals(of[0], fixed.sensitivity(), 1e-9);
        assertArrayEquals(of[1], fixed.specificity(), 1e-9);
    }

    @Test
    void identicalReadersArePerfect() {
        // Closed form: identical readers → the consensus is their mask, p = q = 1 (common practice).
        boolean[] m = {true, true, false, false, true, false, false, false};
        PatternHistogram h = Fixtures.histogram(new boolean[][] {m, m, m, m});
        StapleResult res = BinaryStaple.run(h);
        assertArrayEquals(new double[] {1, 1, 1, 1}, res.sensitivity(), 0);
        assertArrayEquals(new double[] {1, 1, 1, 1}, res.specificity(), 0);
        assertEquals(3, res.consensusCount());
        assertEquals(3.0, res.expectedForegroundVoxels(), 1e-12);
        assertEquals(1.0, res.diceVsConsensus(2), 0);
        assertTrue(res.converged());
    }

    @Test
    void readerMarkingEverythingHasFullSensitivityAndNoSpecificity() {
        // Closed form: a reader who marks every voxel has p = Σ W / Σ W = 1 and q = 0/Σ(1−W) = 0.
        boolean[] a = {true, true, true, false, false, false, false, false, false, false};
        boolean[] all = new boolean[10];
        Arrays.fill(all, true);
        StapleResult res = BinaryStaple.run(Fixtures.histogram(new boolean[][] {a, a, all}));
        assertEquals(1.0, res.sensitivity(2), 0);
        assertEquals(0.0, res.specificity(2), 0);
        assertEquals(1.0, res.sensitivity(0), 1e-12);
        assertEquals(1.0, res.specificity(0), 1e-12);
    }

    @Test
    void allReadersEmpty() {
        // Documented degenerate case: no foreground anywhere → p undefined (NaN), q = 1, W = 0, g = 0.
        boolean[][] d = new boolean[3][20];
        StapleResult res = BinaryStaple.run(Fixtures.histogram(d));
        for (int j = 0; j < 3; j++) {
            assertTrue(Double.isNaN(res.sensitivity(j)));
            assertEquals(1.0, res.specificity(j));
        }
        assertEquals(0.0, res.weight(0));
        assertEquals(0.0, res.prior());
        assertEquals(0, res.consensusCount());
        assertTrue(res.converged());
        assertTrue(Double.isNaN(res.diceVsConsensus(0)));
    }

    @Test
    void allReadersFull() {
        // Degenerate mirror: every reader marks every voxel → q undefined (NaN), p = 1, W = 1.
        boolean[][] d = new boolean[2][5];
        for (boolean[] m : d) {
            Arrays.fill(m, true);
        }
        StapleResult res = BinaryStaple.run(Fixtures.histogram(d));
        assertEquals(1.0, res.sensitivity(0));
        assertTrue(Double.isNaN(res.specificity(1)));
        assertEquals(1.0, res.weight(0));
        assertEquals(5, res.consensusCount());
    }

    @Test
    void manyReadersDoNotUnderflow() {
        // 60 readers: plain products of 60 factors near 1e-6 would underflow; log space must not.
        SplittableRandom rnd = new SplittableRandom(9);
        boolean[][] d = Fixtures.randomMasks(rnd, 60, 10, 10, 4);
        StapleResult res = BinaryStaple.run(Fixtures.histogram(d));
        for (double w : res.weights()) {
            assertFalse(Double.isNaN(w));
        }
        for (int j = 0; j < 60; j++) {
            assertFalse(Double.isNaN(res.sensitivity(j)));
        }
    }

    @Test
    void perfectReaderMakesWeightExactlyZero() {
        // Reader 0 with p = 1: any voxel it leaves out has a_i = 0 exactly, so W = 0 exactly.
        boolean[] r0 = {true, true, true, true, false, false, false, false};
        boolean[] r1 = {true, true, true, true, true, false, false, false};
        boolean[] r2 = {true, true, true, false, false, false, false, false};
        StapleResult res = BinaryStaple.run(Fixtures.histogram(new boolean[][] {r0, r1, r2, r0}));
        assertEquals(1.0, res.sensitivity(0), 0);
        assertEquals(0.0, res.weightOfPattern(0b0010L), 0);
    }

    @Test
    void iterationCapIsReported() {
        SplittableRandom rnd = new SplittableRandom(4);
        PatternHistogram h = Fixtures.histogram(Fixtures.randomMasks(rnd, 5, 10, 10, 4));
        StapleResult res = BinaryStaple.run(h, StapleOptions.defaults().withMaxIterations(2));
        assertEquals(2, res.iterations());
        assertFalse(res.converged());
    }
}
