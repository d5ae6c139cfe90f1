package org.accordia.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.StudyResult;
import org.accordia.shift.CentreContrasts;
import org.accordia.shift.CentreFindings;
import org.accordia.shift.CentreRow;
import org.accordia.shift.DesignLimitation;
import org.accordia.shift.GroupEffect;
import org.accordia.shift.LabelShiftReport;
import org.accordia.shift.LabelShiftSummary;
import org.accordia.shift.Verdict;
import org.accordia.shift.VerdictRules;
import org.accordia.study.ReaderId;

/**
 * What the calibration reads from one analysis, for one structure: the only place in the
 * calibration that knows the shape of {@link StudyResult}. Every criterion is judged on these
 * fields, so a change of the result types touches this class alone.
 *
 * <p>Where each field comes from in the current result:
 * <ul>
 *   <li>{@code flagged}: the centres in {@code summary.shift.flagged_centres}; the direction is the
 *       sign of the effect the centre-flag decision judged, the centre's Δ_c
 *       ({@link LabelShiftReport#centreContrasts()}); for a two-centre pair the direction of each
 *       centre's own Δ.</li>
 *   <li>{@code uncertainCentres}: centres whose centres.csv flag is {@code uncertain}
 *       ({@link VerdictRules#FLAG_UNCERTAIN}); exactly the centres behind the reasons of the rule
 *       {@code uncertain-centre-effect}, so the review fired iff the list is not empty.</li>
 *   <li>{@code readersToRecalibrate}: {@code summary.readers_to_recalibrate}.</li>
 *   <li>{@code centreEffects}: the reported centre effect Δ_c and its 95 % interval per centre
 *       ({@link LabelShiftReport#centreContrasts()}: the estimand of {@link PlantedTruth}, against
 *       one common reference per case, model-based interval with readers and cases random;
 *       centres.csv columns {@code effect_mm}, {@code effect_lo_mm}, {@code effect_hi_mm}).</li>
 *   <li>{@code alphaSentence}: the design cannot reach α ({@code summary.shift.can_reach_alpha} is
 *       false) and its plain sentence ({@code summary.shift.design_statement}) is among the
 *       decision's reasons.</li>
 *   <li>{@code oneReaderSentence}: a decision sentence saying that a centre's effect cannot be told
 *       apart from its single reader's bias. The current result has no such sentence, so this is
 *       false on the current rule.</li>
 *   <li>{@code verdict}, {@code rule}, {@code reasons}: the summary's; {@code pValue} and
 *       {@code canReachAlpha}: the permutation test's.</li>
 * </ul>
 *
 * @param label the structure
 * @param flagged the flagged centres with the direction of their judged effect, sorted by centre
 * @param uncertainCentres centres behind an "uncertain centre effect" review, sorted
 * @param readersToRecalibrate readers named for recalibration, sorted
 * @param centreEffects each centre's reported effect and interval, sorted by centre
 * @param alphaSentence the decision says, in a plain sentence, that the design cannot reach α
 * @param oneReaderSentence the decision says, in a plain sentence, that a one-reader centre's
 *     effect cannot be told apart from its reader's bias
 * @param verdict the decision
 * @param rule the rule that fired first
 * @param reasons the decision's reasons
 * @param pValue the permutation test's p-value
 * @param canReachAlpha whether the design's smallest attainable p is at most α
 */
public record ScenarioOutcome(String label, List<FlaggedCentre> flagged, List<String> uncertainCentres,
                              List<ReaderId> readersToRecalibrate, List<CentreEstimate> centreEffects,
                              boolean alphaSentence, boolean oneReaderSentence, Verdict verdict, String rule,
                              List<String> reasons, double pValue, boolean canReachAlpha) {

    /** A flagged centre; {@code direction} +1 = draws outside (wider), −1 = inside, 0 = unknown. */
    public record FlaggedCentre(String centre, int direction) {
    }

    /** A centre's reported effect (mm, positive = outside) and its 95 % interval. */
    public record CentreEstimate(String centre, int readers, double estimateMm, double loMm, double hiMm) {
        /** Whether the interval holds {@code valueMm} (NaN limits hold nothing). */
        public boolean covers(double valueMm) {
            return loMm <= valueMm && valueMm <= hiMm;
        }
    }

    public ScenarioOutcome {
        flagged = List.copyOf(flagged);
        uncertainCentres = List.copyOf(uncertainCentres);
        readersToRecalibrate = List.copyOf(readersToRecalibrate);
        centreEffects = List.copyOf(centreEffects);
        reasons = List.copyOf(reasons);
    }

    /** The outcome for structure {@code label} of an analysis. */
    public static ScenarioOutcome of(StudyResult result, String label) {
        LabelResult l = result.labels().stream().filter(x -> x.name().equals(label)).findFirst()
            .orElseThrow(() -> new IllegalArgumentException("no structure " + label + " in the result"));
        LabelShiftSummary summary = l.summary();
        LabelShiftReport shift = l.shift();
        List<GroupEffect> judged = CentreContrasts.effects(shift.centreContrasts());
        List<FlaggedCentre> flagged = new ArrayList<>();
        for (String c : new java.util.TreeSet<>(summary.shift().flaggedCentres())) {
            flagged.add(new FlaggedCentre(c, direction(shift.centreFindings().of(c))));
        }
        List<String> uncertain = shift.centreRows().stream()
            .filter(r -> VerdictRules.FLAG_UNCERTAIN.equals(r.flag())).map(CentreRow::centre).sorted().toList();
        List<ReaderId> readers = summary.readersToRecalibrate().stream()
            .map(r -> new ReaderId(r.reader(), r.centre())).sorted().toList();
        List<CentreEstimate> effects = judged.stream()
            .map(e -> new CentreEstimate(e.group(), e.readers(), e.signedSurfaceMm(), e.signedSurfaceLoMm(),
                e.signedSurfaceHiMm()))
            .sorted(java.util.Comparator.comparing(CentreEstimate::centre)).toList();
        boolean alphaSentence = summary.designLimitations().stream()
            .anyMatch(d -> d.kind() == DesignLimitation.CANNOT_REACH_ALPHA);
        boolean oneReaderSentence = summary.designLimitations().stream()
            .anyMatch(d -> d.kind() == DesignLimitation.ONE_READER_CENTRE);
        return new ScenarioOutcome(label, flagged, uncertain, readers, effects, alphaSentence, oneReaderSentence,
            summary.verdict(), summary.rule(), summary.reasons(), shift.permutation().pValue(),
            shift.permutation().canReachAlpha());
    }

    /**
     * The direction of a flagged centre's judged effect: the sign of Δ_c's signed surface (else of its
     * volume ratio); for a centre flagged on its border beyond tolerance alone, outside (+1) or inside
     * (−1) by the larger excess; in a pair, the second centre by name has the opposite sign.
     */
    private static int direction(CentreFindings.Finding f) {
        if (f == null) {
            return 0;
        }
        double d;
        if (f.localBeyond() && !f.surfaceBeyond() && !f.volumeSupported() && f.local() != null) {
            d = f.local().outsideSide() ? 1 : -1;
        } else {
            GroupEffect e = f.effect();
            d = Double.isFinite(e.signedSurfaceMm()) ? e.signedSurfaceMm() : Math.log(e.volumeRatio());
        }
        if (f.partner() != null && f.centre().compareTo(f.partner()) > 0) {
            d = -d;
        }
        return Double.isFinite(d) ? (int) Math.signum(d) : 0;
    }

    /** Whether {@code centre} is flagged with direction {@code direction} (sign). */
    public boolean flags(String centre, int direction) {
        return flagged.stream().anyMatch(f -> f.centre().equals(centre) && f.direction() == direction);
    }

    /** Whether any centre other than {@code centre} is flagged (any centre when it is null). */
    public boolean flagsOtherThan(String centre) {
        return flagged.stream().anyMatch(f -> !f.centre().equals(centre));
    }

    /** Whether {@code centre} is flagged in either direction. */
    public boolean flags(String centre) {
        return flagged.stream().anyMatch(f -> f.centre().equals(centre));
    }

    /** The effect reported for {@code centre}, or null. */
    public CentreEstimate effectOf(String centre) {
        return centreEffects.stream().filter(e -> e.centre().equals(centre)).findFirst().orElse(null);
    }
}
