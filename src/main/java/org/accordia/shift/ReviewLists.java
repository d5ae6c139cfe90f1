package org.accordia.shift;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Cases to adjudicate, masks to correct and readers to recalibrate.
 *
 * <p><b>Masks to correct</b> are one reader's slips on one case: a whole part of the structure
 * that most readers mark is not touched (e.g. a second lesion left out), or the mask is empty while
 * every other reader draws the structure ({@link MaskToCorrect}). They go to that reader, not to
 * adjudication.
 *
 * <p><b>Cases to adjudicate</b> are those the readers genuinely disagree on, judged on the readers
 * left once the masks to correct (and every reader of an all-empty group, {@link EmptyGroups}) are
 * set aside: the median pairwise Dice among them is below {@link ShiftSettings#adjudicationDice()},
 * or their largest pairwise HD95 is above {@link ShiftSettings#adjudicationHd95Mm()}, or at least one
 * pair of them has exactly one empty mask. NaN summaries do not trigger a rule by themselves. A
 * summary without its pairs is judged on all readers as given.
 *
 * <p>A reader needs recalibration when the 95 % case-bootstrap interval of their mean signed
 * surface distance against the consensus lies entirely beyond ±{@link ShiftSettings#recalibrationToleranceMm()},
 * or the interval of their geometric-mean volume ratio lies entirely beyond
 * 1 ± {@link ShiftSettings#recalibrationVolumePercent()} % <em>and</em> the signed-surface interval
 * excludes 0 on the same side — the rule applied to centres (docs/shift.md: a volume ratio moves far
 * more than the boundary on small structures, so volume alone does not name a reader).
 */
public final class ReviewLists {
    private ReviewLists() {
    }

    public static List<CaseToAdjudicate> casesToAdjudicate(List<CaseSummary> cases, ShiftSettings settings) {
        return casesToAdjudicate(cases, settings, Set.of());
    }

    /**
     * Cases the readers genuinely disagree on.
     *
     * @param setAside reader keys left out of every case (the readers of an all-empty group)
     */
    public static List<CaseToAdjudicate> casesToAdjudicate(List<CaseSummary> cases, ShiftSettings settings,
            Set<String> setAside) {
        List<CaseSummary> sorted = new ArrayList<>(cases);
        sorted.sort(Comparator.comparing(CaseSummary::caseId));
        List<CaseToAdjudicate> out = new ArrayList<>();
        for (CaseSummary c : sorted) {
            double medianDice = c.medianDice();
            double maxHd95 = c.maxHd95Mm();
            int oneEmpty = c.oneEmptyPairs();
            if (!c.readers().isEmpty()) {
                Set<String> out1 = new HashSet<>(setAside);
                c.corrections().forEach(m -> out1.add(m.reader()));
                List<Double> dice = new ArrayList<>();
                maxHd95 = Double.NaN;
                oneEmpty = 0;
                int k = 0;
                int n = c.readers().size();
                for (int a = 0; a < n; a++) {
                    for (int b = a + 1; b < n; b++, k++) {
                        if (out1.contains(c.readers().get(a)) || out1.contains(c.readers().get(b))) {
                            continue;
                        }
                        boolean ea = c.emptyMasks()[a];
                        boolean eb = c.emptyMasks()[b];
                        if (ea != eb) {
                            oneEmpty++;
                        }
                        if (!(ea && eb)) {
                            dice.add(c.pairDice()[k]);
                        }
                        double h = c.pairHd95Mm()[k];
                        if (!Double.isNaN(h) && !(h <= maxHd95)) {
                            maxHd95 = h;
                        }
                    }
                }
                medianDice = median(dice);
            }
            List<String> reasons = new ArrayList<>();
            if (medianDice < settings.adjudicationDice()) {
                reasons.add("median pairwise Dice " + Wording.beside(medianDice, 2, settings.adjudicationDice())
                        + " is below " + Wording.threshold(settings.adjudicationDice(), medianDice, 2));
            }
            if (maxHd95 > settings.adjudicationHd95Mm()) {
                reasons.add("largest pairwise HD95 " + Wording.beside(maxHd95, 1, settings.adjudicationHd95Mm())
                        + " mm is above " + Wording.threshold(settings.adjudicationHd95Mm(), maxHd95, 1) + " mm");
            }
            if (oneEmpty > 0) {
                reasons.add(oneEmpty + " reader pair" + (oneEmpty == 1 ? "" : "s")
                        + " where one mask is empty and the other is not");
            }
            if (!reasons.isEmpty()) {
                out.add(new CaseToAdjudicate(c.caseId(), reasons));
            }
        }
        return out;
    }

    /** Masks a reader should correct (sorted by case, then reader), leaving out the set-aside readers. */
    public static List<MaskToCorrect> masksToCorrect(List<CaseSummary> cases, Set<String> setAside) {
        List<MaskToCorrect> out = new ArrayList<>();
        for (CaseSummary c : cases) {
            for (MaskToCorrect m : c.corrections()) {
                if (!setAside.contains(m.reader())) {
                    out.add(m);
                }
            }
        }
        out.sort(Comparator.comparing(MaskToCorrect::caseId).thenComparing(MaskToCorrect::reader));
        return out;
    }

    private static double median(List<Double> v) {
        double[] x = v.stream().mapToDouble(Double::doubleValue).filter(d -> !Double.isNaN(d)).sorted().toArray();
        if (x.length == 0) {
            return Double.NaN;
        }
        return x.length % 2 == 1 ? x[x.length / 2] : (x[x.length / 2 - 1] + x[x.length / 2]) / 2;
    }

    public static List<ReaderToRecalibrate> readersToRecalibrate(List<GroupEffect> readerEffects,
            ShiftSettings settings) {
        List<ReaderToRecalibrate> out = new ArrayList<>();
        for (GroupEffect e : readerEffects) {
            List<String> reasons = new ArrayList<>();
            if (e.surfaceBeyond(settings.recalibrationToleranceMm())) {
                reasons.add(String.format(Locale.ROOT, "%s; the whole interval is beyond the %s mm tolerance",
                        surfaceWords(e, settings.recalibrationToleranceMm()),
                        Wording.plain(settings.recalibrationToleranceMm(), 3)));
            }
            if (e.volumeBeyond(settings.recalibrationVolumePercent()) && CentreFindings.surfaceSameWay(e)) {
                reasons.add(String.format(Locale.ROOT,
                        "%s; the whole interval is beyond the %s%% tolerance, with the boundary moving the same way",
                        volumeWords(e, settings.recalibrationVolumePercent()),
                        Wording.plain(settings.recalibrationVolumePercent(), 3)));
            }
            if (!reasons.isEmpty()) {
                out.add(new ReaderToRecalibrate(e.group(), e.centre(), reasons));
            }
        }
        return out;
    }

    private static String surfaceWords(GroupEffect e, double toleranceMm) {
        GroupEffect onlySurface = new GroupEffect(e.group(), e.centre(), e.readers(), e.cases(), e.signedSurfaceMm(),
                e.signedSurfaceLoMm(), e.signedSurfaceHiMm(), Double.NaN, Double.NaN, Double.NaN);
        return onlySurface.describe("the other readers' consensus", toleranceMm, Double.NaN);
    }

    private static String volumeWords(GroupEffect e, double percent) {
        GroupEffect onlyVolume = new GroupEffect(e.group(), e.centre(), e.readers(), e.cases(), Double.NaN,
                Double.NaN, Double.NaN, e.volumeRatio(), e.volumeRatioLo(), e.volumeRatioHi());
        return onlyVolume.describe("the other readers' consensus", Double.NaN, percent);
    }
}
