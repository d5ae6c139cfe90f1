package org.accordia.shift;

import java.util.List;

/**
 * The full result for one label: the JSON summary, the centres.csv rows, and the underlying
 * statistics for the HTML report. {@code centreEffects} are the raw effects against the other
 * centres' consensus (the centres.csv columns); {@code centreOffsets} the median-centred offsets the
 * flag rule judges when there are at least three centres ({@link EffectEstimator#centreOffsets});
 * {@code localEffects} the centres' shares of border beyond tolerance ({@link LocalEffects}; empty when
 * the per-case records carry no border profiles).
 */
public record LabelShiftReport(
        LabelShiftSummary summary,
        List<CentreRow> centreRows,
        PartitionResult partition,
        PermutationResult permutation,
        VarianceComponents.Result varianceComponents,
        List<GroupEffect> centreEffects,
        List<GroupEffect> readerEffects,
        Icc.Result icc,
        List<GroupEffect> centreOffsets,
        List<LocalEffect> localEffects) {

    public LabelShiftReport {
        localEffects = List.copyOf(localEffects);
        centreRows = List.copyOf(centreRows);
        centreEffects = List.copyOf(centreEffects);
        readerEffects = List.copyOf(readerEffects);
        centreOffsets = List.copyOf(centreOffsets);
    }
}
