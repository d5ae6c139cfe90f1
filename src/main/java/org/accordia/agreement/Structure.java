package org.accordia.agreement;

import java.util.Arrays;

/**
 * A structure to measure agreement on: a name and the set of label values that make it up (for
 * example whole lesion = {1, 2}, core = {2}). A voxel belongs to the structure for a reader when
 * that reader's label at the voxel is in the set.
 *
 * @param name the structure's name as reported (column {@code label} of pairs.csv)
 * @param labels the label values, stored sorted and unique; each non-negative
 */
public record Structure(String name, int[] labels) {
    public Structure {
        if (name == null || name.isBlank()) {
            throw new IllegalArgumentException("structure needs a name");
        }
        if (labels == null || labels.length == 0) {
            throw new IllegalArgumentException("structure " + name + " needs at least one label value");
        }
        labels = Arrays.stream(labels).sorted().distinct().toArray();
        if (labels[0] < 0) {
            throw new IllegalArgumentException("structure " + name + " has a negative label value");
        }
    }

    public static Structure of(String name, int... labels) {
        return new Structure(name, labels);
    }

    /** Accessor returning a defensive copy (sorted, unique). */
    @Override
    public int[] labels() {
        return labels.clone();
    }

    /** True when {@code label} is one of the structure's values. */
    public boolean contains(int label) {
        return Arrays.binarySearch(labels, label) >= 0;
    }

    /** Membership table for byte labels: entry {@code v} is true when {@code v} belongs. */
    public boolean[] byteTable() {
        boolean[] t = new boolean[256];
        for (int v : labels) {
            if (v < 256) {
                t[v] = true;
            }
        }
        return t;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Structure s && name.equals(s.name) && Arrays.equals(labels, s.labels);
    }

    @Override
    public int hashCode() {
        return 31 * name.hashCode() + Arrays.hashCode(labels);
    }

    @Override
    public String toString() {
        return "Structure[" + name + "=" + Arrays.toString(labels) + "]";
    }
}
