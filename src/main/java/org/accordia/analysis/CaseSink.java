package org.accordia.analysis;

import java.io.IOException;
import java.util.List;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.MultiLabelStapleResult;
import org.accordia.study.LoadedCase;

/**
 * Receives each case while its volumes are in memory, e.g. to write the consensus masks and
 * probability maps and to keep a picture of the slice of greatest disagreement. Called from the
 * worker threads, concurrently for different cases: implementations must be thread-safe and must
 * not keep the volumes (keep only bounded, small extracts).
 */
@FunctionalInterface
public interface CaseSink {
    /** A sink that does nothing (simulations). */
    CaseSink NONE = work -> { };

    /**
     * One case's volumes and estimates.
     *
     * @param loaded the masks
     * @param references per structure (protocol order), the STAPLE references of the case
     * @param multiLabel the multi-label STAPLE result, or null when the study has one label value
     * @param multiLabelUndecided the value written for undecided voxels in the multi-label mask
     * @param record the case's record
     */
    record CaseWork(LoadedCase loaded, List<CaseReferences> references, MultiLabelStapleResult multiLabel,
                    int multiLabelUndecided, CaseRecord record) {
        public CaseWork {
            references = List.copyOf(references);
        }
    }

    void accept(CaseWork work) throws IOException;
}
