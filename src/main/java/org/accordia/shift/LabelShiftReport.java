package org.accordia.shift;

import java.util.List;

/**
 * The full result for one label: the JSON summary, the centres.csv rows, and the underlying
 * statistics for the HTML report.
 */
public record LabelShiftReport(
        LabelShiftSummary summary,
        List<CentreRow> centreRows,
        PartitionResult partition,
        PermutationResult permutation,
        VarianceComponents.Result varianceComponents,
        List<GroupEffect> centreEffects,
        List<GroupEffect> readerEffects,
        Icc.Result icc) {

    public LabelShiftReport {
        centreRows = List.copyOf(centreRows);
        centreEffects = List.copyOf(centreEffects);
        readerEffects = List.copyOf(readerEffects);
    }
}
