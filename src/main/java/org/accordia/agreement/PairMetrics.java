package org.accordia.agreement;

import org.accordia.study.Protocol;
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
 * {@code toleranceMm}. {@code hd95Mm} is the HD95 in the variant the agreement settings name
 * ({@code agreement.hd95}: the larger of the two directed 95th percentiles by default, or the
 * 95th percentile of both directed sets pooled); {@code hd95PooledMm} is always the pooled one.
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
     * As {@link #of(String, String, ReaderId, ReaderId, long, long, long, double, SurfaceMetrics,
     * double, Protocol.Hd95Mode)} with the default HD95 variant (per direction).
     */
    public static PairMetrics of(String caseId, String label, ReaderId a, ReaderId b, long countA, long countB,
                                 long intersection, double voxelVolumeMl, SurfaceMetrics surface,
                                 double toleranceMm) {
        return of(caseId, label, a, b, countA, countB, intersection, voxelVolumeMl, surface, toleranceMm,
            Protocol.Hd95Mode.PER_DIRECTION);
    }

    /**
     * Builds the record from the overlap counts and the surface metrics (ignored unless both
     * masks are non-empty).
     *
     * @param countA voxels of A, {@code countB} of B, {@code intersection} of both
     * @param voxelVolumeMl volume of one voxel, ml
     * @param hd95 which HD95 variant {@code hd95Mm} holds
     */
    public static PairMetrics of(String caseId, String label, ReaderId a, ReaderId b, long countA, long countB,
                                 long intersection, double voxelVolumeMl, SurfaceMetrics surface,
                                 double toleranceMm, Protocol.Hd95Mode hd95) {
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
            volB, rvd, surface.hdMm(), hd95 == Protocol.Hd95Mode.POOLED ? surface.hd95PooledMm() : surface.hd95Mm(),
            surface.hd95PooledMm(), surface.assdMm(), surface.nsd(),
            toleranceMm, FLAG_NONE);
    }
}
