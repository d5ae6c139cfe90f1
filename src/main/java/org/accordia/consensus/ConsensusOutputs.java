package org.accordia.consensus;

import java.util.Arrays;
import java.util.List;
import org.accordia.grid.Box;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;

/**
 * In-memory consensus outputs of one case on the source grid, ready for a volume writer:
 * the STAPLE probability map of a structure and consensus label masks. Each is one pass over the
 * readers' volumes (binary ones only over the union box of the readers' masks; everything outside
 * it has pattern 0 and gets W(0)).
 */
public final class ConsensusOutputs {
    private ConsensusOutputs() {
    }

    /**
     * W per voxel (float) from the voxel's decision pattern in the STAPLE result of ALL readers.
     *
     * @param masks the readers' volumes, in the result's bit order, one grid
     * @param structureLabels label values making up the structure
     * @param staple STAPLE of all readers on this structure
     */
    public static float[] probabilityMap(List<LabelVolume> masks, int[] structureLabels, StapleResult staple) {
        return probabilityMap(masks, structureLabels, staple, null);
    }

    /**
     * {@link #probabilityMap(List, int[], StapleResult)} with the union box already known.
     *
     * @param unionBox bounding box of the voxels any reader marks as the structure (as
     *     {@code CaseAgreement.unionBox()}; any box containing them gives the same map), or null to
     *     compute it
     */
    public static float[] probabilityMap(List<LabelVolume> masks, int[] structureLabels, StapleResult staple,
            Box unionBox) {
        BoxMap m = probabilityInBox(masks, structureLabels, staple, unionBox);
        int[] d = masks.get(0).geometry().dims();
        float[] out = new float[masks.get(0).voxelCount()];
        float[] row = new float[d[0]];
        for (int z = 0; z < d[2]; z++) {
            for (int y = 0; y < d[1]; y++) {
                m.fillRow(y, z, row);
                System.arraycopy(row, 0, out, d[0] * (y + d[1] * z), d[0]);
            }
        }
        return out;
    }

    /**
     * A float map that is {@code outside} everywhere except on {@code box}, where it holds
     * {@code values} (x fastest within the box). Lets a writer stream a full-grid map row by row
     * without a full-grid array.
     *
     * @param nx the grid's x size (the row length)
     */
    public record BoxMap(int nx, Box box, float[] values, float outside) {
        public BoxMap {
            if (values.length != box.size()) {
                throw new IllegalArgumentException("one value per voxel of the box expected");
            }
        }

        /** Row y of slice z of the full grid into {@code row} (length nx). */
        public void fillRow(int y, int z, float[] row) {
            Arrays.fill(row, 0, nx, outside);
            if (z >= box.z0() && z < box.z1() && y >= box.y0() && y < box.y1()) {
                int from = box.nx() * ((y - box.y0()) + box.ny() * (z - box.z0()));
                System.arraycopy(values, from, row, box.x0(), box.nx());
            }
        }

        /** The value at (x, y, z) of the full grid. */
        public float at(int x, int y, int z) {
            return box.contains(x, y, z) ? values[(x - box.x0()) + box.nx() * ((y - box.y0()) + box.ny() * (z - box.z0()))]
                : outside;
        }
    }

    /**
     * {@link #probabilityMap(List, int[], StapleResult, Box)} kept on the readers' union box: W of
     * pattern 0 outside it (every reader's pattern there is 0), each voxel's W inside.
     */
    public static BoxMap probabilityInBox(List<LabelVolume> masks, int[] structureLabels, StapleResult staple,
            Box unionBox) {
        Patterns.checkSameGrid(masks);
        if (staple.readers() != masks.size()) {
            throw new IllegalArgumentException("one mask per reader of the STAPLE result expected");
        }
        boolean[] lut = Patterns.lut(structureLabels);
        int nx = masks.get(0).geometry().nx();
        float outside = (float) staple.weightOfPattern(0);
        Box box = unionBox != null ? unionBox : Patterns.unionBox(masks, lut);
        if (box.isEmpty()) {
            return new BoxMap(nx, Box.EMPTY, new float[0], outside);
        }
        long[] pat = Patterns.patternsInBox(masks, lut, box);
        float[] dense = masks.size() <= 16 ? denseWeights(staple, masks.size()) : null;
        java.util.Map<Long, Float> memo = new java.util.HashMap<>();
        float[] values = new float[pat.length];
        for (int i = 0; i < pat.length; i++) {
            values[i] = dense != null ? dense[(int) pat[i]]
                : memo.computeIfAbsent(pat[i], p -> (float) staple.weightOfPattern(p));
        }
        return new BoxMap(nx, box, values, outside);
    }

    private static float[] denseWeights(StapleResult s, int readers) {
        float[] d = new float[1 << readers];
        for (int p = 0; p < d.length; p++) {
            d[p] = (float) s.weightOfPattern(p);
        }
        return d;
    }

    /**
     * The thresholded consensus (W ≥ 0.5) of the readers in {@code keep} as a label volume:
     * {@code outputLabel} inside, 0 outside.
     */
    public static LabelVolume binaryConsensus(List<LabelVolume> masks, int[] structureLabels, StapleResult staple,
            long keep, int outputLabel) {
        return binaryConsensus(masks, structureLabels, staple, keep, outputLabel, null);
    }

    /**
     * {@link #binaryConsensus(List, int[], StapleResult, long, int)} with the union box already
     * known ({@code unionBox} as in {@link #probabilityMap(List, int[], StapleResult, Box)}, or null).
     */
    public static LabelVolume binaryConsensus(List<LabelVolume> masks, int[] structureLabels, StapleResult staple,
            long keep, int outputLabel, Box unionBox) {
        if (outputLabel < 1) {
            throw new IllegalArgumentException("output label must be positive");
        }
        SignedSurface.BoxMask bm = SignedSurface.consensusMask(masks, structureLabels, staple, keep, unionBox);
        Geometry g = masks.get(0).geometry();
        boolean[] inside = bm.mask();
        Box box = bm.box();
        Output out = Output.forMax(outputLabel, masks.get(0).voxelCount());
        for (int i = 0; i < inside.length; i++) {
            if (inside[i]) {
                out.set(box.gridIndex(i, g.nx(), g.ny()), outputLabel);
            }
        }
        return out.volume(g);
    }

    /**
     * The multi-label consensus as a label volume: per voxel the value {@code labelPerTuple}
     * gives its tuple (e.g. {@link MultiLabelStapleResult#consensusLabel} for every tuple, or
     * {@link MajorityVote#labels}). Stored as bytes when every value fits in 0..255, else ints
     * (a writer may store those as uint16 when at most 65535).
     *
     * @param masks the readers' volumes the histogram was built from
     */
    public static LabelVolume labelConsensus(List<LabelVolume> masks, LabelTupleHistogram h, int[] labelPerTuple) {
        return labelConsensus(masks, h, labelPerTuple, null);
    }

    /**
     * {@link #labelConsensus(List, LabelTupleHistogram, int[])} with the bounding box of every
     * non-zero voxel already known (as {@link LabelTupleHistogram#nonzeroBox()} of a histogram built
     * from these volumes; any box containing them gives the same volume), or null to find it.
     */
    public static LabelVolume labelConsensus(List<LabelVolume> masks, LabelTupleHistogram h, int[] labelPerTuple,
            Box nonzeroBox) {
        Patterns.checkSameGrid(masks);
        if (labelPerTuple.length != h.size() || masks.size() != h.readers()) {
            throw new IllegalArgumentException("one value per tuple and one mask per reader expected");
        }
        int[] lab = h.labels();
        int[] index = new int[Math.max(256, lab[lab.length - 1] + 1)];
        for (int s = 0; s < lab.length; s++) {
            index[lab[s]] = s;
        }
        int b = h.bitsPerReader();
        int n = masks.get(0).voxelCount();
        int maxValue = 0;
        for (int v : labelPerTuple) {
            maxValue = Math.max(maxValue, v);
        }
        Output out = Output.forMax(maxValue, n);
        boolean allBytes = masks.stream().allMatch(LabelVolume::isCompact);
        Box box = !allBytes ? null : nonzeroBox != null ? nonzeroBox : Patterns.nonzeroByteBox(masks);
        if (box != null) {
            // every reader holds 0 outside the box: tuple key 0 there
            if (box.size() < n) {
                int t = h.find(0L);
                if (t < 0) {
                    throw new IllegalArgumentException("volumes do not match the histogram");
                }
                if (labelPerTuple[t] != 0) {
                    out.fill(labelPerTuple[t]);
                }
            }
            int[] d = masks.get(0).geometry().dims();
            long[] key = new long[Math.max(1, box.nx())];
            int[] values = new int[key.length];
            long[] last = {-1L, 0L};
            for (int z = box.z0(); z < box.z1(); z++) {
                for (int y = box.y0(); y < box.y1(); y++) {
                    int start = box.x0() + d[0] * (y + d[1] * z);
                    labelRun(masks, index, b, h, labelPerTuple, start, box.nx(), key, values, last);
                    out.put(start, values, box.nx());
                }
            }
            return out.volume(masks.get(0).geometry());
        }
        long[] key = new long[4096];
        int[] values = new int[key.length];
        long[] last = {-1L, 0L};
        for (int start = 0; start < n; start += key.length) {
            int len = Math.min(key.length, n - start);
            labelRun(masks, index, b, h, labelPerTuple, start, len, key, values, last);
            out.put(start, values, len);
        }
        return out.volume(masks.get(0).geometry());
    }

    /** A label grid being filled: ints, or bytes when every value fits in 0..255. */
    private record Output(int[] ints, byte[] bytes) {
        /** Bytes straight away when every value fits (the usual case): no int grid to allocate and compact. */
        static Output forMax(int maxValue, int voxels) {
            return maxValue <= 255 ? new Output(null, new byte[voxels]) : new Output(new int[voxels], null);
        }

        void set(int index, int value) {
            if (bytes != null) {
                bytes[index] = (byte) value;
            } else {
                ints[index] = value;
            }
        }

        void fill(int value) {
            if (bytes != null) {
                Arrays.fill(bytes, (byte) value);
            } else {
                Arrays.fill(ints, value);
            }
        }

        void put(int start, int[] values, int len) {
            if (bytes != null) {
                for (int i = 0; i < len; i++) {
                    bytes[start + i] = (byte) values[i];
                }
            } else {
                System.arraycopy(values, 0, ints, start, len);
            }
        }

        LabelVolume volume(Geometry g) {
            return bytes != null ? LabelVolume.ofBytes(g, bytes) : LabelVolume.ofInts(g, ints);
        }
    }

    /**
     * Consensus labels of the voxels start..start+len-1 into {@code values[0..len)};
     * {@code last} = {last key, its value}.
     */
    private static void labelRun(List<LabelVolume> masks, int[] index, int b, LabelTupleHistogram h,
            int[] labelPerTuple, int start, int len, long[] key, int[] values, long[] last) {
        Arrays.fill(key, 0, len, 0L);
        for (int j = 0; j < masks.size(); j++) {
            LabelVolume v = masks.get(j);
            int shift = b * j;
            if (v.isCompact()) {
                byte[] src = v.bytes();
                for (int i = 0; i < len; i++) {
                    key[i] |= (long) index[src[start + i] & 0xFF] << shift;
                }
            } else {
                int[] src = v.ints();
                for (int i = 0; i < len; i++) {
                    int val = src[start + i];
                    key[i] |= (long) (val < index.length ? index[val] : 0) << shift;
                }
            }
        }
        long lastKey = last[0];
        int lastValue = (int) last[1];
        for (int i = 0; i < len; i++) {
            if (key[i] != lastKey) {
                int t = h.find(key[i]);
                if (t < 0) {
                    throw new IllegalArgumentException("volumes do not match the histogram");
                }
                lastKey = key[i];
                lastValue = labelPerTuple[t];
            }
            values[i] = lastValue;
        }
        last[0] = lastKey;
        last[1] = lastValue;
    }

    /** The multi-label STAPLE consensus label volume (ties → the result's undecided value). */
    public static LabelVolume labelConsensus(List<LabelVolume> masks, MultiLabelStapleResult staple) {
        return labelConsensus(masks, staple, null);
    }

    /**
     * {@link #labelConsensus(List, MultiLabelStapleResult)} with the non-zero box already known (see
     * {@link #labelConsensus(List, LabelTupleHistogram, int[], Box)}), or null.
     */
    public static LabelVolume labelConsensus(List<LabelVolume> masks, MultiLabelStapleResult staple, Box nonzeroBox) {
        int[] v = new int[staple.histogram().size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = staple.consensusLabel(i);
        }
        return labelConsensus(masks, staple.histogram(), v, nonzeroBox);
    }
}
