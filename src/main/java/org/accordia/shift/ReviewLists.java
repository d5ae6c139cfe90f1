package org.accordia.shift;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;

/**
 * Cases to adjudicate and readers to recalibrate.
 *
 * <p>A case goes to adjudication when its median pairwise Dice is below
 * {@link ShiftSettings#adjudicationDice()}, or its largest pairwise HD95 is above
 * {@link ShiftSettings#adjudicationHd95Mm()}, or at least one reader pair has exactly one empty
 * mask (an empty mask is a flagged event, never silently dropped). NaN summaries do not trigger
 * a rule by themselves.
 *
 * <p>A reader needs recalibration when the 95 % case-bootstrap interval of their mean signed
 * surface distance against the consensus lies entirely beyond ±{@link ShiftSettings#recalibrationToleranceMm()},
 * or the interval of their geometric-mean volume ratio lies entirely beyond
 * 1 ± {@link ShiftSettings#recalibrationVolumePercent()} %.
 */
public final class ReviewLists {
    private ReviewLists() {
    }

    public static List<CaseToAdjudicate> casesToAdjudicate(List<CaseSummary> cases, ShiftSettings settings) {
        List<CaseSummary> sorted = new ArrayList<>(cases);
        sorted.sort(Comparator.comparing(CaseSummary::caseId));
        List<CaseToAdjudicate> out = new ArrayList<>();
        for (CaseSummary c : sorted) {
            List<String> reasons = new ArrayList<>();
            if (c.medianDice() < settings.adjudicationDice()) {
                reasons.add(String.format(Locale.ROOT, "median pairwise Dice %.2f is below %.2f", c.medianDice(),
                        settings.adjudicationDice()));
            }
            if (c.maxHd95Mm() > settings.adjudicationHd95Mm()) {
                reasons.add(String.format(Locale.ROOT, "largest pairwise HD95 %.1f mm is above %.1f mm", c.maxHd95Mm(),
                        settings.adjudicationHd95Mm()));
            }
            if (c.oneEmptyPairs() > 0) {
                reasons.add(c.oneEmptyPairs() + " reader pair" + (c.oneEmptyPairs() == 1 ? "" : "s")
                        + " where one mask is empty and the other is not");
            }
            if (!reasons.isEmpty()) {
                out.add(new CaseToAdjudicate(c.caseId(), reasons));
            }
        }
        return out;
    }

    public static List<ReaderToRecalibrate> readersToRecalibrate(List<GroupEffect> readerEffects,
            ShiftSettings settings) {
        List<ReaderToRecalibrate> out = new ArrayList<>();
        for (GroupEffect e : readerEffects) {
            List<String> reasons = new ArrayList<>();
            if (e.surfaceBeyond(settings.recalibrationToleranceMm())) {
                reasons.add(String.format(Locale.ROOT, "%s; the whole interval is beyond the %.1f mm tolerance",
                        surfaceWords(e), settings.recalibrationToleranceMm()));
            }
            if (e.volumeBeyond(settings.recalibrationVolumePercent())) {
                reasons.add(String.format(Locale.ROOT, "%s; the whole interval is beyond the %.0f%% tolerance",
                        volumeWords(e), settings.recalibrationVolumePercent()));
            }
            if (!reasons.isEmpty()) {
                out.add(new ReaderToRecalibrate(e.group(), e.centre(), reasons));
            }
        }
        return out;
    }

    private static String surfaceWords(GroupEffect e) {
        GroupEffect onlySurface = new GroupEffect(e.group(), e.centre(), e.readers(), e.cases(), e.signedSurfaceMm(),
                e.signedSurfaceLoMm(), e.signedSurfaceHiMm(), Double.NaN, Double.NaN, Double.NaN);
        return onlySurface.describe("the other readers' consensus");
    }

    private static String volumeWords(GroupEffect e) {
        GroupEffect onlyVolume = new GroupEffect(e.group(), e.centre(), e.readers(), e.cases(), Double.NaN,
                Double.NaN, Double.NaN, e.volumeRatio(), e.volumeRatioLo(), e.volumeRatioHi());
        return onlyVolume.describe("the other readers' consensus");
    }
}
