package org.accordia.analysis;

import java.util.List;

/**
 * A reader who overlooks a whole part of the structure (for example a small second lesion): in
 * each listed case, at least one component of the majority-vote consensus that the reader does
 * not touch at all ({@link org.accordia.consensus.MissedComponents}).
 *
 * @param reader reader name
 * @param centre the reader's centre
 * @param cases the cases, sorted
 * @param parts components missed per case, same order
 * @param partsMl their volume per case, ml, same order
 * @param sensitivities the reader's sensitivity against the other readers' consensus per case
 * @param othersMedian the median of the other readers' sensitivities per case
 */
public record MissedStructure(String reader, String centre, List<String> cases, List<Integer> parts,
                              List<Double> partsMl, List<Double> sensitivities, List<Double> othersMedian) {
    public MissedStructure {
        cases = List.copyOf(cases);
        parts = List.copyOf(parts);
        partsMl = List.copyOf(partsMl);
        sensitivities = List.copyOf(sensitivities);
        othersMedian = List.copyOf(othersMedian);
    }
}
