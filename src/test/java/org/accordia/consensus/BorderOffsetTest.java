package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The antisymmetric border offset of the {@code all} rows, ½ (d(reader → consensus) −
 * d(consensus → reader)), against its definition on full masks: the consensus thresholded from
 * the per-voxel STAPLE oracle (Warfield et al. 2004, {@link BinaryStapleTest#perVoxelOracle}) and
 * both directed distances from the plain full-grid {@link SignedSurface#meanSignedMm(boolean[],
 * boolean[], int, int, int, double, double, double)}, which the box-cropped path does not use.
 */
class BorderOffsetTest {

    @ParameterizedTest(name = "seed {0}, {1} readers")
    @CsvSource({"41, 3", "42, 6"})
    void allRowsCarryTheAntisymmetricOffset(long seed, int nReaders) {
        SplittableRandom rnd = new SplittableRandom(seed);
        boolean[][] small = Fixtures.randomMasks(rnd, nReaders, 12, 12, 5);
        int nx = 20;
        int ny = 18;
        int nz = 9;
        double sx = 0.7;
        double sy = 0.8;
        double sz = 1.5;
        Geometry g = Geometry.axisAligned(nx, ny, nz, sx, sy, sz);
        List<LabelVolume> masks = new ArrayList<>();
        boolean[][] full = new boolean[nReaders][nx * ny * nz];
        for (int j = 0; j < nReaders; j++) {
            byte[] b = new byte[nx * ny * nz];
            for (int z = 0; z < 5; z++) {
                for (int y = 0; y < 12; y++) {
                    for (int x = 0; x < 12; x++) {
                        if (small[j][x + 12 * (y + 12 * z)]) {
                            int i = (x + 4) + nx * ((y + 3) + ny * (z + 2));
                            b[i] = 1;
                            full[j][i] = true;
                        }
                    }
                }
            }
            masks.add(LabelVolume.ofBytes(g, b));
        }
        List<String> readers = new ArrayList<>();
        List<String> centres = new ArrayList<>();
        for (int j = 0; j < nReaders; j++) {
            readers.add("r" + j);
            centres.add("c" + (j % 3));
        }
        CaseReferences refs = CaseReferences.compute("case", "organ", readers, centres, Fixtures.histogram(full),
            0.001, StapleOptions.defaults());
        List<ReaderPerformance> rows = refs.rowsWithSurfaces(masks, new int[] {1});
        double[][] o = BinaryStapleTest.perVoxelOracle(full, BinaryStapleTest.meanFraction(full), 1e-10, 10_000);
        boolean[] consensus = new boolean[nx * ny * nz];
        for (int i = 0; i < consensus.length; i++) {
            consensus[i] = o[2][i] >= 0.5;
        }
        int checked = 0;
        for (ReaderPerformance row : rows) {
            if (!row.reference().equals(ReaderPerformance.REFERENCE_ALL)) {
                assertTrue(Double.isNaN(row.borderOffsetMm()), row.toString());
                continue;
            }
            int j = readers.indexOf(row.reader());
            double forward = SignedSurface.meanSignedMm(full[j], consensus, nx, ny, nz, sx, sy, sz);
            double back = SignedSurface.meanSignedMm(consensus, full[j], nx, ny, nz, sx, sy, sz);
            assertEquals(forward, row.signedSurfaceMm(), 1e-9, row.toString());
            assertEquals(0.5 * (forward - back), row.borderOffsetMm(), 1e-9, row.toString());
            checked++;
        }
        assertEquals(nReaders, checked);
    }
}
