package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.accordia.grid.Box;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The word-skipping union bounding box against the plain definition (brute force over every
 * voxel: min and max x, y, z of the voxels any reader marks with a structure label; common
 * practice).
 */
class PatternsUnionBoxTest {

    @ParameterizedTest
    @CsvSource({
        // nx, ny, nz, readers, density, int storage, structure labels (| separated), seed
        "1, 1, 1, 1, 0.5, false, 1, 1",
        "7, 3, 2, 2, 0.05, false, 1, 2",
        "8, 4, 3, 3, 0.02, false, 1|2, 3",
        "17, 5, 4, 3, 0.01, false, 2, 4",
        "33, 9, 5, 4, 0.003, false, 1|2, 5",
        "64, 6, 3, 2, 0.0, false, 1, 6",
        "23, 7, 3, 3, 0.01, true, 1|300, 7",
        "19, 4, 2, 2, 0.2, false, 0|1, 8",
        "40, 5, 3, 9, 0.001, false, 1, 9",
    })
    void matchesBruteForce(int nx, int ny, int nz, int readers, double density, boolean ints, String labels,
            long seed) {
        int[] structure = java.util.Arrays.stream(labels.split("\\|")).mapToInt(Integer::parseInt).toArray();
        boolean[] lut = Patterns.lut(structure);
        Geometry g = Geometry.axisAligned(nx, ny, nz, 1, 1, 1);
        Random rnd = new Random(seed);
        int[] values = {0, 1, 2, 3, 300};
        for (int trial = 0; trial < 20; trial++) {
            List<LabelVolume> masks = new ArrayList<>();
            int[][] raw = new int[readers][nx * ny * nz];
            for (int j = 0; j < readers; j++) {
                for (int i = 0; i < raw[j].length; i++) {
                    raw[j][i] = rnd.nextDouble() < density ? values[1 + rnd.nextInt(ints ? 4 : 3)] : 0;
                }
                if (ints) {
                    masks.add(LabelVolume.ofInts(g, raw[j]));
                } else {
                    byte[] b = new byte[raw[j].length];
                    for (int i = 0; i < b.length; i++) {
                        b[i] = (byte) raw[j][i];
                    }
                    masks.add(LabelVolume.ofBytes(g, b));
                }
            }
            assertEquals(bruteForce(raw, structure, nx, ny, nz), Patterns.unionBox(masks, lut));
        }
    }

    private static Box bruteForce(int[][] raw, int[] structure, int nx, int ny, int nz) {
        int x0 = Integer.MAX_VALUE;
        int y0 = Integer.MAX_VALUE;
        int z0 = Integer.MAX_VALUE;
        int x1 = -1;
        int y1 = -1;
        int z1 = -1;
        for (int[] r : raw) {
            for (int z = 0; z < nz; z++) {
                for (int y = 0; y < ny; y++) {
                    for (int x = 0; x < nx; x++) {
                        int v = r[x + nx * (y + ny * z)];
                        boolean in = false;
                        for (int s : structure) {
                            in |= v == s;
                        }
                        if (in) {
                            x0 = Math.min(x0, x);
                            y0 = Math.min(y0, y);
                            z0 = Math.min(z0, z);
                            x1 = Math.max(x1, x);
                            y1 = Math.max(y1, y);
                            z1 = Math.max(z1, z);
                        }
                    }
                }
            }
        }
        return x1 < 0 ? Box.EMPTY : new Box(x0, y0, z0, x1 + 1, y1 + 1, z1 + 1);
    }
}
