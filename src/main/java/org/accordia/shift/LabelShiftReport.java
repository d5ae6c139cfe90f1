package org.accordia.shift;

import java.util.List;

/**
 * The full result for one label: the JSON summary, the centres.csv rows, and the underlying
 * statistics for the HTML report. {@code centreEffects} are the raw effects against the other
 * centres' consensus (the first centres.csv columns); {@code centreContrasts} the effects Δ_c against
 * one common reference the flag judges ({@link CentreContrasts}); {@code centreTests} each centre's
 * own test ({@link CentreVsRest}); {@code centreFindings} the centre-flag decision
 * ({@link CentreFindings}).
 * {@code localEffects} the centres' shares of border beyond tolerance ({@link LocalEffects}; empty
 * when the per-case records carry no border profiles).
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
        List<CentreContrasts.Contrast> centreContrasts,
        List<CentreVsRest.Result> centreTests,
        CentreFindings.Result centreFindings,
        List<LocalEffect> localEffects) {

    public LabelShiftReport {
        localEffects = List.copyOf(localEffects);
        centreRows = List.copyOf(centreRows);
        centreEffects = List.copyOf(centreEffects);
        readerEffects = List.copyOf(readerEffects);
        centreContrasts = List.copyOf(centreContrasts);
        centreTests = List.copyOf(centreTests);
    }
}
