package org.accordia.run;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.accordia.analysis.CaseSource;
import org.accordia.study.Protocol;
import org.accordia.study.Study;

/**
 * A study ready to be inspected or analysed: discovered, with its protocol resolved once
 * (overrides applied) and where that protocol came from. Nothing has been read from a mask yet.
 *
 * @param study the discovered study (roster, masks, discovery problems)
 * @param protocol the protocol in force (seed and voxel limit overrides applied)
 * @param protocolSource where the protocol came from
 * @param allowOutsideRoot whether mask and image paths may lead outside the study folder
 */
public record PreparedStudy(Study study, Protocol protocol, ProtocolSource protocolSource, boolean allowOutsideRoot) {

    /** The cases of the study, read through the protocol's limits. */
    public CaseSource caseSource() {
        return CaseSource.ofStudy(study, protocol, allowOutsideRoot);
    }

    /** Every input file of a run: the masks and images (sorted), then the protocol file if any. */
    public List<Path> inputFiles(CaseSource source) {
        List<Path> out = new ArrayList<>(source.inputFiles());
        if (protocolSource.file() != null) {
            out.add(protocolSource.file());
        }
        return out;
    }
}
