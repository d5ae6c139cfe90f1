package org.accordia.shift;

import java.util.List;
import java.util.Map;

/**
 * Everything the shift analysis needs for one label; small per-case records only.
 *
 * @param label                label value in the masks
 * @param name                 label name
 * @param distanceName         what the distance matrices hold, e.g. "1 - Jaccard" or "HD95 (mm)"
 * @param readerCentre         reader id → centre, fixed for the study
 * @param distances            per case: readers present and their pairwise distances
 * @param centreMeasures       per reader and case: signed surface distance and volume ratio against
 *                             the other centres' consensus (centre effects)
 * @param readerMeasures       per reader and case: the same against the other readers' consensus
 *                             (reader recalibration); may be the same list as centreMeasures
 * @param commonMeasures       per reader and case: the antisymmetric border offset (mm) and volume
 *                             ratio against ONE common reference per case (the consensus of all
 *                             readers): the centre effects Δ_c the flag judges ({@link CentreContrasts})
 * @param varianceMeasureName  name and unit of the variance-component measure, e.g. "signed surface distance (mm)"
 * @param varianceMeasures     per reader and case: the measure for the variance-component model
 *                             (empty: no variance components)
 * @param caseSummaries        per case: median Dice, max HD95, one-empty pairs, readers present
 * @param volumesMl            complete cases × readers volume matrix for the ICC side table, or null
 * @param maskLabels           per reader and case: structure voxels and label counts (empty
 *                             centres and readers, {@link EmptyGroups}); may be empty
 */
public record LabelShiftInput(
        int label,
        String name,
        String distanceName,
        Map<String, String> readerCentre,
        List<CaseDistances> distances,
        List<ReaderCaseMeasure> centreMeasures,
        List<ReaderCaseMeasure> readerMeasures,
        List<ReaderCaseMeasure> commonMeasures,
        String varianceMeasureName,
        List<ReaderMeasure> varianceMeasures,
        List<CaseSummary> caseSummaries,
        double[][] volumesMl,
        List<MaskLabels> maskLabels) {

    /** An input without mask labels. */
    public LabelShiftInput(int label, String name, String distanceName, Map<String, String> readerCentre,
            List<CaseDistances> distances, List<ReaderCaseMeasure> centreMeasures,
            List<ReaderCaseMeasure> readerMeasures, List<ReaderCaseMeasure> commonMeasures, String varianceMeasureName,
            List<ReaderMeasure> varianceMeasures, List<CaseSummary> caseSummaries, double[][] volumesMl) {
        this(label, name, distanceName, readerCentre, distances, centreMeasures, readerMeasures, commonMeasures,
                varianceMeasureName, varianceMeasures, caseSummaries, volumesMl, List.of());
    }

    public LabelShiftInput {
        maskLabels = List.copyOf(maskLabels);
        readerCentre = Map.copyOf(readerCentre);
        distances = List.copyOf(distances);
        centreMeasures = List.copyOf(centreMeasures);
        readerMeasures = List.copyOf(readerMeasures);
        commonMeasures = List.copyOf(commonMeasures);
        varianceMeasures = List.copyOf(varianceMeasures);
        caseSummaries = List.copyOf(caseSummaries);
        if (volumesMl != null) {
            double[][] copy = new double[volumesMl.length][];
            for (int i = 0; i < copy.length; i++) {
                copy[i] = volumesMl[i].clone();
            }
            volumesMl = copy;
        }
    }
}
