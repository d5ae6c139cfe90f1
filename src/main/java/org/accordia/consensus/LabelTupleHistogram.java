package org.accordia.consensus;

import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;
import org.accordia.grid.Box;
import org.accordia.io.LabelVolume;

/**
 * The histogram of label tuples of one case: for each distinct tuple (the label every reader gives
 * a voxel), the number of voxels showing it. The multi-label counterpart of
 * {@link org.accordia.agreement.PatternHistogram}; multi-label STAPLE and majority vote run on it.
 *
 * <p>Labels are the S label values of the study including background 0, ascending; a reader's
 * label is stored as its index among them. A key packs the indices, {@link #bitsPerReader()} bits
 * per reader, reader j at bits [j·b, (j+1)·b). Keys are ascending and unique, counts exact 64-bit.
 * R·b must fit in 63 bits. Voxel values not among {@code labels} count as background (index 0),
 * as in the per-structure binary histograms.
 */
public final class LabelTupleHistogram {
    private static final int BLOCK = 4096;
    private static final int DENSE_BITS = 20;

    private final int readers;
    private final int[] labels;
    private final int bits;
    private final long[] keys;
    private final long[] counts;
    /** Bounding box of the non-zero voxels of the byte volumes it was built from, or null (not part of equality). */
    private Box nonzeroBox;

    /**
     * @param readers number of readers
     * @param labels label values, ascending, distinct, first 0 (background)
     * @param keys packed tuples, ascending
     * @param counts positive voxel counts
     */
    public LabelTupleHistogram(int readers, int[] labels, long[] keys, long[] counts) {
        if (readers < 1) {
            throw new IllegalArgumentException("at least one reader");
        }
        checkLabels(labels);
        this.readers = readers;
        this.labels = labels.clone();
        this.bits = bitsFor(labels.length);
        if ((long) bits * readers > 63) {
            throw new IllegalArgumentException(readers + " readers x " + bits + " bits per label exceed 63 bits");
        }
        if (keys.length != counts.length) {
            throw new IllegalArgumentException("keys and counts differ in length");
        }
        this.keys = keys.clone();
        this.counts = counts.clone();
        long mask = (1L << bits) - 1;
        for (int i = 0; i < keys.length; i++) {
            if (i > 0 && keys[i] <= keys[i - 1]) {
                throw new IllegalArgumentException("keys must be strictly ascending");
            }
            if (counts[i] <= 0) {
                throw new IllegalArgumentException("counts must be positive");
            }
            for (int j = 0; j < readers; j++) {
                if ((keys[i] >>> (bits * j) & mask) >= labels.length) {
                    throw new IllegalArgumentException("key holds a label index beyond the label set");
                }
            }
            if ((keys[i] >>> (bits * readers)) != 0) {
                throw new IllegalArgumentException("key uses bits beyond the readers");
            }
        }
    }

    private static void checkLabels(int[] labels) {
        if (labels.length < 1 || labels[0] != 0) {
            throw new IllegalArgumentException("labels must start with background 0");
        }
        for (int i = 1; i < labels.length; i++) {
            if (labels[i] <= labels[i - 1]) {
                throw new IllegalArgumentException("labels must be ascending and distinct");
            }
        }
    }

    /** Bits per reader: enough for S label indices (at least 1). */
    static int bitsFor(int s) {
        return Math.max(1, 32 - Integer.numberOfLeadingZeros(s - 1));
    }

    /**
     * Builds the histogram in one pass over the readers' volumes (all on one grid). Byte-stored
     * volumes go through a 256-entry table; blocks of voxels keep the pass cache-friendly.
     *
     * @param volumes one volume per reader, reader order = bit order
     * @param labels label values, ascending, first 0; other values count as background
     */
    public static LabelTupleHistogram build(List<LabelVolume> volumes, int[] labels) {
        Patterns.checkSameGrid(volumes);
        return build(volumes, labels, Patterns.nonzeroByteBox(volumes));
    }

    /**
     * As {@link #build(List, int[])}; {@code box} = the bounding box of every non-zero voxel of
     * every volume ({@link Patterns#nonzeroByteBox}), or null to pass over the whole grid.
     */
    private static LabelTupleHistogram build(List<LabelVolume> volumes, int[] labels, Box box) {
        checkLabels(labels);
        int r = volumes.size();
        int b = bitsFor(labels.length);
        if ((long) b * r > 63) {
            throw new IllegalArgumentException(r + " readers x " + b + " bits per label exceed 63 bits");
        }
        int maxValue = labels[labels.length - 1];
        int[] index = new int[Math.max(256, maxValue + 1)];
        for (int s = 0; s < labels.length; s++) {
            index[labels[s]] = s;
        }
        byte[] byteIndex = new byte[256];
        for (int v = 0; v < 256; v++) {
            byteIndex[v] = (byte) index[v];
        }
        int n = volumes.get(0).voxelCount();
        int totalBits = b * r;
        Counter counter = totalBits <= DENSE_BITS ? new DenseCounter(1 << totalBits) : new HashCounter();
        if (box == null) {
            long[] block = new long[BLOCK];
            for (int start = 0; start < n; start += BLOCK) {
                int len = Math.min(BLOCK, n - start);
                fillKeys(volumes, index, byteIndex, b, start, len, block);
                counter.add(block, len);
            }
        } else {
            // every reader holds 0 outside the box: those voxels all have tuple key 0
            int[] d = volumes.get(0).geometry().dims();
            int len = box.nx();
            long[] block = new long[Math.max(1, len)];
            for (int z = box.z0(); z < box.z1(); z++) {
                for (int y = box.y0(); y < box.y1(); y++) {
                    fillKeys(volumes, index, byteIndex, b, box.x0() + d[0] * (y + d[1] * z), len, block);
                    counter.add(block, len);
                }
            }
            if (n - box.size() > 0) {
                counter.addCount(0L, n - box.size());
            }
        }
        long[][] kc = counter.sorted();
        LabelTupleHistogram h = new LabelTupleHistogram(r, labels, kc[0], kc[1]);
        h.nonzeroBox = box;
        return h;
    }

    private static void fillKeys(List<LabelVolume> volumes, int[] index, byte[] byteIndex, int b, int start, int len,
            long[] block) {
        Arrays.fill(block, 0, len, 0L);
        for (int j = 0; j < volumes.size(); j++) {
            LabelVolume v = volumes.get(j);
            int shift = b * j;
            if (v.isCompact()) {
                byte[] src = v.bytes();
                for (int i = 0; i < len; i++) {
                    block[i] |= (long) byteIndex[src[start + i] & 0xFF] << shift;
                }
            } else {
                int[] src = v.ints();
                for (int i = 0; i < len; i++) {
                    int val = src[start + i];
                    block[i] |= (long) (val < index.length ? index[val] : 0) << shift;
                }
            }
        }
    }

    /**
     * Builds with the label set = 0 plus every value present in any volume. For byte-stored
     * volumes the values are collected inside the bounding box of the non-zero voxels only (all
     * are inside it); otherwise by a full scan of each volume.
     */
    public static LabelTupleHistogram build(List<LabelVolume> volumes) {
        Patterns.checkSameGrid(volumes);
        Box box = Patterns.nonzeroByteBox(volumes);
        TreeSet<Integer> set = new TreeSet<>();
        set.add(0);
        if (box == null) {
            for (LabelVolume v : volumes) {
                set.addAll(v.labelCounts().keySet());
            }
        } else {
            boolean[] seen = new boolean[256];
            int[] d = volumes.get(0).geometry().dims();
            for (LabelVolume v : volumes) {
                byte[] b = v.bytes();
                for (int z = box.z0(); z < box.z1(); z++) {
                    for (int y = box.y0(); y < box.y1(); y++) {
                        int row = box.x0() + d[0] * (y + d[1] * z);
                        for (int i = row; i < row + box.nx(); i++) {
                            seen[b[i] & 0xFF] = true;
                        }
                    }
                }
            }
            for (int value = 1; value < 256; value++) {
                if (seen[value]) {
                    set.add(value);
                }
            }
        }
        return build(volumes, set.stream().mapToInt(Integer::intValue).toArray(), box);
    }

    private interface Counter {
        void add(long[] keys, int len);

        void addCount(long key, long count);

        long[][] sorted();
    }

    private static final class DenseCounter implements Counter {
        private final long[] c;

        DenseCounter(int size) {
            c = new long[size];
        }

        @Override
        public void add(long[] keys, int len) {
            for (int i = 0; i < len; i++) {
                c[(int) keys[i]]++;
            }
        }

        @Override
        public void addCount(long key, long count) {
            c[(int) key] += count;
        }

        @Override
        public long[][] sorted() {
            int m = 0;
            for (long v : c) {
                if (v > 0) {
                    m++;
                }
            }
            long[] k = new long[m];
            long[] n = new long[m];
            int t = 0;
            for (int i = 0; i < c.length; i++) {
                if (c[i] > 0) {
                    k[t] = i;
                    n[t++] = c[i];
                }
            }
            return new long[][] {k, n};
        }
    }

    /** Open addressing, linear probing; key -1 never occurs (keys use at most 63 bits). */
    private static final class HashCounter implements Counter {
        private long[] k = new long[1024];
        private long[] c = new long[1024];
        private int size;
        private long lastKey = -1;
        private int lastSlot = -1;

        HashCounter() {
            Arrays.fill(k, -1L);
        }

        @Override
        public void add(long[] keys, int len) {
            for (int i = 0; i < len; i++) {
                long key = keys[i];
                if (key == lastKey) {
                    c[lastSlot]++; // runs of equal tuples (background) are the common case
                    continue;
                }
                int slot = find(key);
                if (k[slot] == -1L) {
                    k[slot] = key;
                    size++;
                    if (size * 2 > k.length) {
                        grow();
                        slot = find(key);
                    }
                }
                c[slot]++;
                lastKey = key;
                lastSlot = slot;
            }
        }

        @Override
        public void addCount(long key, long count) {
            int slot = find(key);
            if (k[slot] == -1L) {
                k[slot] = key;
                size++;
                if (size * 2 > k.length) {
                    grow();
                    slot = find(key);
                }
            }
            c[slot] += count;
            lastKey = -1;
        }

        private int find(long key) {
            int mask = k.length - 1;
            int h = (int) (mix(key) & mask);
            while (k[h] != -1L && k[h] != key) {
                h = (h + 1) & mask;
            }
            return h;
        }

        private static long mix(long x) {
            x ^= x >>> 33;
            x *= 0xff51afd7ed558ccdL;
            x ^= x >>> 33;
            return x;
        }

        private void grow() {
            long[] ok = k;
            long[] oc = c;
            k = new long[ok.length * 2];
            c = new long[ok.length * 2];
            Arrays.fill(k, -1L);
            for (int i = 0; i < ok.length; i++) {
                if (ok[i] != -1L) {
                    int s = find(ok[i]);
                    k[s] = ok[i];
                    c[s] = oc[i];
                }
            }
            lastKey = -1;
        }

        @Override
        public long[][] sorted() {
            long[][] pairs = new long[size][];
            int t = 0;
            for (int i = 0; i < k.length; i++) {
                if (k[i] != -1L) {
                    pairs[t++] = new long[] {k[i], c[i]};
                }
            }
            Arrays.sort(pairs, (a, b2) -> Long.compare(a[0], b2[0]));
            long[] ks = new long[size];
            long[] cs = new long[size];
            for (int i = 0; i < size; i++) {
                ks[i] = pairs[i][0];
                cs[i] = pairs[i][1];
            }
            return new long[][] {ks, cs};
        }
    }

    public int readers() {
        return readers;
    }

    /** The label values, ascending, first 0 (a copy). */
    public int[] labels() {
        return labels.clone();
    }

    /** Number of labels S including background. */
    public int labelCount() {
        return labels.length;
    }

    public int label(int s) {
        return labels[s];
    }

    public int bitsPerReader() {
        return bits;
    }

    /** Number of distinct tuples. */
    public int size() {
        return keys.length;
    }

    public long key(int i) {
        return keys[i];
    }

    public long count(int i) {
        return counts[i];
    }

    /** Label index (0..S−1) reader j gives the voxels of tuple i. */
    public int labelIndex(int i, int j) {
        return indexInKey(keys[i], j);
    }

    int indexInKey(long key, int j) {
        return (int) (key >>> (bits * j) & ((1L << bits) - 1));
    }

    /** The position of a key among the tuples, or a negative value when absent. */
    public int find(long key) {
        return Arrays.binarySearch(keys, key);
    }

    /** Packs label indices (one per reader) into a key. */
    public long keyOf(int... labelIndices) {
        if (labelIndices.length != readers) {
            throw new IllegalArgumentException("one label index per reader expected");
        }
        long k = 0;
        for (int j = 0; j < readers; j++) {
            if (labelIndices[j] < 0 || labelIndices[j] >= labels.length) {
                throw new IllegalArgumentException("label index out of range: " + labelIndices[j]);
            }
            k |= (long) labelIndices[j] << (bits * j);
        }
        return k;
    }

    public long total() {
        long t = 0;
        for (long c : counts) {
            t += c;
        }
        return t;
    }

    /**
     * The bounding box of every non-zero voxel of the volumes this histogram was built from (when
     * all were byte-stored), so that a later pass over the same volumes need not find it again
     * ({@link ConsensusOutputs#labelConsensus(List, MultiLabelStapleResult, Box)}); null otherwise.
     */
    public Box nonzeroBox() {
        return nonzeroBox;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof LabelTupleHistogram h && readers == h.readers && Arrays.equals(labels, h.labels)
            && Arrays.equals(keys, h.keys) && Arrays.equals(counts, h.counts);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(keys) * 31 + Arrays.hashCode(counts);
    }

    @Override
    public String toString() {
        return "LabelTupleHistogram[readers=" + readers + ", labels=" + Arrays.toString(labels) + ", distinct="
            + keys.length + ", total=" + total() + "]";
    }
}
