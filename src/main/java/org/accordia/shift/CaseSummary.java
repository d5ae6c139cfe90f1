package org.accordia.shift;

/**
 * What the study level needs to know about one case of one label to decide on adjudication.
 *
 * @param caseId          case id
 * @param medianDice      median of the pairwise Dice coefficients (NaN when undefined, e.g. all masks empty)
 * @param maxHd95Mm       largest pairwise HD95 in mm (NaN when undefined)
 * @param oneEmptyPairs   reader pairs where exactly one of the two masks is empty
 * @param readersPresent  readers with a mask on this case
 */
public record CaseSummary(String caseId, double medianDice, double maxHd95Mm, int oneEmptyPairs, int readersPresent) {
    public CaseSummary {
        if (caseId == null) {
            throw new IllegalArgumentException("case id is required");
        }
        if (oneEmptyPairs < 0 || readersPresent < 0) {
            throw new IllegalArgumentException("counts must be non-negative");
        }
    }
}
