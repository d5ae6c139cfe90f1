package org.accordia.consensus;

import java.util.List;
import org.accordia.grid.Box;
import org.accordia.io.LabelVolume;
import org.accordia.study.Structure;

/**
 * The parts of a structure that a reader overlooks entirely: connected components of the
 * majority-vote consensus (voxels marked by more than half of the readers; 6-connectivity in 3-D,
 * 4 in 2-D) of which the reader marks not a single voxel. A reader whose margin is merely tighter
 * still touches every component, so this singles out a missed lesion, not a margin bias.
 *
 * <p>Components smaller than {@code minVoxels} are ignored (noise fragments). Work is confined to
 * the union bounding box of all readers' structure (outside it no reader marks anything). With
 * fewer than three readers nothing is reported (a majority of two is both readers). Cost: one
 * pass over the box per reader plus a flood fill; memory: one int per box voxel.
 */
public final class MissedComponents {
    private MissedComponents() {
    }

    /**
     * What one reader leaves out in one case.
     *
     * @param components majority components the reader does not touch
     * @param voxels their voxels
     */
    public record Missed(int components, long voxels) {
    }

    /**
     * Per reader (case order), the majority components the reader does not touch.
     *
     * @param masks the readers' masks, one grid
     * @param structure the structure
     * @param unionBox the union bounding box of all readers' structure (grid indices)
     * @param minVoxels smallest component counted (at least 1)
     */
    public static List<Missed> perReader(List<LabelVolume> masks, Structure structure, Box unionBox, int minVoxels) {
        long[][] raw = find(masks, structure, unionBox, minVoxels);
        List<Missed> out = new java.util.ArrayList<>(raw.length);
        for (long[] m : raw) {
            out.add(new Missed((int) m[0], m[1]));
        }
        return out;
    }

    /**
     * Per reader (case order), the voxels of the majority components the reader does not touch, and
     * the number of such components.
     *
     * @param masks the readers' masks, one grid
     * @param structure the structure
     * @param unionBox the union bounding box of all readers' structure (grid indices)
     * @param minVoxels smallest component counted (at least 1)
     * @return {@code [reader][0]} = components missed, {@code [reader][1]} = their voxels
     */
    static long[][] find(List<LabelVolume> masks, Structure structure, Box unionBox, int minVoxels) {
        int r = masks.size();
        long[][] out = new long[r][2];
        if (r < 3 || unionBox.isEmpty()) {
            return out;
        }
        int gx = masks.get(0).geometry().nx();
        int gy = masks.get(0).geometry().ny();
        int bx = unionBox.nx();
        int by = unionBox.ny();
        int bz = unionBox.nz();
        int n = unionBox.size();
        boolean[] table = structure.byteTable();
        // votes and, per voxel, which readers mark it (readers ≤ 63 by the histogram's limit)
        long[] who = new long[n];
        for (int j = 0; j < r; j++) {
            LabelVolume m = masks.get(j);
            for (int i = 0; i < n; i++) {
                int v = m.label(unionBox.gridIndex(i, gx, gy));
                if (v < 256 ? table[v] : structure.covers(v)) {
                    who[i] |= 1L << j;
                }
            }
        }
        int[] comp = new int[n]; // 0 = not majority or not yet visited
        int[] stack = new int[n];
        int next = 0;
        for (int seed = 0; seed < n; seed++) {
            if (comp[seed] != 0 || Long.bitCount(who[seed]) * 2 <= r) {
                continue;
            }
            next++;
            int top = 0;
            stack[top++] = seed;
            comp[seed] = next;
            long touched = 0;
            long size = 0;
            while (top > 0) {
                int i = stack[--top];
                size++;
                touched |= who[i];
                int x = i % bx;
                int y = (i / bx) % by;
                int z = i / (bx * by);
                int[] nb = {x > 0 ? i - 1 : -1, x < bx - 1 ? i + 1 : -1, y > 0 ? i - bx : -1, y < by - 1 ? i + bx : -1,
                    z > 0 ? i - bx * by : -1, z < bz - 1 ? i + bx * by : -1};
                for (int k : nb) {
                    if (k >= 0 && comp[k] == 0 && Long.bitCount(who[k]) * 2 > r) {
                        comp[k] = next;
                        stack[top++] = k;
                    }
                }
            }
            if (size >= Math.max(1, minVoxels)) {
                for (int j = 0; j < r; j++) {
                    if ((touched >>> j & 1L) == 0) {
                        out[j][0]++;
                        out[j][1] += size;
                    }
                }
            }
        }
        return out;
    }
}
