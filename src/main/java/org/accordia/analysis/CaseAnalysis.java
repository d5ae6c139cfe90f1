package org.accordia.analysis;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.CaseAgreementEngine;
import org.accordia.agreement.PairMetrics;
import org.accordia.agreement.PatternHistogram;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.LabelTupleHistogram;
import org.accordia.consensus.MissedComponents;
import org.accordia.consensus.MultiLabelStaple;
import org.accordia.consensus.MultiLabelStapleResult;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.consensus.StapleOptions;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.study.LoadedCase;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

/**
 * The per-case unit of the analysis: one case's volumes in, one small {@link CaseRecord} out
 * (no voxels). Independent of every other case, so a {@link CaseExecutor} may run it anywhere;
 * the study level ({@link StudyAnalysis#studyLevel}) needs only the records.
 */
public final class CaseAnalysis {
    private CaseAnalysis() {
    }

    /**
     * Analyses one case: agreement per structure, the STAPLE references with signed surfaces, the
     * readers' missed components, the multi-label consensus when the plan asks for it; hands the
     * case to the sink while its volumes are in memory; returns the voxel-free record.
     *
     * @param lc the case's masks on one grid
     * @param plan what to compute (the same for every case of a study)
     * @param sink receives the case while its volumes are in memory ({@link CaseSink#NONE} for none)
     * @param image the case's image on demand ({@link CaseSink.CaseImage#NONE} for none)
     * @throws IOException the sink failed
     * @throws InputException the sink read a bad image
     */
    public static CaseRecord analyse(LoadedCase lc, CasePlan plan, CaseSink sink, CaseSink.CaseImage image)
            throws IOException, InputException {
        List<Structure> structures = plan.structures();
        boolean multiLabel = plan.multiLabel();
        int undecided = plan.undecidedValue();
        StapleOptions staple = plan.settings().consensus().staple();
        Protocol.ConsensusRegion region = plan.settings().consensus().region();
        Protocol.Hd95Mode hd95 = plan.settings().agreement().hd95();
        List<ReaderId> readers = lc.readers();
        List<LabelVolume> masks = lc.masks();
        List<String> names = readers.stream().map(ReaderId::reader).toList();
        List<String> centres = readers.stream().map(ReaderId::centre).toList();
        double tolerance = structures.stream().mapToDouble(Structure::toleranceMm).min().orElse(Structure.DEFAULT_TOLERANCE_MM);
        List<CaseAgreement> agreements = new ArrayList<>();
        // one engine pass per distinct tolerance (usually one or two)
        Map<Double, List<Integer>> byTolerance = new TreeMap<>();
        for (int s = 0; s < structures.size(); s++) {
            byTolerance.computeIfAbsent(structures.get(s).toleranceMm(), k -> new ArrayList<>()).add(s);
        }
        CaseAgreement[] bySlot = new CaseAgreement[structures.size()];
        for (var e : byTolerance.entrySet()) {
            List<Structure> group = e.getValue().stream().map(structures::get).toList();
            List<CaseAgreement> got = new CaseAgreementEngine(e.getKey(), e.getKey(), hd95, null)
                .evaluate(lc.caseId(), readers, masks, group);
            for (int k = 0; k < got.size(); k++) {
                bySlot[e.getValue().get(k)] = got.get(k);
            }
        }
        agreements.addAll(Arrays.asList(bySlot));
        List<StructureCase> out = new ArrayList<>();
        List<CaseReferences> refs = new ArrayList<>();
        double worstMedian = Double.POSITIVE_INFINITY;
        for (int s = 0; s < structures.size(); s++) {
            Structure st = structures.get(s);
            CaseAgreement ca = agreements.get(s);
            PatternHistogram h = region == Protocol.ConsensusRegion.UNION_MARGIN ? unionMargin(ca) : ca.histogram();
            CaseReferences r = CaseReferences.compute(lc.caseId(), st.name(), names, centres, h,
                ca.voxelVolumeMl(), staple);
            List<ReaderPerformance> rows = r.rowsWithSurfaces(masks, st.labels().stream().mapToInt(Integer::intValue).toArray(),
                ca.unionBox(), st.toleranceMm());
            double maxHd95 = Double.NaN;
            for (PairMetrics p : ca.pairs()) {
                if (p.hasDistances() && !(p.hd95Mm() <= maxHd95)) {
                    maxHd95 = p.hd95Mm();
                }
            }
            double voxelMm3 = ca.voxelVolumeMl() * 1000;
            int minVoxels = (int) Math.max(1, Math.ceil(4.0 / 3 * Math.PI * Math.pow(st.toleranceMm(), 3) / voxelMm3));
            List<Integer> parts = new ArrayList<>();
            List<Double> partsMl = new ArrayList<>();
            for (MissedComponents.Missed m : MissedComponents.perReader(masks, st, ca.unionBox(), minVoxels)) {
                parts.add(m.components());
                partsMl.add(m.voxels() * ca.voxelVolumeMl());
            }
            out.add(new StructureCase(st, ca, rows, maxHd95, parts, partsMl));
            refs.add(r);
            if (!Double.isNaN(ca.medianDice())) {
                worstMedian = Math.min(worstMedian, ca.medianDice());
            }
        }
        List<ReaderId> empty = new ArrayList<>();
        for (int j = 0; j < masks.size(); j++) {
            if (masks.get(j).maxLabel() == 0) {
                empty.add(readers.get(j));
            }
        }
        MultiLabelStapleResult ml = null;
        long undecidedVoxels = -1;
        if (multiLabel) {
            ml = MultiLabelStaple.run(LabelTupleHistogram.build(masks), staple, undecided);
            undecidedVoxels = ml.consensusCounts().getOrDefault(undecided, 0L);
        }
        double score = worstMedian == Double.POSITIVE_INFINITY ? Double.NaN : 1 - worstMedian;
        List<java.util.SortedMap<Integer, Long>> labelCounts = new ArrayList<>();
        for (LabelVolume v : masks) {
            java.util.TreeMap<Integer, Long> counts = new java.util.TreeMap<>();
            v.labelCounts().forEach((k, n) -> {
                if (k >= 1 && n > 0) {
                    counts.put(k, n);
                }
            });
            labelCounts.add(counts);
        }
        CaseRecord record = new CaseRecord(lc.caseId(), readers, empty, out, score, undecidedVoxels, labelCounts);
        sink.accept(new CaseSink.CaseWork(lc, refs, ml, undecided, record, image));
        return record;
    }

    /**
     * The histogram restricted to the union of all readers' structure grown by the structure's
     * tolerance (the kappa region of the agreement step): every voxel outside the union has
     * pattern 0, so only the count of pattern 0 changes, to the region's voxels outside the union.
     */
    static PatternHistogram unionMargin(CaseAgreement ca) {
        PatternHistogram h = ca.histogram();
        long union = 0;
        for (int i = 0; i < h.size(); i++) {
            if (h.pattern(i) != 0) {
                union += h.count(i);
            }
        }
        long background = Math.max(0, ca.kappaRegionVoxels() - union);
        List<Long> p = new ArrayList<>();
        List<Long> c = new ArrayList<>();
        if (background > 0) {
            p.add(0L);
            c.add(background);
        }
        for (int i = 0; i < h.size(); i++) {
            if (h.pattern(i) != 0) {
                p.add(h.pattern(i));
                c.add(h.count(i));
            }
        }
        if (p.isEmpty()) {
            return h; // every mask empty: keep the whole grid
        }
        return new PatternHistogram(h.readers(), p.stream().mapToLong(Long::longValue).toArray(),
            c.stream().mapToLong(Long::longValue).toArray());
    }

}
