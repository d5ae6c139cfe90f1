package org.accordia.analysis;

import java.io.IOException;
import java.util.List;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.MultiLabelStapleResult;
import org.accordia.io.ImageVolume;
import org.accordia.io.InputException;
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
     * @param image reads the case's image (checked against the masks' grid) while the case is in
     *     memory, or gives null when it has none; read only on demand (e.g. for a picture)
     */
    record CaseWork(LoadedCase loaded, List<CaseReferences> references, MultiLabelStapleResult multiLabel,
                    int multiLabelUndecided, CaseRecord record, CaseImage image) {
        public CaseWork {
            references = List.copyOf(references);
            image = image == null ? CaseImage.NONE : image;
        }

        /** As the full constructor, for a case without an image. */
        public CaseWork(LoadedCase loaded, List<CaseReferences> references, MultiLabelStapleResult multiLabel,
                        int multiLabelUndecided, CaseRecord record) {
            this(loaded, references, multiLabel, multiLabelUndecided, record, CaseImage.NONE);
        }
    }

    /** One case's image, read on demand. */
    @FunctionalInterface
    interface CaseImage {
        /** No image. */
        CaseImage NONE = () -> null;

        /** The image on the masks' grid, or null when the case has none. */
        ImageVolume read() throws InputException;
    }

    void accept(CaseWork work) throws IOException, InputException;
}
