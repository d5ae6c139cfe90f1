package org.accordia.analysis;

import java.util.List;
import org.accordia.shift.ShiftSettings;
import org.accordia.shift.Verdict;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

/**
 * Everything a study's analysis produced, voxel-free; sorted by case, structure and reader.
 *
 * @param protocol the protocol used (with the seed actually used)
 * @param settings every step's settings as used (resolved once from the protocol)
 * @param structures the structures analysed, protocol order
 * @param readers every reader seen, sorted by centre then name
 * @param centres every centre seen, sorted
 * @param cases one record per case, sorted by case
 * @param labels one result per structure, protocol order
 * @param events flagged events, sorted
 * @param stapleRegion where STAPLE ran, in words
 * @param multiLabelUndecided the value of undecided voxels in the multi-label consensus masks, or
 *     −1 when no multi-label consensus was made
 */
public record StudyResult(Protocol protocol, AnalysisSettings settings, List<Structure> structures,
                          List<ReaderId> readers, List<String> centres, List<CaseRecord> cases,
                          List<LabelResult> labels, List<FlaggedEvent> events, String stapleRegion,
                          int multiLabelUndecided) {
    public StudyResult {
        structures = List.copyOf(structures);
        readers = List.copyOf(readers);
        centres = List.copyOf(centres);
        cases = List.copyOf(cases);
        labels = List.copyOf(labels);
        events = List.copyOf(events);
    }

    /** The shift analysis settings used. */
    public ShiftSettings shiftSettings() {
        return settings.shift().settings();
    }

    /** The most severe verdict over the labels (pool when there is no label). */
    public Verdict worstVerdict() {
        Verdict worst = Verdict.POOL;
        for (LabelResult l : labels) {
            if (l.summary().verdict().ordinal() > worst.ordinal()) {
                worst = l.summary().verdict();
            }
        }
        return worst;
    }
}
