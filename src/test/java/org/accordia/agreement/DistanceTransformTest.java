package org.accordia.agreement;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import org.junit.jupiter.api.Test;

class DistanceTransformTest {

    /** Brute force: the definition of the transform, min over all sites of the squared distance in mm². */
    static double[] bruteForce(boolean[] sites, int nx, int ny, int nz, double sx, double sy, double sz) {
        double[] out = new double[sites.length];
        for (int i = 0; i < sites.length; i++) {
            int x = i % nx;
            int y = (i / nx) % ny;
            int z = i / (nx * ny);
            double best = Double.POSITIVE_INFINITY;
            for (int j = 0; j < sites.length; j++) {
                if (!sites[j]) {
                    continue;
                }
                double dx = (x - j % nx) * sx;
                double dy = (y - (j / nx) % ny) * sy;
                double dz = (z - j / (nx * ny)) * sz;
                best = Math.min(best, dx * dx + dy * dy + dz * dz);
            }
            out[i] = best;
        }
        return out;
    }

    static void assertClose(double[] expected, double[] actual) {
        assertEquals(expected.length, actual.length);
        for (int i = 0; i < expected.length; i++) {
            if (Double.isInfinite(expected[i])) {
                assertEquals(expected[i], actual[i], "voxel " + i);
            } else {
                assertEquals(expected[i], actual[i], 1e-12 * Math.max(1.0, expected[i]), "voxel " + i);
            }
        }
    }

    @Test
    void matchesBruteForceOnRandomBoxes() {
        Random rnd = new Random(20260101L);
        for (int trial = 0; trial < 300; trial++) {
            int nx = 1 + rnd.nextInt(9);
            int ny = 1 + rnd.nextInt(9);
            int nz = trial % 3 == 0 ? 1 : 1 + rnd.nextInt(7);
            double sx = 0.3 + 2 * rnd.nextDouble();
            double sy = 0.3 + 2 * rnd.nextDouble();
            double sz = 0.3 + 3 * rnd.nextDouble();
            boolean[] sites = new boolean[nx * ny * nz];
            double density = trial % 5 == 0 ? 0.0 : rnd.nextDouble() * 0.3;
            for (int i = 0; i < sites.length; i++) {
                sites[i] = rnd.nextDouble() < density;
            }
            if (trial % 7 == 1) {
                java.util.Arrays.fill(sites, false);
                sites[rnd.nextInt(sites.length)] = true; // single site
            }
            assertClose(bruteForce(sites, nx, ny, nz, sx, sy, sz),
                DistanceTransform.squaredDistanceMm2(sites, nx, ny, nz, sx, sy, sz));
        }
    }

    @Test
    void noSiteGivesInfinityEverywhere() {
        double[] d = DistanceTransform.squaredDistanceMm2(new boolean[12], 3, 4, 1, 1, 1, 1);
        for (double v : d) {
            assertEquals(Double.POSITIVE_INFINITY, v);
        }
    }

    @Test
    void singleSiteHandComputed() {
        // One site at (0,0,0), spacing 0.5/2/3 mm: voxel (2,1,1) lies at (1, 2, 3) mm -> 1+4+9 = 14 mm².
        boolean[] sites = new boolean[3 * 2 * 2];
        sites[0] = true;
        double[] d = DistanceTransform.squaredDistanceMm2(sites, 3, 2, 2, 0.5, 2, 3);
        assertEquals(14.0, d[2 + 3 * (1 + 2 * 1)], 1e-12);
        assertEquals(0.0, d[0]);
    }

    @Test
    void executorGivesIdenticalResult() {
        Random rnd = new Random(7);
        int nx = 70; // blocks of 16 lines with a partial last block
        int ny = 37;
        int nz = 23;
        boolean[] sites = new boolean[nx * ny * nz];
        for (int i = 0; i < sites.length; i++) {
            sites[i] = rnd.nextDouble() < 0.002;
        }
        double[] serial = DistanceTransform.squaredDistanceMm2(sites, nx, ny, nz, 0.7, 0.9, 2.5);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            double[] parallel = DistanceTransform.squaredDistanceMm2(sites, nx, ny, nz, 0.7, 0.9, 2.5, pool);
            assertTrue(java.util.Arrays.equals(serial, parallel));
        } finally {
            pool.shutdown();
        }
    }
}
