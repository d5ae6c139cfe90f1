package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class SignedSurfaceTest {
    static final int NX = 20;
    static final int NY = 12;
    static final int NZ = 10;

    static boolean[] box(int x0, int x1, int y0, int y1, int z0, int z1) {
        boolean[] m = new boolean[NX * NY * NZ];
        for (int z = z0; z < z1; z++) {
            for (int y = y0; y < y1; y++) {
                for (int x = x0; x < x1; x++) {
                    m[x + NX * (y + NY * z)] = true;
                }
            }
        }
        return m;
    }

    @Test
    void identicalMaskGivesZero() {
        boolean[] c = box(5, 14, 3, 9, 2, 8);
        assertEquals(0.0, SignedSurface.meanSignedMm(c, c, NX, NY, NZ, 0.7, 1.1, 2.5), 0);
    }

    @ParameterizedTest(name = "k={0}, sx={1}")
    @CsvSource({"1, 1.0", "2, 0.8", "3, 1.5"})
    void boxGrownAlongXOnBothSides(int k, double sx) {
        // Consensus: box x in [6,14), y in [3,9), z in [2,8). Reader: the same box grown by k voxels
        // along x on both sides. Derivation (convention: distance between borders): a reader border
        // voxel with x inside the consensus x-range lies on a y/z face of the consensus → 0; one at
        // x = x0 - t (or x1 - 1 + t), t = 1..k, lies outside the consensus and its nearest
        // consensus border voxel is (x0, y, z) (resp. x1 - 1) → +t·sx. The reader's end faces
        // (t = k) hold ny·nz border voxels; each slice 1 <= t < k holds the ring ny·nz − (ny−2)(nz−2).
        int x0 = 6;
        int x1 = 14;
        int by = 6;
        int bz = 6;
        boolean[] c = box(x0, x1, 3, 9, 2, 8);
        boolean[] r = box(x0 - k, x1 + k, 3, 9, 2, 8);
        long face = (long) by * bz;
        long ring = face - (long) (by - 2) * (bz - 2);
        double sum = 2 * k * sx * face;
        for (int t = 1; t < k; t++) {
            sum += 2 * t * sx * ring;
        }
        long count = 2 * face + (long) (x1 - x0 + 2 * k - 2) * ring;
        double expected = sum / count;
        assertEquals(expected, SignedSurface.meanSignedMm(r, c, NX, NY, NZ, sx, 1.0, 2.0), 1e-12);
        assertTrue(expected > 0 && expected < k * sx);
    }

    @ParameterizedTest(name = "k={0}, sx={1}")
    @CsvSource({"1, 1.0", "2, 0.8", "3, 0.5"})
    void boxShrunkAlongXOnBothSides(int k, double sx) {
        // Reader = consensus shrunk by k along x. Reader border voxels on the consensus's y/z faces
        // are consensus border voxels → 0. A voxel (x0+k, y, z) of the reader's end face with y, z
        // interior is inside the consensus; its nearest consensus border voxel is the nearer of
        // the x0 face (k·sx) and the y/z faces ((y−y0)·sy, (y1−1−y)·sy, (z−z0)·sz, (z1−1−z)·sz).
        int x0 = 4;
        int x1 = 16;
        int y0 = 2;
        int y1 = 10;
        int z0 = 1;
        int z1 = 9;
        double sy = 0.6;
        double sz = 0.9;
        boolean[] c = box(x0, x1, y0, y1, z0, z1);
        boolean[] r = box(x0 + k, x1 - k, y0, y1, z0, z1);
        double sum = 0;
        for (int z = z0 + 1; z < z1 - 1; z++) {
            for (int y = y0 + 1; y < y1 - 1; y++) {
                double m = Math.min(k * sx, Math.min(Math.min((y - y0) * sy, (y1 - 1 - y) * sy),
                    Math.min((z - z0) * sz, (z1 - 1 - z) * sz)));
                sum -= 2 * m;
            }
        }
        long face = (long) (y1 - y0) * (z1 - z0);
        long ring = face - (long) (y1 - y0 - 2) * (z1 - z0 - 2);
        long count = 2 * face + (long) (x1 - x0 - 2 * k - 2) * ring;
        double expected = sum / count;
        assertEquals(expected, SignedSurface.meanSignedMm(r, c, NX, NY, NZ, sx, sy, sz), 1e-12);
        assertTrue(expected < 0 && expected > -k * sx);
    }

    /** Brute force: every reader border voxel against every consensus border voxel. */
    static double bruteForce(boolean[] r, boolean[] c, int nx, int ny, int nz, double[] s) {
        boolean[] rb = borders(r, nx, ny, nz);
        boolean[] cb = borders(c, nx, ny, nz);
        double sum = 0;
        int n = 0;
        boolean anyC = false;
        for (int i = 0; i < r.length; i++) {
            if (!rb[i]) {
                continue;
            }
            double best = Double.POSITIVE_INFINITY;
            for (int k = 0; k < c.length; k++) {
                if (cb[k]) {
                    anyC = true;
                    double dx = (i % nx - k % nx) * s[0];
                    double dy = ((i / nx) % ny - (k / nx) % ny) * s[1];
                    double dz = (i / (nx * ny) - k / (nx * ny)) * s[2];
                    best = Math.min(best, Math.sqrt(dx * dx + dy * dy + dz * dz));
                }
            }
            sum += c[i] ? -best : best;
            n++;
        }
        return n == 0 || !anyC ? Double.NaN : sum / n;
    }

    /** Border voxels by the project convention, written out independently (6-neighbours, edge = background). */
    static boolean[] borders(boolean[] m, int nx, int ny, int nz) {
        boolean[] b = new boolean[m.length];
        for (int z = 0; z < nz; z++) {
            for (int y = 0; y < ny; y++) {
                for (int x = 0; x < nx; x++) {
                    int i = x + nx * (y + ny * z);
                    if (!m[i]) {
                        continue;
                    }
                    b[i] = x == 0 || x == nx - 1 || y == 0 || y == ny - 1 || (nz > 1 && (z == 0 || z == nz - 1))
                        || !m[i - 1] || !m[i + 1] || !m[i - nx] || !m[i + nx]
                        || (nz > 1 && (!m[i - nx * ny] || !m[i + nx * ny]));
                }
            }
        }
        return b;
    }

    /** The thresholded reference consensus behind a row, on the full grid, from the readers' masks. */
    static boolean[] referenceMask(CaseReferences refs, ReaderPerformance row, int j, boolean[][] d) {
        long keep = refs.keepMask(row.reference(), j);
        StapleResult s = refs.staple(row.reference(), j);
        boolean[] cons = new boolean[d[0].length];
        for (int i = 0; i < cons.length; i++) {
            cons[i] = s.weightOfPattern(PatternHistogram.compress(Fixtures.pattern(d, i), keep)) >= 0.5;
        }
        return cons;
    }

    @ParameterizedTest(name = "seed {0}, nz {1}")
    @CsvSource({"11, 6", "12, 6", "13, 6", "14, 1"}) // nz = 1: a 2-D image (4-connectivity)
    void caseReferencesMatchFullGridBruteForce(long seed, int nz) {
        // Surfaces from the cropped box (CaseReferences.rowsWithSurfaces) against the plain
        // definition on the full grid with a brute-force nearest-border search, for every reference.
        SplittableRandom rnd = new SplittableRandom(seed);
        int nx = 16;
        int ny = 14;
        double[] sp = {0.8, 1.2, 2.0};
        boolean[][] d = Fixtures.randomMasks(rnd, 5, nx, ny, nz);
        List<LabelVolume> masks = new ArrayList<>();
        Geometry g = Geometry.axisAligned(nx, ny, nz, sp[0], sp[1], sp[2]);
        for (boolean[] m : d) {
            byte[] b = new byte[m.length];
            for (int i = 0; i < m.length; i++) {
                b[i] = (byte) (m[i] ? 3 : (i % 7 == 0 ? 1 : 0)); // label 3 = structure, 1 = another one
            }
            masks.add(LabelVolume.ofBytes(g, b));
        }
        PatternHistogram h = Fixtures.histogram(d);
        List<String> readers = List.of("r1", "r2", "r3", "r4", "r5");
        List<String> centres = List.of("A", "A", "B", "B", "C");
        CaseReferences refs = CaseReferences.compute("c1", "lesion", readers, centres, h, g.voxelVolumeMl(),
            StapleOptions.defaults());
        List<ReaderPerformance> rows = refs.rowsWithSurfaces(masks, new int[] {3});
        assertEquals(5 + 5 + 5, rows.size());
        for (ReaderPerformance row : rows) {
            int j = readers.indexOf(row.reader());
            boolean[] cons = referenceMask(refs, row, j, d);
            assertEquals(bruteForce(d[j], cons, nx, ny, nz, sp), row.signedSurfaceMm(), 1e-9,
                row.reader() + " " + row.reference());
        }
    }
}
