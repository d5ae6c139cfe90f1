package org.accordia.shift;


/** NaN and infinities as JSON null for the summary records (formatting is the report layer's job). */
final class Numbers {
    private Numbers() {
    }

    /** NaN and infinities as null (JSON null). */
    static Double orNull(double v) {
        return Double.isFinite(v) ? v : null;
    }
}
