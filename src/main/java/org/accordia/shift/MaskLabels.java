package org.accordia.shift;

import java.util.Collections;
import java.util.SortedMap;
import java.util.TreeMap;

/**
 * One reader's mask on one case, as far as empty structures and label conventions go: how many
 * voxels the structure has, and the voxel count of every label value in the mask (from the
 * per-case record; no voxels).
 *
 * @param reader          reader key
 * @param centre          the reader's centre
 * @param caseId          case id
 * @param structureVoxels voxels of the structure in this mask
 * @param labelCounts     label value (≥ 1) → voxels in the whole mask
 */
public record MaskLabels(String reader, String centre, String caseId, long structureVoxels,
        SortedMap<Integer, Long> labelCounts) {
    public MaskLabels {
        labelCounts = Collections.unmodifiableSortedMap(new TreeMap<>(labelCounts));
    }
}
