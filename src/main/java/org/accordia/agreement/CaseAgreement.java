package org.accordia.agreement;

import org.accordia.grid.Box;
import java.util.List;

/**
 * Agreement of all readers of one case on one structure: small and voxel-free (except the
 * decision-pattern histogram, a few hundred entries at most for realistic reader counts).
 *
 * @param caseId the case
 * @param label the structure's name
 * @param readers reader identifiers in the case's reader order (bit j of the histogram = readers[j])
 * @param centres centre of each reader, same order
 * @param pairs every pair (a, b), a before b in reader order, in lexicographic order of (a, b)
 * @param fleissKappa Fleiss' kappa (two categories) over the kappa region; NaN when undefined
 *     (fewer than two readers, empty region, or all voxels rated alike)
 * @param kappaRegionVoxels voxels in the kappa region: the union of all readers' structure,
 *     dilated by {@code kappaMarginMm} (Euclidean, mm)
 * @param kappaMarginMm the dilation radius of the kappa region, mm
 * @param meanDice mean pairwise Dice over all pairs (flagged pairs included with their Dice of 1 or 0)
 * @param medianDice median pairwise Dice over all pairs (NaN when there is no pair)
 * @param bothEmptyPairs pairs flagged {@code both_empty}
 * @param oneEmptyPairs pairs flagged {@code one_empty}
 * @param distancePairs pairs whose distances are defined (= pairs − bothEmpty − oneEmpty)
 * @param meanHd95Mm mean HD95 over the {@code distancePairs} pairs (NaN when none); the flagged
 *     pairs are counted above, never silently dropped
 * @param meanAssdMm mean ASSD over the {@code distancePairs} pairs (NaN when none)
 * @param volumesMl each reader's structure volume, ml, reader order
 * @param voxelCounts each reader's structure voxel count, reader order
 * @param unionBox bounding box (grid indices) of the union of all readers' structure;
 *     {@link Box#EMPTY} when every reader's mask is empty
 * @param toleranceMm the NSD tolerance τ, mm
 * @param voxelVolumeMl volume of one voxel, ml
 * @param histogram decision-pattern histogram over the WHOLE grid (bit j = reader j)
 */
public record CaseAgreement(String caseId, String label, List<String> readers, List<String> centres,
                            List<PairMetrics> pairs, double fleissKappa, long kappaRegionVoxels,
                            double kappaMarginMm, double meanDice, double medianDice, int bothEmptyPairs,
                            int oneEmptyPairs, int distancePairs, double meanHd95Mm, double meanAssdMm,
                            List<Double> volumesMl, List<Long> voxelCounts, Box unionBox,
                            double toleranceMm, double voxelVolumeMl, PatternHistogram histogram) {
    public CaseAgreement {
        readers = List.copyOf(readers);
        centres = List.copyOf(centres);
        pairs = List.copyOf(pairs);
        volumesMl = List.copyOf(volumesMl);
        voxelCounts = List.copyOf(voxelCounts);
    }
}
