package org.accordia.analysis;

import java.util.List;
import org.accordia.study.ReaderId;

/**
 * What the study level keeps of one case: small and voxel-free, made when the case's volumes are
 * released.
 *
 * @param caseId the case
 * @param readers the readers who drew it, sorted by centre then name
 * @param emptyMasks readers whose mask has no foreground voxel at all (flagged events)
 * @param structures one entry per structure, protocol order
 * @param disagreementScore 1 − the smallest median pairwise Dice over the structures (0 = every
 *     structure agrees perfectly; used to rank cases for pictures and charts); NaN when undefined
 * @param multiLabelUndecidedVoxels voxels the multi-label STAPLE consensus could not decide
 *     (exact ties), or −1 when no multi-label consensus was made (a single label value)
 * @param labelCounts per reader (same order as {@code readers}), label value (≥ 1) → voxels in the
 *     mask: the label histogram behind "labels 5 and 6 occur only at centre X"
 */
public record CaseRecord(String caseId, List<ReaderId> readers, List<ReaderId> emptyMasks,
                         List<StructureCase> structures, double disagreementScore, long multiLabelUndecidedVoxels,
                         List<java.util.SortedMap<Integer, Long>> labelCounts) {
    public CaseRecord {
        readers = List.copyOf(readers);
        emptyMasks = List.copyOf(emptyMasks);
        structures = List.copyOf(structures);
        labelCounts = labelCounts.stream()
            .map(m -> java.util.Collections.unmodifiableSortedMap(new java.util.TreeMap<>(m))).toList();
    }

    /** A record without label counts. */
    public CaseRecord(String caseId, List<ReaderId> readers, List<ReaderId> emptyMasks, List<StructureCase> structures,
                      double disagreementScore, long multiLabelUndecidedVoxels) {
        this(caseId, readers, emptyMasks, structures, disagreementScore, multiLabelUndecidedVoxels, List.of());
    }
}
