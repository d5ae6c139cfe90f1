package org.accordia.agreement;

import java.util.Arrays;

/**
 * The histogram of reader-decision patterns over a region of one case, for one structure: for
 * each distinct pattern (bit {@code j} set when reader {@code j} marks the voxel as the
 * structure), the number of voxels showing it. Every pairwise overlap, every volume, the majority
 * vote and STAPLE follow from it without another pass over the voxels.
 *
 * <p>Patterns are sorted ascending and unique; counts are exact 64-bit. Supports up to 63
 * readers.
 *
 * @param readers number of readers (bits in use)
 * @param patterns distinct patterns, ascending
 * @param counts voxel count of each pattern (positive)
 */
public record PatternHistogram(int readers, long[] patterns, long[] counts) {
    public static final int MAX_READERS = 63;

    public PatternHistogram {
        if (readers < 1 || readers > MAX_READERS) {
            throw new IllegalArgumentException("readers must be 1.." + MAX_READERS + ", got " + readers);
        }
        if (patterns.length != counts.length) {
            throw new IllegalArgumentException("patterns and counts differ in length");
        }
        patterns = patterns.clone();
        counts = counts.clone();
        for (int i = 0; i < patterns.length; i++) {
            if (i > 0 && patterns[i] <= patterns[i - 1]) {
                throw new IllegalArgumentException("patterns must be strictly ascending");
            }
            if ((patterns[i] >>> readers) != 0) {
                throw new IllegalArgumentException("pattern uses a bit beyond reader " + (readers - 1));
            }
            if (counts[i] <= 0) {
                throw new IllegalArgumentException("counts must be positive");
            }
        }
    }

    /** Builds from a dense count array indexed by pattern (length 2^readers), zeros skipped. */
    public static PatternHistogram fromDense(int readers, long[] dense) {
        int n = 0;
        for (long c : dense) {
            if (c > 0) {
                n++;
            }
        }
        long[] p = new long[n];
        long[] c = new long[n];
        int k = 0;
        for (int i = 0; i < dense.length; i++) {
            if (dense[i] > 0) {
                p[k] = i;
                c[k++] = dense[i];
            }
        }
        return new PatternHistogram(readers, p, c);
    }

    public int size() {
        return patterns.length;
    }

    public long pattern(int i) {
        return patterns[i];
    }

    public long count(int i) {
        return counts[i];
    }

    /** Voxels in the region. */
    public long total() {
        long t = 0;
        for (long c : counts) {
            t += c;
        }
        return t;
    }

    /** Voxels marked by reader {@code j}. */
    public long marked(int j) {
        long t = 0;
        for (int i = 0; i < patterns.length; i++) {
            if ((patterns[i] >>> j & 1L) != 0) {
                t += counts[i];
            }
        }
        return t;
    }

    /** Voxels marked by both readers {@code a} and {@code b}. */
    public long markedByBoth(int a, int b) {
        long mask = (1L << a) | (1L << b);
        long t = 0;
        for (int i = 0; i < patterns.length; i++) {
            if ((patterns[i] & mask) == mask) {
                t += counts[i];
            }
        }
        return t;
    }

    /** The same histogram restricted to a subset of readers (bits of {@code keep}), renumbered in bit order. */
    public PatternHistogram restrictTo(long keep) {
        int m = Long.bitCount(keep);
        if (m == 0) {
            throw new IllegalArgumentException("keep at least one reader");
        }
        long[] keys = new long[patterns.length];
        for (int i = 0; i < patterns.length; i++) {
            keys[i] = compress(patterns[i], keep);
        }
        // merge equal keys
        Integer[] order = new Integer[keys.length];
        for (int i = 0; i < order.length; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (x, y) -> Long.compare(keys[x], keys[y]));
        long[] p = new long[keys.length];
        long[] c = new long[keys.length];
        int n = -1;
        for (int idx : order) {
            if (n >= 0 && p[n] == keys[idx]) {
                c[n] += counts[idx];
            } else {
                n++;
                p[n] = keys[idx];
                c[n] = counts[idx];
            }
        }
        return new PatternHistogram(m, Arrays.copyOf(p, n + 1), Arrays.copyOf(c, n + 1));
    }

    /**
     * Packs the bits of {@code value} selected by {@code keep} into the low bits, in bit order:
     * the pattern of a reader subset, numbered as in {@link #restrictTo(long)}.
     */
    public static long compress(long value, long keep) {
        long out = 0;
        int bit = 0;
        for (long k = keep; k != 0; k &= k - 1) {
            int j = Long.numberOfTrailingZeros(k);
            if ((value >>> j & 1L) != 0) {
                out |= 1L << bit;
            }
            bit++;
        }
        return out;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof PatternHistogram h && readers == h.readers
            && Arrays.equals(patterns, h.patterns) && Arrays.equals(counts, h.counts);
    }

    @Override
    public int hashCode() {
        return 31 * (31 * readers + Arrays.hashCode(patterns)) + Arrays.hashCode(counts);
    }

    @Override
    public String toString() {
        return "PatternHistogram[readers=" + readers + ", distinct=" + patterns.length + ", total=" + total() + "]";
    }
}
