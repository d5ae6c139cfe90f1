package org.accordia.analysis;

/**
 * Something the report must show and never silently drop: a missing mask, an empty mask, reader
 * pairs whose distances are undefined, an undefined signed surface distance.
 *
 * @param caseId the case
 * @param label the structure's name, or empty when the event concerns the whole case
 * @param reader "centre/reader", or empty when the event concerns a pair or the case
 * @param kind {@value #MISSING_MASK}, {@value #EMPTY_MASK}, {@value #UNDEFINED_DISTANCES}, or in the
 *     outputs {@value #ABSENT}
 * @param detail the event in words
 */
public record FlaggedEvent(String caseId, String label, String reader, String kind, String detail)
    implements Comparable<FlaggedEvent> {
    /** A reader has no mask for the case. */
    public static final String MISSING_MASK = "missing_mask";
    /** A reader's mask has no voxel of the structure. */
    public static final String EMPTY_MASK = "empty_mask";
    /** Reader pairs whose surface distances are undefined (one or both masks empty). */
    public static final String UNDEFINED_DISTANCES = "undefined_distances";
    /**
     * No reader of the case drew the structure (every mask empty): one event per case and structure
     * in the outputs, in place of that case's per-reader {@value #EMPTY_MASK} and its
     * {@value #UNDEFINED_DISTANCES} events (see {@code report.Absence}).
     */
    public static final String ABSENT = "absent";

    private static final java.util.Comparator<FlaggedEvent> ORDER = java.util.Comparator
        .comparing(FlaggedEvent::caseId).thenComparing(FlaggedEvent::label).thenComparing(FlaggedEvent::kind)
        .thenComparing(FlaggedEvent::reader).thenComparing(FlaggedEvent::detail);

    @Override
    public int compareTo(FlaggedEvent o) {
        return ORDER.compare(this, o);
    }
}
