package org.accordia.agreement;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.accordia.grid.Box;
import org.junit.jupiter.api.Test;

class BordersTest {

    /** Oracle: the definition, neighbour by neighbour, outside the grid = background. */
    static boolean[] bruteBorder(boolean[] fg, int nx, int ny, int nz) {
        boolean[] out = new boolean[fg.length];
        int[][] nb = nz > 1
            ? new int[][] {{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}, {0, 0, 1}, {0, 0, -1}}
            : new int[][] {{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}};
        for (int z = 0; z < nz; z++) {
            for (int y = 0; y < ny; y++) {
                for (int x = 0; x < nx; x++) {
                    int i = x + nx * (y + ny * z);
                    if (!fg[i]) {
                        continue;
                    }
                    for (int[] d : nb) {
                        int a = x + d[0];
                        int b = y + d[1];
                        int c = z + d[2];
                        if (a < 0 || b < 0 || c < 0 || a >= nx || b >= ny || c >= nz || !fg[a + nx * (b + ny * c)]) {
                            out[i] = true;
                        }
                    }
                }
            }
        }
        return out;
    }

    @Test
    void matchesDefinitionOnRandomMasks() {
        Random rnd = new Random(11);
        for (int trial = 0; trial < 200; trial++) {
            int nx = 1 + rnd.nextInt(8);
            int ny = 1 + rnd.nextInt(8);
            int nz = trial % 2 == 0 ? 1 : 1 + rnd.nextInt(6);
            boolean[] fg = new boolean[nx * ny * nz];
            double p = rnd.nextDouble();
            for (int i = 0; i < fg.length; i++) {
                fg[i] = rnd.nextDouble() < p;
            }
            boolean[] expected = bruteBorder(fg, nx, ny, nz);
            assertArrayEquals(expected, Borders.borderMask(fg, nx, ny, nz));
            // byte-label and int-label variants over a random box
            byte[] labels = new byte[fg.length];
            int[] ints = new int[fg.length];
            for (int i = 0; i < fg.length; i++) {
                labels[i] = (byte) (fg[i] ? 1 + rnd.nextInt(2) : rnd.nextInt(2) * 3);
                ints[i] = labels[i] & 0xFF;
            }
            boolean[] member = new boolean[256];
            member[1] = true;
            member[2] = true;
            int x0 = rnd.nextInt(nx);
            int y0 = rnd.nextInt(ny);
            int z0 = rnd.nextInt(nz);
            Box box = new Box(x0, y0, z0, x0 + 1 + rnd.nextInt(nx - x0), y0 + 1 + rnd.nextInt(ny - y0), z0 + 1 + rnd.nextInt(nz - z0));
            boolean[] cropped = Borders.crop(expected, nx, ny, nz, box);
            assertArrayEquals(cropped, Borders.borderMaskInBox(fg, nx, ny, nz, box));
            assertArrayEquals(cropped, Borders.borderMaskInBox(labels, member, nx, ny, nz, box));
            assertArrayEquals(CaseAgreementEngineTest.indices(cropped), Borders.borderIndicesInBox(labels, member, nx, ny, nz, box));
            assertArrayEquals(cropped, Borders.borderMaskInBox(ints, new int[] {1, 2}, nx, ny, nz, box));
            assertArrayEquals(Borders.crop(fg, nx, ny, nz, box), Borders.crop(labels, member, nx, ny, nz, box));
        }
    }

    @Test
    void boxFaceInsideGridIsNotBackgroundButGridEdgeIs() {
        // A 6x5x4 grid entirely foreground: only voxels on the grid's edge are border voxels.
        int nx = 6;
        int ny = 5;
        int nz = 4;
        boolean[] fg = new boolean[nx * ny * nz];
        java.util.Arrays.fill(fg, true);
        // Box x in [2,4), y in [0,3), z in [1,3): its faces x=2, x=3, y=2, z=1, z=2 lie inside the grid.
        Box box = new Box(2, 0, 1, 4, 3, 3);
        boolean[] b = Borders.borderMaskInBox(fg, nx, ny, nz, box);
        int i = 0;
        for (int z = 1; z < 3; z++) {
            for (int y = 0; y < 3; y++) {
                for (int x = 2; x < 4; x++, i++) {
                    // only y == 0 touches the grid's edge within this box
                    assertEquals(y == 0, b[i], "voxel " + x + "," + y + "," + z);
                }
            }
        }
        // The same box after growing to the grid: grid-edge voxels are border, interior not.
        Box grown = box.grow(10, nx, ny, nz);
        assertEquals(Box.grid(nx, ny, nz), grown);
        boolean[] all = Borders.borderMaskInBox(fg, nx, ny, nz, grown);
        assertTrue(all[0]);
        assertFalse(all[1 + nx * (1 + ny * 1)]);
    }

    @Test
    void twoDimensionalUsesFourNeighbours() {
        // 3x3 square in a 5x5 image: the centre has all 4 face-neighbours in the square -> not border;
        // its diagonal neighbours do not matter (4-connectivity).
        int n = 5;
        boolean[] fg = new boolean[n * n];
        for (int y = 1; y < 4; y++) {
            for (int x = 1; x < 4; x++) {
                fg[x + n * y] = true;
            }
        }
        boolean[] b = Borders.borderMask(fg, n, n, 1);
        int count = 0;
        for (boolean v : b) {
            count += v ? 1 : 0;
        }
        assertEquals(8, count);
        assertFalse(b[2 + n * 2]);
    }

    @Test
    void boundingBoxAndGrow() {
        boolean[] fg = new boolean[4 * 4 * 3];
        fg[1 + 4 * (2 + 4 * 1)] = true;
        fg[2 + 4 * (1 + 4 * 2)] = true;
        Box b = Borders.boundingBox(fg, 4, 4, 3);
        assertEquals(new Box(1, 1, 1, 3, 3, 3), b);
        assertEquals(8, b.size());
        assertEquals(new Box(0, 0, 0, 4, 4, 3), b.grow(1, 4, 4, 3));
        assertTrue(Borders.boundingBox(new boolean[8], 2, 2, 2).isEmpty());
        assertTrue(Box.EMPTY.grow(3, 4, 4, 4).isEmpty());
    }
}
