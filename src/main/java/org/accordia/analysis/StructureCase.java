package org.accordia.analysis;

import java.util.List;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.PairMetrics;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.study.Structure;

/**
 * One structure of one case: its agreement (pairs, kappa, volumes, the decision-pattern
 * histogram — a few hundred entries, no voxels) and every reader's performance against the three
 * references (all, others, other_centres).
 *
 * @param structure the structure
 * @param agreement pairwise agreement of the case's readers
 * @param performance one row per reader and reference (order: reference all, others,
 *     other_centres; readers in case order within each)
 * @param maxHd95Mm largest pairwise HD95 over pairs with defined distances, mm; NaN when none
 * @param missedParts per reader (case order), the majority-consensus components the reader does
 *     not touch at all ({@link org.accordia.consensus.MissedComponents})
 * @param missedPartsMl per reader, the volume of those components, ml
 */
public record StructureCase(Structure structure, CaseAgreement agreement, List<ReaderPerformance> performance,
                            double maxHd95Mm, List<Integer> missedParts, List<Double> missedPartsMl) {
    public StructureCase {
        performance = List.copyOf(performance);
        missedParts = List.copyOf(missedParts);
        missedPartsMl = List.copyOf(missedPartsMl);
    }

    /** The worst pair (lowest Dice; ties by pair order), or null when fewer than two readers. */
    public PairMetrics worstPair() {
        PairMetrics worst = null;
        for (PairMetrics p : agreement.pairs()) {
            if (worst == null || p.dice() < worst.dice()) {
                worst = p;
            }
        }
        return worst;
    }

    /** Rows of one reference kind, in reader order. */
    public List<ReaderPerformance> rows(String reference) {
        return performance.stream().filter(r -> r.reference().equals(reference)).toList();
    }
}
