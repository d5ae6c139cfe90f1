package org.accordia.shift;

/**
 * What a study's roster (readers per centre) cannot answer, whatever the masks show. Returned by
 * {@link DesignLimits}; the report and {@code inspect} turn each into one plain sentence.
 */
public enum DesignLimitation {
    /** One centre: there is no between-centre comparison, so a shift is not testable. */
    SINGLE_CENTRE("single-centre"),
    /**
     * The reader permutation test's smallest reachable p-value (1 over the number of distinct reader
     * partitions) is above α: no data can make it significant.
     */
    CANNOT_REACH_ALPHA("cannot-reach-alpha"),
    /**
     * Two centres: each is measured against the other, so the data cannot tell which one departs
     * from the common way of drawing.
     */
    TWO_CENTRES("two-centres"),
    /**
     * A centre with one reader: its centre effect is that reader's bias, the two cannot be told
     * apart, and the centre adds no within-centre variation to the test.
     */
    ONE_READER_CENTRE("one-reader-centre");

    private final String key;

    DesignLimitation(String key) {
        this.key = key;
    }

    /** Stable key used in summary.json and by the calibration harness. */
    @com.fasterxml.jackson.annotation.JsonValue
    public String key() {
        return key;
    }
}
