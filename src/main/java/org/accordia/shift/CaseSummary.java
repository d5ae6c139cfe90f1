package org.accordia.shift;

import java.util.List;

/**
 * What the study level needs to know about one case of one label to decide on adjudication.
 *
 * @param caseId          case id
 * @param medianDice      median of the pairwise Dice coefficients (NaN when undefined, e.g. all masks empty)
 * @param maxHd95Mm       largest pairwise HD95 in mm (NaN when undefined)
 * @param oneEmptyPairs   reader pairs where exactly one of the two masks is empty
 * @param readersPresent  readers with a mask on this case
 * @param readers         reader keys in pair order (empty when the pairs are not given)
 * @param pairDice        Dice of each pair (a, b), a &lt; b, in row order; empty when not given
 * @param pairHd95Mm      HD95 of each pair, mm (NaN when undefined)
 * @param emptyMasks      per reader (same order), whether the mask has no voxel of the structure
 * @param corrections     masks of this case a reader should correct
 */
public record CaseSummary(String caseId, double medianDice, double maxHd95Mm, int oneEmptyPairs, int readersPresent,
        List<String> readers, double[] pairDice, double[] pairHd95Mm, boolean[] emptyMasks,
        List<MaskToCorrect> corrections) {
    public CaseSummary {
        if (caseId == null) {
            throw new IllegalArgumentException("case id is required");
        }
        if (oneEmptyPairs < 0 || readersPresent < 0) {
            throw new IllegalArgumentException("counts must be non-negative");
        }
        readers = List.copyOf(readers);
        pairDice = pairDice.clone();
        pairHd95Mm = pairHd95Mm.clone();
        emptyMasks = emptyMasks.clone();
        corrections = List.copyOf(corrections);
        int pairs = readers.size() * (readers.size() - 1) / 2;
        if (!readers.isEmpty() && (pairDice.length != pairs || pairHd95Mm.length != pairs
                || emptyMasks.length != readers.size())) {
            throw new IllegalArgumentException("one Dice and HD95 per reader pair and one empty flag per reader expected");
        }
    }

    /** A summary without the pairs (every reader counts toward the genuine disagreement). */
    public CaseSummary(String caseId, double medianDice, double maxHd95Mm, int oneEmptyPairs, int readersPresent) {
        this(caseId, medianDice, maxHd95Mm, oneEmptyPairs, readersPresent, List.of(), new double[0], new double[0],
                new boolean[0], List.of());
    }
}
