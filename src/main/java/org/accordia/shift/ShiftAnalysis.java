package org.accordia.shift;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;

/**
 * Annotation-shift analysis of one label: distance partition and reader-level permutation test
 * ({@link DistancePartition}, {@link PermutationTest}), variance components of a per-reader measure
 * ({@link VarianceComponents}), centre and reader effects with direction ({@link EffectEstimator}),
 * cases to adjudicate and readers to recalibrate ({@link ReviewLists}), an ICC side table
 * ({@link Icc}) and the verdict ({@link VerdictRules}). Deterministic: the same input and settings
 * give the same report. Seeds: permutation test {@code seed}, effect bootstrap {@code seed + 1},
 * variance components {@code seed + 2}, centre-vs-rest tests {@code seed + 3} (+ 7919 per centre), local
 * effects {@code seed + 4}, each offset by 1,000,003 × label so labels do not share
 * random streams.
 */
public final class ShiftAnalysis {
    private ShiftAnalysis() {
    }

    public static LabelShiftReport analyse(LabelShiftInput in, ShiftSettings s) {
        long base = s.seed() + 1_000_003L * in.label();
        PartitionResult partition = DistancePartition.partition(in.distances(), in.readerCentre());
        PermutationResult test = PermutationTest.test(in.distances(), in.readerCentre(), s.alpha(), s.permutations(),
                s.exactLimit(), base);
        List<GroupEffect> centres = EffectEstimator.byCentre(in.centreMeasures(), s.bootstrapResamples(), base + 1);
        List<CentreContrasts.Contrast> contrasts = CentreContrasts.estimate(in.commonMeasures());
        List<CentreVsRest.Result> centreTests = CentreVsRest.test(in.distances(), in.readerCentre(), s.alpha(),
                s.permutations(), s.exactLimit(), base + 3);
        List<LocalEffect> local = LocalEffects.byCentre(in.centreMeasures(), s.bootstrapResamples(), base + 4);
        List<EmptyGroup> empty = EmptyGroups.find(in.maskLabels());
        CentreFindings.Result judged = CentreFindings.judge(centreTests, CentreContrasts.effects(contrasts), local, s);
        // while a group's masks are all empty, no centre is judged (VerdictRules: empty-centre / empty-reader)
        CentreFindings.Result findings = empty.isEmpty() ? judged : judged.withheld();
        List<GroupEffect> readers = EffectEstimator.byReader(in.readerMeasures(), s.bootstrapResamples(), base + 1);
        VarianceComponents.Result vc = in.varianceMeasures().isEmpty() ? null
                : VarianceComponents.fit(in.varianceMeasures(), s.varianceResamples(), s.centreTestResamples(), base + 2);
        Icc.Result icc = in.volumesMl() == null ? null : Icc.compute(in.volumesMl(), s.alpha());

        Set<String> setAside = new TreeSet<>();
        for (EmptyGroup g : empty) {
            in.readerCentre().forEach((r, c) -> {
                if (g.level() == EmptyGroup.Level.CENTRE ? c.equals(g.centre()) : r.equals(g.group())) {
                    setAside.add(r);
                }
            });
        }
        List<CaseToAdjudicate> adjudicate = ReviewLists.casesToAdjudicate(in.caseSummaries(), s, setAside);
        List<MaskToCorrect> corrections = ReviewLists.masksToCorrect(in.caseSummaries(), setAside);
        List<ReaderToRecalibrate> recalibrate = ReviewLists.readersToRecalibrate(
                readers.stream().filter(r -> !setAside.contains(r.group())).toList(), s);
        TreeSet<String> allCases = new TreeSet<>();
        in.caseSummaries().forEach(c -> allCases.add(c.caseId()));
        in.distances().forEach(c -> allCases.add(c.caseId()));
        List<DesignLimit> limits = DesignLimits.of(DesignLimits.roster(in.readerCentre()), s.alpha(), s.exactLimit(),
                s.permutations());
        VerdictRules.Decision decision = VerdictRules.decide(test, findings, adjudicate.size(), allCases.size(),
                recalibrate, s, new VerdictRules.Context(limits, empty, local, corrections.size()));

        List<CentreRow> rows = new ArrayList<>();
        String labelName = in.name() == null ? Integer.toString(in.label()) : in.name();
        Map<String, GroupEffect> deltaOf = new LinkedHashMap<>();
        contrasts.forEach(c -> deltaOf.put(c.effect().group(), c.effect()));
        for (GroupEffect e : centres) {
            LocalEffect l = local.stream().filter(x -> x.centre().equals(e.group())).findFirst().orElse(null);
            rows.add(CentreRow.of(labelName, e, findings.of(e.group()), deltaOf.get(e.group()), l));
        }
        List<String> notes = new ArrayList<>(partition.notes());
        if (vc != null) {
            // optimiser fallbacks and failures are part of what the reader of the summary must know
            vc.notes().stream().filter(n -> n.startsWith("REML") || n.contains("failed"))
                    .forEach(n -> notes.add("variance components: " + n));
        }
        LabelShiftSummary.Shift shift = new LabelShiftSummary.Shift(in.distanceName(),
                Numbers.orNull(partition.betweenShare()), Numbers.orNull(partition.sigma2Between()),
                Numbers.orNull(partition.sigma2Within()), Numbers.orNull(partition.n0()),
                Numbers.orNull(partition.pseudoF()), partition.dfBetween(), partition.dfWithin(),
                Numbers.orNull(test.pValue()), test.permutations(), test.exact(), Numbers.orNull(test.minP()),
                test.canReachAlpha(), test.statement(), decision.flaggedCentres(), notes);
        Map<String, LabelShiftSummary.Component> components = new LinkedHashMap<>();
        LabelShiftSummary.CentreVarianceTest centreTest = null;
        String intervalMethod = null;
        List<String> reasons = new ArrayList<>(decision.reasons());
        if (vc != null) {
            for (VarianceComponents.Component c : vc.components()) {
                components.put(c.name(), new LabelShiftSummary.Component(Numbers.orNull(c.estimate()),
                        Numbers.orNull(c.lower()), Numbers.orNull(c.upper())));
            }
            intervalMethod = vc.intervalMethod();
            if (vc.centreTest() != null) {
                centreTest = new LabelShiftSummary.CentreVarianceTest(Numbers.orNull(vc.centreTest().statistic()),
                        Numbers.orNull(vc.centreTest().pValue()), vc.centreTest().method());
            }
        }
        List<LabelShiftSummary.IccForm> iccForms = new ArrayList<>();
        if (icc != null) {
            for (Icc.Estimate e : icc.estimates()) {
                iccForms.add(new LabelShiftSummary.IccForm(e.form(), Numbers.orNull(e.value()), Numbers.orNull(e.lower()),
                        Numbers.orNull(e.upper())));
            }
        }
        LabelShiftSummary summary = new LabelShiftSummary(in.label(), in.name(), shift,
                vc == null ? null : in.varianceMeasureName(), components, intervalMethod, centreTest, iccForms,
                decision.verdict(), decision.rule(), reasons, adjudicate, recalibrate, decision.designLimits(),
                decision.emptyGroups(), corrections);
        return new LabelShiftReport(summary, rows, partition, test, vc, centres, readers, icc, contrasts, centreTests,
                findings, local);
    }
}
