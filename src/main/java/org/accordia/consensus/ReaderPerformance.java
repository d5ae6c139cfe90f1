package org.accordia.consensus;

import java.util.List;

/**
 * One reader's performance on one case and structure against one reference consensus; one row of
 * {@code readers.csv}.
 *
 * @param caseId case identifier
 * @param label structure name
 * @param reader reader identifier
 * @param centre the reader's centre
 * @param sensitivity fraction of the reference consensus the reader marks, in [0, 1] (for
 *     {@code all}: STAPLE's own p_j); NaN when the reference is empty
 * @param specificity fraction of the reference background (within the STAPLE region) the reader
 *     leaves out (for {@code all}: STAPLE's q_j); NaN when undefined
 * @param diceVsConsensus Dice of the reader vs the thresholded reference (W ≥ 0.5); NaN when both
 *     are empty
 * @param volumeMl the reader's volume in millilitres
 * @param volumeRatio reader volume / thresholded reference volume; +∞ when the reference is
 *     empty and the reader is not, NaN when both are empty
 * @param signedSurfaceMm mean signed distance of the reader's border voxels to the reference
 *     boundary in mm (positive = outside the reference); NaN when not computed or undefined
 * @param reference {@code all}, {@code others} or {@code other_centres} (see docs/consensus.md)
 * @param borderOffsetMm for the {@code all} reference: the antisymmetric border offset
 *     ½ (d(reader → reference) − d(reference → reader)) in mm, where d(A → B) is the mean signed
 *     distance of A's border voxels to B's boundary (positive = outside B); NaN otherwise. Unlike
 *     the one-directional {@code signedSurfaceMm} it changes sign exactly when the two surfaces
 *     swap, so a common reference cancels from differences between readers (on a 1 × 1 × 2 mm grid
 *     a 1.5 mm wider margin measures +1.45 mm from the outer border inwards but −1.26 mm from the
 *     inner border outwards). Not a column of readers.csv.
 * @param border where the reader's border lies against the reference beyond the structure's
 *     tolerance ({@link BorderProfile}); null when not computed
 */
public record ReaderPerformance(String caseId, String label, String reader, String centre, double sensitivity,
        double specificity, double diceVsConsensus, double volumeMl, double volumeRatio, double signedSurfaceMm,
        String reference, double borderOffsetMm, BorderProfile border) {

    /** A row without a border profile. */
    public ReaderPerformance(String caseId, String label, String reader, String centre, double sensitivity,
            double specificity, double diceVsConsensus, double volumeMl, double volumeRatio, double signedSurfaceMm,
            String reference, double borderOffsetMm) {
        this(caseId, label, reader, centre, sensitivity, specificity, diceVsConsensus, volumeMl, volumeRatio,
            signedSurfaceMm, reference, borderOffsetMm, null);
    }

    public static final String REFERENCE_ALL = "all";
    public static final String REFERENCE_OTHERS = "others";
    public static final String REFERENCE_OTHER_CENTRES = "other_centres";

    public ReaderPerformance {
        if (!List.of(REFERENCE_ALL, REFERENCE_OTHERS, REFERENCE_OTHER_CENTRES).contains(reference)) {
            throw new IllegalArgumentException("unknown reference " + reference);
        }
    }

    /** A row without the antisymmetric border offset. */
    public ReaderPerformance(String caseId, String label, String reader, String centre, double sensitivity,
            double specificity, double diceVsConsensus, double volumeMl, double volumeRatio, double signedSurfaceMm,
            String reference) {
        this(caseId, label, reader, centre, sensitivity, specificity, diceVsConsensus, volumeMl, volumeRatio,
            signedSurfaceMm, reference, Double.NaN);
    }

    /** The same row with the antisymmetric border offset filled in. */
    public ReaderPerformance withBorderOffsetMm(double mm) {
        return new ReaderPerformance(caseId, label, reader, centre, sensitivity, specificity, diceVsConsensus,
            volumeMl, volumeRatio, signedSurfaceMm, reference, mm, border);
    }

    /** The same row with a signed surface distance filled in. */
    public ReaderPerformance withSignedSurfaceMm(double mm) {
        return new ReaderPerformance(caseId, label, reader, centre, sensitivity, specificity, diceVsConsensus,
            volumeMl, volumeRatio, mm, reference, borderOffsetMm, border);
    }

    /** The same row with a signed surface distance and a border profile filled in. */
    public ReaderPerformance withSurface(double mm, BorderProfile profile) {
        return new ReaderPerformance(caseId, label, reader, centre, sensitivity, specificity, diceVsConsensus,
            volumeMl, volumeRatio, mm, reference, borderOffsetMm, profile);
    }
}
