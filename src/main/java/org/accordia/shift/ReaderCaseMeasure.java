package org.accordia.shift;

/**
 * One reader's mask on one case compared with a consensus of the others (the other centres' for
 * centre effects, the other readers' for reader recalibration).
 *
 * @param reader            reader id
 * @param centre            the reader's centre
 * @param caseId            case id
 * @param signedSurfaceMm   mean signed surface distance of this reader's boundary from the
 *                          consensus boundary, mm; positive = outside (larger), negative = inside;
 *                          NaN when undefined (for example an empty mask)
 * @param volumeRatio       this reader's volume divided by the consensus volume; NaN, 0 or
 *                          infinite values are left out of the volume summary
 * @param border            where the reader's border lies beyond the structure's tolerance against
 *                          the same consensus (see {@code consensus.BorderProfile}); null when not
 *                          computed
 */
public record ReaderCaseMeasure(String reader, String centre, String caseId, double signedSurfaceMm,
        double volumeRatio, org.accordia.consensus.BorderProfile border) {
    public ReaderCaseMeasure {
        if (reader == null || centre == null || caseId == null) {
            throw new IllegalArgumentException("reader, centre and case id are required");
        }
    }

    /** A measure without a border profile. */
    public ReaderCaseMeasure(String reader, String centre, String caseId, double signedSurfaceMm, double volumeRatio) {
        this(reader, centre, caseId, signedSurfaceMm, volumeRatio, null);
    }
}
