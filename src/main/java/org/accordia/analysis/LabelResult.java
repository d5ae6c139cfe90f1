package org.accordia.analysis;

import java.util.List;
import org.accordia.consensus.ReaderSummary;
import org.accordia.shift.LabelShiftInput;
import org.accordia.shift.LabelShiftReport;
import org.accordia.shift.LabelShiftSummary;
import org.accordia.study.Structure;

/**
 * The study-level result of one structure.
 *
 * @param index position of the structure in the protocol, from 1 (the {@code label} of the shift
 *     summary and the offset of its random streams)
 * @param structure the structure
 * @param input what the shift analysis was given
 * @param shift the shift analysis (partition, test, effects, variance components, verdict)
 * @param summary the JSON summary: the shift summary with {@code shift.flagged_centres} ordered by
 *     effect size, largest first (the primary finding first)
 * @param centreNotes plain-words notes on centre effects, e.g. the mirror effect of one shifted
 *     centre on the others
 * @param readerSummaries per reader and reference, bootstrap summaries (empty when not computed)
 * @param missedStructure readers who overlook part of the structure in several cases
 */
public record LabelResult(int index, Structure structure, LabelShiftInput input, LabelShiftReport shift,
                          LabelShiftSummary summary, List<String> centreNotes, List<ReaderSummary> readerSummaries,
                          List<MissedStructure> missedStructure) {
    public LabelResult {
        centreNotes = List.copyOf(centreNotes);
        readerSummaries = List.copyOf(readerSummaries);
        missedStructure = List.copyOf(missedStructure);
    }

    public String name() {
        return structure.name();
    }
}
