package org.accordia.bench;

/** Plain formatting of settings in printed text. */
public final class BenchNumbers {
    private BenchNumbers() {
    }

    /** An integer-valued number without decimals, anything else as Java prints it. */
    public static String text(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
