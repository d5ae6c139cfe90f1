package org.accordia.consensus;

import java.util.List;
import org.accordia.agreement.Borders.Box;
import org.accordia.io.LabelVolume;

/** Voxel-level helpers shared by the consensus classes: structure membership and patterns. */
final class Patterns {
    private Patterns() {
    }

    /** Membership table by label value for the structure's label values (length ≥ 256). */
    static boolean[] lut(int[] structureLabels) {
        int max = 255;
        for (int v : structureLabels) {
            if (v < 0) {
                throw new IllegalArgumentException("negative structure label " + v);
            }
            max = Math.max(max, v);
        }
        boolean[] lut = new boolean[max + 1];
        for (int v : structureLabels) {
            lut[v] = true;
        }
        return lut;
    }

    static void checkSameGrid(List<LabelVolume> masks) {
        if (masks.isEmpty()) {
            throw new IllegalArgumentException("no masks");
        }
        if (masks.size() > 63) {
            throw new IllegalArgumentException("at most 63 readers");
        }
        for (LabelVolume m : masks) {
            if (m.voxelCount() != masks.get(0).voxelCount()
                || !java.util.Arrays.equals(m.geometry().dims(), masks.get(0).geometry().dims())) {
                throw new IllegalArgumentException("masks must share one grid");
            }
        }
    }

    /** Reader j's membership flags over the whole grid. */
    static boolean[] member(LabelVolume m, boolean[] lut) {
        int n = m.voxelCount();
        boolean[] out = new boolean[n];
        if (m.isCompact()) {
            byte[] b = m.bytes();
            for (int i = 0; i < n; i++) {
                out[i] = lut[b[i] & 0xFF];
            }
        } else {
            int[] v = m.ints();
            for (int i = 0; i < n; i++) {
                out[i] = v[i] < lut.length && lut[v[i]];
            }
        }
        return out;
    }

    /** Bounding box of the voxels any reader marks as the structure ({@link Box#EMPTY} if none). */
    static Box unionBox(List<LabelVolume> masks, boolean[] lut) {
        int[] d = masks.get(0).geometry().dims();
        int nx = d[0];
        int ny = d[1];
        int nz = d[2];
        int x0 = Integer.MAX_VALUE;
        int y0 = Integer.MAX_VALUE;
        int z0 = Integer.MAX_VALUE;
        int x1 = -1;
        int y1 = -1;
        int z1 = -1;
        for (LabelVolume m : masks) {
            byte[] b = m.bytes();
            int[] v = m.ints();
            int i = 0;
            for (int z = 0; z < nz; z++) {
                for (int y = 0; y < ny; y++) {
                    int rowMin = -1;
                    int rowMax = -1;
                    for (int x = 0; x < nx; x++, i++) {
                        boolean in = b != null ? lut[b[i] & 0xFF] : v[i] < lut.length && lut[v[i]];
                        if (in) {
                            if (rowMin < 0) {
                                rowMin = x;
                            }
                            rowMax = x;
                        }
                    }
                    if (rowMin >= 0) {
                        x0 = Math.min(x0, rowMin);
                        x1 = Math.max(x1, rowMax);
                        y0 = Math.min(y0, y);
                        y1 = Math.max(y1, y);
                        z0 = Math.min(z0, z);
                        z1 = Math.max(z1, z);
                    }
                }
            }
        }
        return x1 < 0 ? Box.EMPTY : new Box(x0, y0, z0, x1 + 1, y1 + 1, z1 + 1);
    }

    /** The decision pattern of all readers at every voxel of {@code box} (x fastest in the box). */
    static long[] patternsInBox(List<LabelVolume> masks, boolean[] lut, Box box) {
        int[] d = masks.get(0).geometry().dims();
        int nx = d[0];
        int ny = d[1];
        long[] out = new long[box.size()];
        for (int j = 0; j < masks.size(); j++) {
            LabelVolume m = masks.get(j);
            byte[] b = m.bytes();
            int[] v = m.ints();
            long bit = 1L << j;
            int k = 0;
            for (int z = box.z0(); z < box.z1(); z++) {
                for (int y = box.y0(); y < box.y1(); y++) {
                    int row = nx * (y + ny * z);
                    for (int x = box.x0(); x < box.x1(); x++, k++) {
                        int i = row + x;
                        boolean in = b != null ? lut[b[i] & 0xFF] : v[i] < lut.length && lut[v[i]];
                        if (in) {
                            out[k] |= bit;
                        }
                    }
                }
            }
        }
        return out;
    }
}
