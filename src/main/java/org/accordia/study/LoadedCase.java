package org.accordia.study;

import java.util.List;

/**
 * One case read into memory: every reader's mask on a common grid.
 *
 * @param caseId the case
 * @param geometry the grid shared by all masks (that of the first reader's mask)
 * @param readers the readers who drew the case, sorted by centre then name
 * @param masks the masks, aligned with {@code readers}
 */
public record LoadedCase(String caseId, org.accordia.io.Geometry geometry, List<ReaderId> readers,
                         List<org.accordia.io.LabelVolume> masks) {
    public LoadedCase {
        readers = List.copyOf(readers);
        masks = List.copyOf(masks);
        if (readers.size() != masks.size()) {
            throw new IllegalArgumentException("readers and masks differ in number");
        }
    }
}
