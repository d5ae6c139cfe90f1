package org.accordia.agreement;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class PatternHistogramTest {
    // Three readers over ten voxels: r0 = 1111100000, r1 = 1111000000, r2 = 0111111000.
    private static PatternHistogram tenVoxels() {
        int[][] marks = {
            {1, 1, 1, 1, 1, 0, 0, 0, 0, 0},
            {1, 1, 1, 1, 0, 0, 0, 0, 0, 0},
            {0, 1, 1, 1, 1, 1, 1, 0, 0, 0}
        };
        long[] dense = new long[8];
        for (int v = 0; v < 10; v++) {
            int p = 0;
            for (int j = 0; j < 3; j++) {
                p |= marks[j][v] << j;
            }
            dense[p]++;
        }
        return PatternHistogram.fromDense(3, dense);
    }

    @Test
    void countsFollowFromPatterns() {
        PatternHistogram h = tenVoxels();
        assertEquals(10, h.total());
        assertEquals(5, h.marked(0));
        assertEquals(4, h.marked(1));
        assertEquals(6, h.marked(2));
        assertEquals(4, h.markedByBoth(0, 1));
        assertEquals(4, h.markedByBoth(0, 2));
        assertEquals(3, h.markedByBoth(1, 2));
    }

    @Test
    void restrictionMergesPatterns() {
        PatternHistogram h = tenVoxels().restrictTo(0b101);
        assertEquals(2, h.readers());
        // r0,r2 per voxel: 10,11,11,11,11,01,01,00,00,00 -> pattern(bit0=r0,bit1=r2)
        assertArrayEquals(new long[] {0, 1, 2, 3}, h.patterns());
        assertArrayEquals(new long[] {3, 1, 2, 4}, h.counts());
        assertEquals(4, h.markedByBoth(0, 1));
    }

    @Test
    void rejectsUnsortedOrOutOfRangePatterns() {
        assertThrows(IllegalArgumentException.class, () -> new PatternHistogram(2, new long[] {2, 1}, new long[] {1, 1}));
        assertThrows(IllegalArgumentException.class, () -> new PatternHistogram(2, new long[] {4}, new long[] {1}));
        assertThrows(IllegalArgumentException.class, () -> new PatternHistogram(2, new long[] {1}, new long[] {0}));
    }
}
