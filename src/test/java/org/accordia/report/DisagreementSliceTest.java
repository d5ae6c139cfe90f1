package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

class DisagreementSliceTest {

    static final int NX = 6;
    static final int NY = 5;
    static final int NZ = 4;

    static void mark(boolean[] m, int x, int y, int z) {
        m[x + NX * (y + NY * z)] = true;
    }

    @Test
    void knownAnswerWithATieGoingToTheSmallestZ() {
        boolean[] a = new boolean[NX * NY * NZ];
        boolean[] b = new boolean[NX * NY * NZ];
        boolean[] c = new boolean[NX * NY * NZ];
        // z = 0: 4 voxels marked by all three readers (agreement, not counted)
        for (int x = 0; x < 4; x++) {
            mark(a, x, 0, 0);
            mark(b, x, 0, 0);
            mark(c, x, 0, 0);
        }
        // z = 1: 3 disputed voxels (1 or 2 of 3 readers)
        mark(a, 0, 0, 1);
        mark(a, 1, 1, 1);
        mark(b, 1, 1, 1);
        mark(c, 5, 4, 1);
        // z = 2: 3 disputed voxels too -> tie, z = 1 wins
        mark(a, 2, 2, 2);
        mark(b, 3, 2, 2);
        mark(c, 4, 2, 2);
        // z = 3: 2 disputed, 1 unanimous
        mark(a, 0, 4, 3);
        mark(b, 1, 4, 3);
        mark(a, 5, 0, 3);
        mark(b, 5, 0, 3);
        mark(c, 5, 0, 3);
        // counted by hand from the marks above
        assertEquals(new DisagreementSlice(1, 3), DisagreementSlice.find(List.of(a, b, c), NX, NY, NZ));
        // the same volume seen as a crop that starts at slice 10 of a larger volume
        assertEquals(new DisagreementSlice(11, 3), DisagreementSlice.find(List.of(a, b, c), NX, NY, NZ, 10));
    }

    @Test
    void withoutDisagreementTheMostUnanimousSliceIsShown() {
        boolean[] a = new boolean[NX * NY * NZ];
        mark(a, 1, 1, 2);
        mark(a, 2, 1, 2);
        mark(a, 1, 1, 3);
        boolean[] b = a.clone();
        assertEquals(new DisagreementSlice(2, 0), DisagreementSlice.find(List.of(a, b), NX, NY, NZ));
        assertEquals(new DisagreementSlice(0, 0),
            DisagreementSlice.find(List.of(new boolean[NX * NY * NZ]), NX, NY, NZ), "all empty: first slice");
    }

    @Test
    void votesAgreeWithABruteForceCountOnRandomMasks() {
        Random rnd = new Random(20261202L);
        for (int trial = 0; trial < 50; trial++) {
            int readers = 1 + rnd.nextInt(6);
            int nz = 1 + rnd.nextInt(7);
            List<boolean[]> masks = new ArrayList<>();
            for (int r = 0; r < readers; r++) {
                boolean[] m = new boolean[NX * NY * nz];
                for (int i = 0; i < m.length; i++) {
                    m[i] = rnd.nextDouble() < 0.3;
                }
                masks.add(m);
            }
            // brute force: the definition, voxel by voxel
            long[] disputed = new long[nz];
            byte[] votes = new byte[NX * NY * nz];
            for (int z = 0; z < nz; z++) {
                for (int i = 0; i < NX * NY; i++) {
                    int v = 0;
                    for (boolean[] m : masks) {
                        v += m[z * NX * NY + i] ? 1 : 0;
                    }
                    votes[z * NX * NY + i] = (byte) v;
                    if (v > 0 && v < readers) {
                        disputed[z]++;
                    }
                }
            }
            int best = 0;
            for (int z = 0; z < nz; z++) {
                if (disputed[z] > disputed[best]) {
                    best = z;
                }
            }
            DisagreementSlice fromMasks = DisagreementSlice.find(masks, NX, NY, nz);
            DisagreementSlice fromVotes = DisagreementSlice.fromVotes(votes, readers, NX, NY, nz);
            assertEquals(fromMasks, fromVotes);
            if (disputed[best] > 0) {
                assertEquals(new DisagreementSlice(best, disputed[best]), fromVotes);
            }
        }
    }

    @Test
    void rejectsInconsistentInput() {
        assertThrows(IllegalArgumentException.class, () -> DisagreementSlice.fromVotes(new byte[10], 2, 2, 2, 2));
        assertThrows(IllegalArgumentException.class, () -> DisagreementSlice.fromVotes(new byte[] {3}, 2, 1, 1, 1));
        assertThrows(IllegalArgumentException.class,
            () -> DisagreementSlice.find(List.of(new boolean[8], new boolean[4]), 2, 2, 2));
    }

    @Test
    void extractsSlices() {
        float[] vol = new float[2 * 2 * 3];
        for (int i = 0; i < vol.length; i++) {
            vol[i] = i;
        }
        org.junit.jupiter.api.Assertions.assertArrayEquals(new float[] {8, 9, 10, 11}, DisagreementSlice.slice(vol, 2, 2, 2));
    }
}
