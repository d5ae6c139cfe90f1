package org.accordia.agreement;

import org.accordia.study.ReaderId;


/**
 * Agreement of two readers on one structure of one case. Reader A comes before reader B in the
 * case's reader order.
 *
 * <p>Definitions (docs/metrics.md): {@code dice = 2|A∩B| / (|A| + |B|)} (Dice 1945, Ecology
 * 26:297–302); {@code jaccard = |A∩B| / |A∪B|} (Jaccard 1912, New Phytologist 11:37–50); volumes
 * in ml (voxel count × voxel volume); {@code relativeVolumeDifference = (V_A − V_B) / ((V_A +
 * V_B)/2)}, signed, dimensionless, in [−2, 2]; surface distances in mm between voxel centres over
 * border voxels ({@link SurfaceMetrics}); {@code nsd} is the voxel-border surface Dice at
 * {@code toleranceMm}.
 *
 * <p>Empty masks: both empty → dice = jaccard = 1, relative volume difference and all distances
 * NaN, flag {@code both_empty}; exactly one empty → dice = jaccard = 0, relative volume difference
 * ±2, distances NaN, flag {@code one_empty}; otherwise the flag is the empty string. NaN is
 * an undefined value (an empty cell in pairs.csv, written by the report layer).
 */
public record PairMetrics(String caseId, String label, String readerA, String centreA, String readerB,
                          String centreB, double dice, double jaccard, double volumeAMl, double volumeBMl,
                          double relativeVolumeDifference, double hdMm, double hd95Mm, double hd95PooledMm,
                          double assdMm, double nsd, double toleranceMm, String flag) {

    public static final String FLAG_NONE = "";
    public static final String FLAG_BOTH_EMPTY = "both_empty";
    public static final String FLAG_ONE_EMPTY = "one_empty";

    /** True when the distances are defined (both masks non-empty). */
    public boolean hasDistances() {
        return FLAG_NONE.equals(flag);
    }

    /**
     * Builds the record from the overlap counts and the surface metrics (ignored unless both
     * masks are non-empty).
     *
     * @param countA voxels of A, {@code countB} of B, {@code intersection} of both
     * @param voxelVolumeMl volume of one voxel, ml
     */
    public static PairMetrics of(String caseId, String label, ReaderId a, ReaderId b, long countA, long countB,
                                 long intersection, double voxelVolumeMl, SurfaceMetrics surface,
                                 double toleranceMm) {
        double volA = countA * voxelVolumeMl;
        double volB = countB * voxelVolumeMl;
        if (countA == 0 && countB == 0) {
            return new PairMetrics(caseId, label, a.reader(), a.centre(), b.reader(), b.centre(), 1.0, 1.0, volA,
                volB, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, toleranceMm,
                FLAG_BOTH_EMPTY);
        }
        double rvd = (double) (countA - countB) / ((countA + countB) / 2.0);
        if (countA == 0 || countB == 0) {
            return new PairMetrics(caseId, label, a.reader(), a.centre(), b.reader(), b.centre(), 0.0, 0.0, volA,
                volB, rvd, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, toleranceMm,
                FLAG_ONE_EMPTY);
        }
        double dice = 2.0 * intersection / (countA + countB);
        double jaccard = (double) intersection / (countA + countB - intersection);
        return new PairMetrics(caseId, label, a.reader(), a.centre(), b.reader(), b.centre(), dice, jaccard, volA,
            volB, rvd, surface.hdMm(), surface.hd95Mm(), surface.hd95PooledMm(), surface.assdMm(), surface.nsd(),
            toleranceMm, FLAG_NONE);
    }
}
