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

    /** {@link #state()}: every reader of the case drew the structure. */
    public static final String DRAWN = "drawn";
    /** {@link #state()}: some readers drew the structure, others' masks have no voxel of it. */
    public static final String PARTLY_DRAWN = "partly_drawn";
    /** {@link #state()}: no reader drew the structure in this case. */
    public static final String ABSENT = "absent";

    /** How many of the case's readers drew the structure (a mask with at least one voxel of it). */
    public int readersDrawing() {
        int n = 0;
        for (long v : agreement.voxelCounts()) {
            n += v > 0 ? 1 : 0;
        }
        return n;
    }

    /**
     * No reader of the case drew the structure. Absent is its own state, not perfect agreement: the
     * Dice of 1 between two empty masks is a convention, and the outputs leave such a case out of
     * agreement summaries and show it as absent.
     */
    public boolean absent() {
        return readersDrawing() == 0;
    }

    /** {@value #DRAWN}, {@value #PARTLY_DRAWN} or {@value #ABSENT}. */
    public String state() {
        int n = readersDrawing();
        return n == 0 ? ABSENT : n == agreement.voxelCounts().size() ? DRAWN : PARTLY_DRAWN;
    }

    /**
     * The worst pair (lowest Dice; ties by pair order), or null when fewer than two readers or when
     * the structure is {@linkplain #absent() absent} (no pair is worse than another then).
     */
    public PairMetrics worstPair() {
        if (absent()) {
            return null;
        }
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
