package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class CaseReferencesTest {

    /**
     * Oracle for the leave-one-out rows: the per-voxel EM of Warfield et al. 2004
     * (BinaryStapleTest.perVoxelOracle) run on the masks of the reference readers only, thresholded
     * at W ≥ 0.5 voxel by voxel, and reader j's counts taken voxel by voxel.
     */
    @ParameterizedTest(name = "seed {0}, {1} readers")
    @CsvSource({"21, 6", "22, 6", "23, 5", "24, 18"}) // 18 readers: the memoised (not dense) lookup
    void rowsMatchPerVoxelOracle(long seed, int nReaders) {
        SplittableRandom rnd = new SplittableRandom(seed);
        boolean[][] d = Fixtures.randomMasks(rnd, nReaders, 12, 12, 5);
        String[] centreNames = {"north", "north", "south", "south", "south", "west"};
        List<String> readers = new java.util.ArrayList<>();
        List<String> centres = new java.util.ArrayList<>();
        for (int j = 0; j < nReaders; j++) {
            readers.add(String.format("r%02d", j));
            centres.add(centreNames[j % centreNames.length]);
        }
        PatternHistogram h = Fixtures.histogram(d);
        double voxelMl = 0.002;
        CaseReferences refs = CaseReferences.compute("case7", "organ", readers, centres, h, voxelMl,
            StapleOptions.defaults());
        List<ReaderPerformance> rows = refs.rows();
        assertEquals(3 * nReaders, rows.size());
        for (ReaderPerformance row : rows) {
            int j = readers.indexOf(row.reader());
            long keep = refs.keepMask(row.reference(), j);
            boolean[][] sub = new boolean[Long.bitCount(keep)][];
            int k = 0;
            for (int t = 0; t < d.length; t++) {
                if ((keep >>> t & 1L) != 0) {
                    sub[k++] = d[t];
                }
            }
            double[][] o = BinaryStapleTest.perVoxelOracle(sub, BinaryStapleTest.meanFraction(sub), 1e-10, 10_000);
            long tp = 0;
            long fp = 0;
            long fn = 0;
            long tn = 0;
            for (int i = 0; i < d[j].length; i++) {
                boolean c = o[2][i] >= 0.5;
                boolean r = d[j][i];
                tp += r && c ? 1 : 0;
                fp += r && !c ? 1 : 0;
                fn += !r && c ? 1 : 0;
                tn += !r && !c ? 1 : 0;
            }
            if (row.reference().equals("all")) {
                assertEquals(o[0][j], row.sensitivity(), 1e-9);
                assertEquals(o[1][j], row.specificity(), 1e-9);
            } else {
                assertEquals((double) tp / (tp + fn), row.sensitivity(), 1e-12);
                assertEquals((double) tn / (tn + fp), row.specificity(), 1e-12);
            }
            assertEquals(2.0 * tp / (2 * tp + fp + fn), row.diceVsConsensus(), 1e-12);
            assertEquals((tp + fp) * voxelMl, row.volumeMl(), 1e-12);
            assertEquals((double) (tp + fp) / (tp + fn), row.volumeRatio(), 1e-12);
            assertEquals(centres.get(j), row.centre());
        }
    }

    @Test
    void singleCentreHasNoOtherCentreRows() {
        boolean[][] d = Fixtures.randomMasks(new SplittableRandom(3), 3, 8, 8, 3);
        CaseReferences refs = CaseReferences.compute("c", "l", List.of("a", "b", "c"), List.of("x", "x", "x"),
            Fixtures.histogram(d), 0.001, StapleOptions.defaults());
        assertEquals(6, refs.rows().size());
    }
}
