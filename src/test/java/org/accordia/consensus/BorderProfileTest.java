package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The share of a reader's border beyond the tolerance from a consensus ({@link BorderProfile}):
 * the fast path (box-cropped, one exact distance transform per consensus) against the brute-force
 * definition on random masks, and a hand-computed one-sided bump.
 */
class BorderProfileTest {
    static final int NX = SignedSurfaceTest.NX;
    static final int NY = SignedSurfaceTest.NY;
    static final int NZ = SignedSurfaceTest.NZ;

    private static List<LabelVolume> volumes(boolean[][] d, Geometry g) {
        List<LabelVolume> masks = new ArrayList<>();
        for (boolean[] m : d) {
            byte[] b = new byte[m.length];
            for (int i = 0; i < m.length; i++) {
                b[i] = (byte) (m[i] ? 3 : (i % 7 == 0 ? 1 : 0));
            }
            masks.add(LabelVolume.ofBytes(g, b));
        }
        return masks;
    }

    /**
     * Hand-computed (1 mm voxels, tolerance 1.5 mm): consensus = box x∈[6,14), y∈[3,9), z∈[2,8)
     * (8×6×6 = 288 voxels, interior 6×4×4 = 96, border 192). The reader adds a bump x∈[14,17),
     * y∈[4,8), z∈[3,7) on the +x side only. The 16 consensus face voxels under the bump become
     * interior; the bump adds its border: the rings at x = 14 and 15 (16 − 4 = 12 each) and the end
     * face at x = 16 (16): reader border = 192 − 16 + 40 = 216. Every other reader border voxel is a
     * consensus border voxel (distance 0). A bump voxel at x = 13 + t lies t mm from the consensus
     * face x = 13, so t = 2, 3 are beyond 1.5 mm: 12 + 16 = 28 voxels, all on the +x side of the
     * consensus centroid (9.5, 5.5, 4.5) mm (dx ≥ 5.5, |dy| ≤ 1.5, dz ∈ [−1.5, 2.5]).
     * Share beyond outside 28/216 = 0.1296; inside 0. The mean signed distance is only
     * (12·1 + 12·2 + 16·3)/216 = 0.39 mm: the one-sided part is diluted.
     */
    @Test
    void oneSidedBumpByHand() {
        boolean[] c = SignedSurfaceTest.box(6, 14, 3, 9, 2, 8);
        boolean[] r = c.clone();
        boolean[] bump = SignedSurfaceTest.box(14, 17, 4, 8, 3, 7);
        for (int i = 0; i < r.length; i++) {
            r[i] |= bump[i];
        }
        BorderProfile brute = BorderProfile.bruteForce(r, c, NX, NY, NZ, 1, 1, 1, 1.5);
        assertEquals(216, brute.border());
        assertEquals(28, brute.outside());
        assertEquals(0, brute.inside());
        assertArrayEquals(new long[] {28, 0, 0, 0, 0, 0}, brute.outsideByDirection());
        assertEquals(28.0 / 216, brute.outsideShare(), 1e-15);
        assertEquals((12 * 1 + 12 * 2 + 16 * 3) / 216.0, SignedSurface.meanSignedMm(r, c, NX, NY, NZ, 1, 1, 1), 1e-12);

        // the same through the fast path: reader 0 (centre A) against the other centres' consensus
        // (readers 1 and 2, who both draw the box)
        Geometry g = Geometry.axisAligned(NX, NY, NZ, 1, 1, 1);
        boolean[][] d = {r, c, c};
        CaseReferences refs = CaseReferences.compute("c1", "lesion", List.of("r0", "r1", "r2"), List.of("A", "B", "B"),
            Fixtures.histogram(d), g.voxelVolumeMl(), StapleOptions.defaults());
        ReaderPerformance row = refs.rowsWithSurfaces(volumes(d, g), new int[] {3}, null, 1.5).stream()
            .filter(p -> p.reader().equals("r0") && p.reference().equals(ReaderPerformance.REFERENCE_OTHER_CENTRES))
            .findFirst().orElseThrow();
        assertEquals(brute, row.border());
    }

    @ParameterizedTest(name = "seed {0}, nz {1}, tolerance {2}")
    @CsvSource({"21, 6, 1.3", "22, 6, 0.9", "23, 6, 2.7", "24, 1, 1.3"})
    void fastPathMatchesBruteForceOnRandomMasks(long seed, int nz, double tolerance) {
        SplittableRandom rnd = new SplittableRandom(seed);
        int nx = 16;
        int ny = 14;
        double[] sp = {0.8, 1.2, 2.0};
        boolean[][] d = Fixtures.randomMasks(rnd, 5, nx, ny, nz);
        Geometry g = Geometry.axisAligned(nx, ny, nz, sp[0], sp[1], sp[2]);
        PatternHistogram h = Fixtures.histogram(d);
        List<String> readers = List.of("r1", "r2", "r3", "r4", "r5");
        CaseReferences refs = CaseReferences.compute("c1", "lesion", readers, List.of("A", "A", "B", "B", "C"), h,
            g.voxelVolumeMl(), StapleOptions.defaults());
        List<ReaderPerformance> rows = refs.rowsWithSurfaces(volumes(d, g), new int[] {3}, null, tolerance);
        assertEquals(15, rows.size());
        for (ReaderPerformance row : rows) {
            int j = readers.indexOf(row.reader());
            boolean[] cons = SignedSurfaceTest.referenceMask(refs, row, j, d);
            assertNotNull(row.border());
            assertEquals(BorderProfile.bruteForce(d[j], cons, nx, ny, nz, sp[0], sp[1], sp[2], tolerance), row.border(),
                row.reader() + " " + row.reference());
        }
    }

    @Test
    void noToleranceNoProfileAndEmptyConsensusEmptyProfile() {
        boolean[] c = SignedSurfaceTest.box(6, 14, 3, 9, 2, 8);
        Geometry g = Geometry.axisAligned(NX, NY, NZ, 1, 1, 1);
        boolean[][] d = {c, c};
        CaseReferences refs = CaseReferences.compute("c1", "lesion", List.of("r0", "r1"), List.of("A", "B"),
            Fixtures.histogram(d), g.voxelVolumeMl(), StapleOptions.defaults());
        refs.rowsWithSurfaces(volumes(d, g), new int[] {3}).forEach(p -> assertEquals(null, p.border()));
        BorderProfile none = BorderProfile.bruteForce(c, new boolean[c.length], NX, NY, NZ, 1, 1, 1, 1.0);
        assertEquals(0, none.border());
        assertEquals(Double.NaN, none.outsideShare());
    }
}
