package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.TreeMap;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The label-tuple histogram and the label consensus volume, which confine their voxel pass to the
 * bounding box of non-zero voxels when every volume is byte-stored, against the plain definition:
 * brute-force tuple counts over every voxel (common practice), and the same volumes stored as ints
 * (which take the whole-grid pass). The label set found from the data (values collected inside the
 * box) against every value present.
 */
class LabelTupleBoxTest {

    /** 0 and every value in the volumes, ascending. */
    private static int[] present(int[][] raw) {
        java.util.TreeSet<Integer> set = new java.util.TreeSet<>(List.of(0));
        for (int[] r : raw) {
            for (int v : r) {
                set.add(v);
            }
        }
        return set.stream().mapToInt(Integer::intValue).toArray();
    }

    @ParameterizedTest
    @CsvSource({
        // nx, ny, nz, readers, density, seed
        "1, 1, 1, 2, 0.5, 1",
        "9, 5, 3, 3, 0.02, 2",
        "17, 6, 4, 3, 0.005, 3",
        "16, 16, 4, 4, 0.0, 4",
        "12, 7, 5, 9, 0.01, 5",
        "6, 4, 3, 2, 1.0, 6",
        "40, 20, 6, 5, 0.002, 7",
        "10, 6, 3, 11, 0.01, 8", // 22 key bits: the hashed counter
    })
    void boxPassEqualsWholeGrid(int nx, int ny, int nz, int readers, double density, long seed) {
        Geometry g = Geometry.axisAligned(nx, ny, nz, 1, 1, 1);
        Random rnd = new Random(seed);
        int n = nx * ny * nz;
        for (int trial = 0; trial < 10; trial++) {
            List<LabelVolume> bytes = new ArrayList<>();
            List<LabelVolume> ints = new ArrayList<>();
            int[][] raw = new int[readers][n];
            for (int j = 0; j < readers; j++) {
                byte[] b = new byte[n];
                for (int i = 0; i < n; i++) {
                    // values 1, 2 and 7 (7 is not in the label set below: counts as background)
                    raw[j][i] = rnd.nextDouble() < density ? new int[] {1, 2, 7}[rnd.nextInt(3)] : 0;
                    b[i] = (byte) raw[j][i];
                }
                bytes.add(LabelVolume.ofBytes(g, b));
            }
            // the int-stored copies: one background voxel (0 or 7) of reader 0 becomes 300, also
            // background for the label set below, so that ofInts keeps ints (it compacts labels ≤ 255)
            int[][] intRaw = new int[readers][];
            for (int j = 0; j < readers; j++) {
                intRaw[j] = raw[j].clone();
            }
            for (int i = 0; i < n; i++) {
                if (raw[0][i] == 0 || raw[0][i] == 7) {
                    intRaw[0][i] = 300;
                    break;
                }
            }
            for (int j = 0; j < readers; j++) {
                ints.add(LabelVolume.ofInts(g, intRaw[j]));
            }
            int[] labels = {0, 1, 2};
            LabelTupleHistogram hb = LabelTupleHistogram.build(bytes, labels);
            LabelTupleHistogram hi = LabelTupleHistogram.build(ints, labels);
            // brute force: tuple key per voxel, label index s of reader j at bits b*j
            TreeMap<Long, Long> expected = new TreeMap<>();
            int bits = hb.bitsPerReader();
            for (int i = 0; i < n; i++) {
                long key = 0;
                for (int j = 0; j < readers; j++) {
                    int v = raw[j][i];
                    key |= (long) (v == 1 ? 1 : v == 2 ? 2 : 0) << (bits * j);
                }
                expected.merge(key, 1L, Long::sum);
            }
            assertEquals(expected.size(), hb.size());
            int t = 0;
            for (var e : expected.entrySet()) {
                assertEquals(e.getKey(), hb.key(t));
                assertEquals(e.getValue(), hb.count(t));
                assertEquals(e.getKey(), hi.key(t));
                assertEquals(e.getValue(), hi.count(t));
                t++;
            }
            // the label set found from the data: inside the non-zero box (bytes) or by a full scan (ints)
            assertArrayEquals(present(raw), LabelTupleHistogram.build(bytes).labels());
            assertArrayEquals(present(intRaw), LabelTupleHistogram.build(ints).labels());
            // a consensus value per tuple that is non-zero for the all-background tuple too
            int[] perTuple = new int[hb.size()];
            for (int s = 0; s < perTuple.length; s++) {
                perTuple[s] = 3 + (int) (hb.key(s) % 5);
            }
            LabelVolume cb = ConsensusOutputs.labelConsensus(bytes, hb, perTuple);
            LabelVolume ci = ConsensusOutputs.labelConsensus(ints, hi, perTuple);
            int[] expectedLabels = new int[n];
            for (int i = 0; i < n; i++) {
                long key = 0;
                for (int j = 0; j < readers; j++) {
                    int v = raw[j][i];
                    key |= (long) (v == 1 ? 1 : v == 2 ? 2 : 0) << (bits * j);
                }
                expectedLabels[i] = perTuple[hb.find(key)];
            }
            int[] gotB = new int[n];
            int[] gotI = new int[n];
            for (int i = 0; i < n; i++) {
                gotB[i] = cb.label(i);
                gotI[i] = ci.label(i);
            }
            assertArrayEquals(expectedLabels, gotB);
            assertArrayEquals(expectedLabels, gotI);
            // the box the histogram kept, and the whole grid as a box: the same volume
            if (!ints.get(0).isCompact()) {
                org.junit.jupiter.api.Assertions.assertNull(hi.nonzeroBox(), "int volumes keep no box");
            }
            for (org.accordia.grid.Box known : new org.accordia.grid.Box[] {hb.nonzeroBox(),
                org.accordia.grid.Box.grid(nx, ny, nz)}) {
                LabelVolume withBox = ConsensusOutputs.labelConsensus(bytes, hb, perTuple, known);
                for (int i = 0; i < n; i++) {
                    assertEquals(expectedLabels[i], withBox.label(i));
                }
            }
            // values beyond a byte: the int store, same labels
            int[] widePerTuple = java.util.Arrays.stream(perTuple).map(v -> v + 300).toArray();
            LabelVolume wide = ConsensusOutputs.labelConsensus(bytes, hb, widePerTuple);
            org.junit.jupiter.api.Assertions.assertFalse(wide.isCompact());
            for (int i = 0; i < n; i++) {
                assertEquals(expectedLabels[i] + 300, wide.label(i));
            }
        }
    }
}
