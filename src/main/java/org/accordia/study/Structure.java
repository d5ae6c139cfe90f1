package org.accordia.study;

import java.util.List;
import java.util.Objects;
import java.util.TreeSet;

/**
 * One anatomical structure analysed on its own: the union of one or more label values.
 *
 * @param name the structure's name (unique within a protocol)
 * @param labels the label values whose union is the structure (each at least 1, unique, sorted)
 * @param toleranceMm surface tolerance in millimetres for the normalised surface distance and the
 *     kappa region; positive
 */
public record Structure(String name, List<Integer> labels, double toleranceMm) {
    /** Surface tolerance used when a structure does not name one. */
    public static final double DEFAULT_TOLERANCE_MM = 2.0;

    public Structure {
        Objects.requireNonNull(name, "name");
        if (name.isBlank()) {
            throw new IllegalArgumentException("a structure needs a name");
        }
        if (labels == null || labels.isEmpty()) {
            throw new IllegalArgumentException("a structure needs at least one label");
        }
        TreeSet<Integer> sorted = new TreeSet<>(labels);
        if (sorted.size() != labels.size()) {
            throw new IllegalArgumentException("labels must be unique");
        }
        if (sorted.first() < 1) {
            throw new IllegalArgumentException("labels must be at least 1");
        }
        if (!(toleranceMm > 0) || Double.isInfinite(toleranceMm)) {
            throw new IllegalArgumentException("tolerance must be positive");
        }
        labels = List.copyOf(sorted);
    }

    /** The default structure for one label value: named "label_&lt;v&gt;". */
    public static Structure ofLabel(int label) {
        return new Structure("label_" + label, List.of(label), DEFAULT_TOLERANCE_MM);
    }

    /** A structure of these label values with the default tolerance. */
    public static Structure of(String name, int... labels) {
        return new Structure(name, java.util.Arrays.stream(labels).boxed().toList(), DEFAULT_TOLERANCE_MM);
    }

    /** True when a voxel with this label belongs to the structure. */
    public boolean covers(int label) {
        return labels.contains(label);
    }

    /** The label values as a new sorted array. */
    public int[] labelArray() {
        return labels.stream().mapToInt(Integer::intValue).toArray();
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
}
