package org.accordia.io;

import java.util.Map;
import java.util.TreeMap;

/**
 * A segmentation mask: one non-negative integer label per voxel (0 = background) on a
 * {@link Geometry}. Stored compactly as one byte per voxel when every label fits in 0..255,
 * otherwise as one int per voxel. Immutable by contract: callers must not write to the arrays
 * returned by {@link #bytes()} or {@link #ints()}.
 */
public final class LabelVolume {
    private final Geometry geometry;
    private final byte[] bytes;
    private final int[] ints;
    private final int maxLabel;

    private LabelVolume(Geometry geometry, byte[] bytes, int[] ints, int maxLabel) {
        this.geometry = geometry;
        this.bytes = bytes;
        this.ints = ints;
        this.maxLabel = maxLabel;
    }

    /** Wraps unsigned byte labels (0..255); the array is taken, not copied. */
    public static LabelVolume ofBytes(Geometry geometry, byte[] labels) {
        checkLength(geometry, labels.length);
        int max = 0;
        for (byte b : labels) {
            int v = b & 0xFF;
            if (v > max) {
                max = v;
            }
        }
        return new LabelVolume(geometry, labels, null, max);
    }

    /**
     * Wraps int labels (must be non-negative), compacting to bytes when every label is at most
     * 255; the array is taken, not copied.
     */
    public static LabelVolume ofInts(Geometry geometry, int[] labels) {
        checkLength(geometry, labels.length);
        int max = 0;
        for (int v : labels) {
            if (v < 0) {
                throw new IllegalArgumentException("negative label " + v);
            }
            if (v > max) {
                max = v;
            }
        }
        if (max <= 255) {
            byte[] b = new byte[labels.length];
            for (int i = 0; i < labels.length; i++) {
                b[i] = (byte) labels[i];
            }
            return new LabelVolume(geometry, b, null, max);
        }
        return new LabelVolume(geometry, null, labels, max);
    }

    private static void checkLength(Geometry geometry, int length) {
        if (geometry.voxelCount() != length) {
            throw new IllegalArgumentException(
                "data has " + length + " voxels, geometry " + geometry.dimsText() + " needs " + geometry.voxelCount());
        }
    }

    public Geometry geometry() {
        return geometry;
    }

    public int voxelCount() {
        return bytes != null ? bytes.length : ints.length;
    }

    /** Label at linear offset {@code i} (x fastest). */
    public int label(int i) {
        return bytes != null ? bytes[i] & 0xFF : ints[i];
    }

    public int label(int x, int y, int z) {
        return label(x + geometry.nx() * (y + geometry.ny() * z));
    }

    /** True when stored one byte per voxel; then {@link #bytes()} is non-null. */
    public boolean isCompact() {
        return bytes != null;
    }

    /** The byte store (unsigned labels), or {@code null} when not compact. Do not modify. */
    public byte[] bytes() {
        return bytes;
    }

    /** The int store, or {@code null} when compact. Do not modify. */
    public int[] ints() {
        return ints;
    }

    public int maxLabel() {
        return maxLabel;
    }

    /** Voxel count per label value present (background 0 included when present), sorted. */
    public Map<Integer, Long> labelCounts() {
        TreeMap<Integer, Long> counts = new TreeMap<>();
        if (bytes != null) {
            long[] c = new long[256];
            for (byte b : bytes) {
                c[b & 0xFF]++;
            }
            for (int v = 0; v < 256; v++) {
                if (c[v] > 0) {
                    counts.put(v, c[v]);
                }
            }
        } else {
            for (int v : ints) {
                counts.merge(v, 1L, Long::sum);
            }
        }
        return counts;
    }
}
