package org.accordia.analysis;

import java.util.List;
import org.accordia.study.Structure;

/**
 * What the per-case unit computes, the same for every case of a study; computed once by
 * {@link StudyAnalysis#plan} and handed to {@link CaseAnalysis#analyse} with each case.
 *
 * @param structures the structures analysed, protocol order
 * @param multiLabel whether the study has several label values (then a multi-label STAPLE per case)
 * @param undecidedValue the value of undecided voxels in the multi-label consensus, or −1
 * @param settings every step's settings
 */
public record CasePlan(List<Structure> structures, boolean multiLabel, int undecidedValue, AnalysisSettings settings) {
    public CasePlan {
        structures = List.copyOf(structures);
        if (structures.isEmpty()) {
            throw new IllegalArgumentException("a plan needs at least one structure");
        }
    }
}
