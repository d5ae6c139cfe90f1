package org.accordia.shift;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The decision for one label: {@code pool}, {@code review} or {@code re-annotate}, with the rule
 * that fired and the reasons in words.
 *
 * <p><b>Centres.</b> Each centre's finding comes from {@link CentreFindings}: a centre is flagged
 * only when its own centre-vs-rest permutation test rejects after Holm's adjustment across centres
 * ({@link CentreVsRest}) AND its effect Δ_c against the other centres ({@link CentreContrasts},
 * readers and cases random) lies beyond the minimum (the volume route needs the surface interval
 * on the same side of 0). With two centres the pair is judged once and, when it passes, BOTH
 * centres are listed in {@code flagged_centres} with the flag {@code differ} and the rule
 * {@code centre-pair-differs}. The omnibus test ({@code test}) still drives
 * {@code significant-but-small} and the design statement.
 *
 * <p>Centre reasons are listed with the largest absolute judged signed-surface effect first (ties
 * by name); flagged centres and flags are sorted by name.
 *
 * <p>Rules, checked in this order (the verdict is the most severe one that fires; the reported
 * rule is the first that fires; every fired rule adds its reason):
 * <ol>
 * <li>{@code centre-shift} → re-annotate: at least one centre is flagged (G ≥ 3);
 * {@code centre-pair-differs} → re-annotate: the two centres of a two-centre study differ.</li>
 * <li>{@code significant-but-small} → review: the omnibus test is significant, or a centre's own
 * test rejects with an effect within the minimum, but no centre is flagged.</li>
 * <li>{@code uncertain-centre-effect} → review: some centre's finding is size-uncertain,
 * volume-without-surface or evidence-disagrees ({@link CentreFindings.Kind}).</li>
 * <li>{@code design-cannot-reach-alpha} → review: the design's smallest attainable p-value is
 * above α and some centre's judged point estimate exceeds the minimum.</li>
 * <li>{@code many-cases-to-adjudicate} → review: more than {@code adjudicationShare} of the cases
 * need adjudication.</li>
 * <li>{@code readers-to-recalibrate} → review: at least one reader needs recalibration.</li>
 * <li>{@code no-shift} → pool: none of the above.</li>
 * </ol>
 * When the design cannot reach α, its plain statement is always added to the reasons.
 */
public final class VerdictRules {
    public static final String CENTRE_SHIFT = "centre-shift";
    public static final String CENTRE_PAIR_DIFFERS = "centre-pair-differs";
    public static final String SIGNIFICANT_BUT_SMALL = "significant-but-small";
    public static final String UNCERTAIN_CENTRE_EFFECT = "uncertain-centre-effect";
    public static final String DESIGN_CANNOT_REACH_ALPHA = "design-cannot-reach-alpha";
    public static final String MANY_CASES_TO_ADJUDICATE = "many-cases-to-adjudicate";
    public static final String READERS_TO_RECALIBRATE = "readers-to-recalibrate";
    public static final String NO_SHIFT = "no-shift";

    /** Centre flag values used in centres.csv. */
    public static final String FLAG_SHIFT = "shift";
    /** Both centres of a two-centre study when they differ: the data cannot say which one departs. */
    public static final String FLAG_PAIR = "differ";
    public static final String FLAG_UNCERTAIN = "uncertain";
    public static final String FLAG_NONE = "none";

    private VerdictRules() {
    }

    /**
     * @param verdict         the decision
     * @param rule            the first rule that fired
     * @param reasons         every fired rule's reason, in rule order
     * @param flaggedCentres  centres with a flagged shift (sorted)
     * @param centreFlags     centre → shift / uncertain / none
     */
    public record Decision(Verdict verdict, String rule, List<String> reasons, List<String> flaggedCentres,
            Map<String, String> centreFlags) {
        public Decision {
            reasons = List.copyOf(reasons);
            flaggedCentres = List.copyOf(flaggedCentres);
            centreFlags = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(centreFlags));
        }
    }

    /**
     * The decision.
     *
     * @param test              the omnibus reader-level permutation test (all centres at once)
     * @param centres           each centre's finding from its own test and its effect
     *                          ({@link CentreFindings#judge})
     * @param casesToAdjudicate cases that need adjudication
     * @param totalCases        all cases
     * @param readers           readers that need recalibration
     * @param s                 thresholds
     */
    public static Decision decide(PermutationResult test, CentreFindings.Result centres, int casesToAdjudicate,
            int totalCases, List<ReaderToRecalibrate> readers, ShiftSettings s) {
        boolean significant = test.canReachAlpha() && test.pValue() <= s.alpha();
        String testWords = testWords(test, s);
        List<String> flagged = centres.flagged();
        List<String> shiftReasons = new ArrayList<>();
        List<String> uncertainReasons = new ArrayList<>();
        List<String> pointLarge = new ArrayList<>();
        boolean pair = centres.pair();
        boolean negligible = false;
        // largest signed-surface effect first, so the first reason names the likely source
        List<CentreFindings.Finding> judged = new ArrayList<>(centres.findings());
        if (pair) {
            judged.removeIf(f -> f.partner() != null && f.centre().compareTo(f.partner()) > 0);
        }
        judged.sort(java.util.Comparator.comparingDouble((CentreFindings.Finding f) ->
                Double.isNaN(f.effect().signedSurfaceMm()) ? Double.NEGATIVE_INFINITY
                        : Math.abs(f.effect().signedSurfaceMm())).reversed()
                .thenComparing(CentreFindings.Finding::centre));
        for (CentreFindings.Finding f : judged) {
            GroupEffect e = f.effect();
            String words = pair
                    ? "Centres " + f.centre() + " and " + f.partner() + " differ from each other: " + f.centre() + " "
                            + e.describe("centre " + f.partner())
                    : "Centre " + f.centre() + " " + e.describe("the other centres");
            String own = ownTestWords(f.test(), pair, s);
            String which = f.surfaceBeyond() && f.volumeSupported() ? "surface and volume" : f.surfaceBeyond()
                    ? "surface" : "volume (with the surface interval on the same side of 0)";
            switch (f.kind()) {
                case SHIFT -> shiftReasons.add(String.format(Locale.ROOT,
                        "%s; the %s interval lies entirely beyond the minimum shift (%s) and %s.", words, which,
                        minimumWords(s), own));
                case PAIR_DIFFERS -> shiftReasons.add(String.format(Locale.ROOT,
                        "%s; the %s interval lies entirely beyond the minimum shift (%s) and %s. With only two "
                                + "centres each is measured against the other, so the data cannot tell which "
                                + "centre departs from the common way of drawing: both are flagged as a pair. "
                                + "Settle it against the written protocol or a reading from a third centre.",
                        words, which, minimumWords(s), own));
                case EVIDENCE_DISAGREES -> uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the interval lies beyond the minimum shift (%s) but %s, so the evidence disagrees.",
                        words, minimumWords(s), own));
                case VOLUME_WITHOUT_SURFACE -> uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; %s, and the volume interval lies beyond %.0f%%, but the surface distance does not move "
                                + "the same way with confidence, so the volume difference alone does not flag the "
                                + "centre (a volume ratio moves far more than the boundary on small structures); "
                                + "look at the masks.", words, own, s.minimumVolumeShiftPercent()));
                case SIZE_UNCERTAIN -> uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; %s, and the interval excludes no shift and reaches past the minimum shift (%s) without "
                                + "lying beyond it, so the size of the shift is uncertain.", words, own,
                        minimumWords(s)));
                case NEGLIGIBLE -> negligible = true;
                default -> {
                }
            }
            if (e.pointBeyond(s.minimumShiftMm(), s.minimumVolumeShiftPercent())) {
                pointLarge.add(words);
            }
        }
        Verdict verdict = Verdict.POOL;
        String rule = null;
        List<String> reasons = new ArrayList<>();
        if (!flagged.isEmpty()) {
            verdict = Verdict.RE_ANNOTATE;
            rule = pair ? CENTRE_PAIR_DIFFERS : CENTRE_SHIFT;
            reasons.addAll(shiftReasons);
        }
        if ((significant || negligible) && flagged.isEmpty()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? SIGNIFICANT_BUT_SMALL : rule;
            reasons.add(String.format(Locale.ROOT,
                    "The centres differ (%s) but no centre's interval lies entirely beyond the minimum shift (%s).",
                    significant ? testWords : "a centre's own test rejects", minimumWords(s)));
        }
        if (!uncertainReasons.isEmpty()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? UNCERTAIN_CENTRE_EFFECT : rule;
            reasons.addAll(uncertainReasons);
        }
        if (!test.canReachAlpha() && !test.statement().isEmpty()) {
            if (!pointLarge.isEmpty()) {
                verdict = max(verdict, Verdict.REVIEW);
                rule = rule == null ? DESIGN_CANNOT_REACH_ALPHA : rule;
                reasons.add(test.statement() + " The point estimate exceeds the minimum shift for: "
                        + String.join("; ", pointLarge) + ".");
            } else {
                reasons.add(test.statement());
            }
        }
        if (totalCases > 0 && (double) casesToAdjudicate / totalCases > s.adjudicationShare()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? MANY_CASES_TO_ADJUDICATE : rule;
            reasons.add(String.format(Locale.ROOT, "%d of %d cases (%.0f%%) need adjudication, more than %.0f%%.",
                    casesToAdjudicate, totalCases, 100.0 * casesToAdjudicate / totalCases,
                    100 * s.adjudicationShare()));
        }
        if (!readers.isEmpty()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? READERS_TO_RECALIBRATE : rule;
            List<String> names = readers.stream().map(r -> r.reader() + " (" + r.centre() + ")").toList();
            reasons.add(readers.size() + " reader" + (readers.size() == 1 ? " needs" : "s need") + " recalibration: "
                    + String.join(", ", names) + ".");
        }
        if (rule == null) {
            rule = NO_SHIFT;
            reasons.add(0, String.format(Locale.ROOT,
                    "No centre shift: %s, no centre's interval reaches the minimum shift, %d of %d cases need "
                            + "adjudication and no reader needs recalibration.",
                    testWords, casesToAdjudicate, totalCases));
        }
        return new Decision(verdict, rule, reasons, flagged, centres.flags());
    }

    private static Verdict max(Verdict a, Verdict b) {
        return a.ordinal() >= b.ordinal() ? a : b;
    }

    private static String minimumWords(ShiftSettings s) {
        return String.format(Locale.ROOT, "%.1f mm or %.0f%% volume", s.minimumShiftMm(), s.minimumVolumeShiftPercent());
    }

    /** The centre's own test in words, e.g. "its own test against the other centres' readers gives p = ...". */
    static String ownTestWords(CentreVsRest.Result t, boolean pair, ShiftSettings s) {
        if (t == null || Double.isNaN(t.pValue())) {
            return "its own test is not applicable";
        }
        String how = t.exact() ? "exact, " + t.permutations() + " distinct reader splits"
                : t.permutations() + " random reader splits";
        String against = pair ? "the test of the pair" : "its own test against the other centres' readers";
        String adjusted = pair ? "" : String.format(Locale.ROOT, ", Holm-adjusted %.4g", t.adjustedP());
        if (!t.canReachAlpha()) {
            return String.format(Locale.ROOT, "%s gives p = %.4g (%s%s), and cannot reach alpha = %.4g "
                    + "(smallest attainable p %.4g)", against, t.pValue(), how, adjusted, s.alpha(), t.minP());
        }
        return String.format(Locale.ROOT, "%s gives p = %.4g (%s%s) %s alpha = %.4g", against, t.pValue(), how,
                adjusted, t.rejects(s.alpha()) ? "<=" : ">", s.alpha());
    }

    static String testWords(PermutationResult t, ShiftSettings s) {
        if (Double.isNaN(t.pValue())) {
            return "the permutation test is not applicable";
        }
        String how = t.exact() ? "exact, " + t.permutations() + " distinct reader partitions"
                : t.permutations() + " random reader permutations";
        String relation = t.pValue() <= s.alpha() && t.canReachAlpha() ? "<=" : ">";
        if (!t.canReachAlpha()) {
            return String.format(Locale.ROOT,
                    "the permutation test gives p = %.4g (%s; pseudo-F %.3g), and the design cannot reach alpha = %.4g",
                    t.pValue(), how, t.pseudoF(), s.alpha());
        }
        return String.format(Locale.ROOT, "the permutation test gives p = %.4g %s alpha = %.4g (%s; pseudo-F %.3g)",
                t.pValue(), relation, s.alpha(), how, t.pseudoF());
    }
}
