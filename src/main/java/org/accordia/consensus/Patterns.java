package org.accordia.consensus;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.util.Arrays;
import java.util.List;
import org.accordia.grid.Box;
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

    private static final VarHandle LONGS = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

    /**
     * Bounding box of the voxels where any volume holds a non-zero value, when every volume is
     * byte-stored ({@link Box#EMPTY} if all are 0); null when some volume stores ints (callers then
     * use the whole grid).
     */
    static Box nonzeroByteBox(List<LabelVolume> volumes) {
        for (LabelVolume v : volumes) {
            if (!v.isCompact()) {
                return null;
            }
        }
        boolean[] nonzero = new boolean[256];
        Arrays.fill(nonzero, 1, 256, true);
        return unionBox(volumes, nonzero);
    }

    /** Bounding box of the voxels any reader marks as the structure ({@link Box#EMPTY} if none). */
    static Box unionBox(List<LabelVolume> masks, boolean[] lut) {
        int[] d = masks.get(0).geometry().dims();
        int nx = d[0];
        int ny = d[1];
        int nz = d[2];
        // {x0, y0, z0, x1, y1, z1}, inclusive
        int[] ext = {Integer.MAX_VALUE, Integer.MAX_VALUE, Integer.MAX_VALUE, -1, -1, -1};
        for (LabelVolume m : masks) {
            byte[] b = m.bytes();
            if (b != null && !lut[0]) {
                // label 0 is outside the structure: an all-zero 8-byte word holds no member
                int n = b.length;
                int words = n & ~7;
                for (int i = 0; i < words; i += 8) {
                    if ((long) LONGS.get(b, i) != 0L) {
                        for (int k = i; k < i + 8; k++) {
                            if (lut[b[k] & 0xFF]) {
                                extend(ext, k, nx, ny);
                            }
                        }
                    }
                }
                for (int k = words; k < n; k++) {
                    if (lut[b[k] & 0xFF]) {
                        extend(ext, k, nx, ny);
                    }
                }
                continue;
            }
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
                        ext[0] = Math.min(ext[0], rowMin);
                        ext[3] = Math.max(ext[3], rowMax);
                        ext[1] = Math.min(ext[1], y);
                        ext[4] = Math.max(ext[4], y);
                        ext[2] = Math.min(ext[2], z);
                        ext[5] = Math.max(ext[5], z);
                    }
                }
            }
        }
        return ext[3] < 0 ? Box.EMPTY : new Box(ext[0], ext[1], ext[2], ext[3] + 1, ext[4] + 1, ext[5] + 1);
    }

    private static void extend(int[] ext, int index, int nx, int ny) {
        int x = index % nx;
        int yz = index / nx;
        int y = yz % ny;
        int z = yz / ny;
        ext[0] = Math.min(ext[0], x);
        ext[1] = Math.min(ext[1], y);
        ext[2] = Math.min(ext[2], z);
        ext[3] = Math.max(ext[3], x);
        ext[4] = Math.max(ext[4], y);
        ext[5] = Math.max(ext[5], z);
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
