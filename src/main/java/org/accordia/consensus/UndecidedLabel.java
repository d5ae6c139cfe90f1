package org.accordia.consensus;

/** Chooses and checks the value written for voxels a multi-label consensus cannot decide. */
public final class UndecidedLabel {
    private UndecidedLabel() {
    }

    /** The default undecided value: the largest real label + 1 (never collides with a label). */
    public static int defaultFor(int[] labels) {
        int max = 0;
        for (int v : labels) {
            max = Math.max(max, v);
        }
        return Math.addExact(max, 1);
    }

    /** A caller-supplied value, checked: non-negative and not one of the labels. */
    public static int checked(int value, int[] labels) {
        if (value < 0) {
            throw new IllegalArgumentException("undecided value must be non-negative, got " + value);
        }
        for (int v : labels) {
            if (v == value) {
                throw new IllegalArgumentException("undecided value " + value + " collides with a real label");
            }
        }
        return value;
    }
}
