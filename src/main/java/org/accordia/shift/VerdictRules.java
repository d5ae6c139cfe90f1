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
 * <p>A centre is <em>flagged</em> (annotation shift) only when BOTH the reader-level permutation
 * test is significant (p ≤ α, and the design can reach α) AND the centre's effect interval lies
 * entirely beyond the minimum effect: signed surface interval lo &gt; +minimumShiftMm or
 * hi &lt; −minimumShiftMm, or volume-ratio interval lo &gt; 1 + m or hi &lt; 1 − m with
 * m = minimumVolumeShiftPercent/100.
 *
 * <p>Centre reasons are listed with the largest absolute signed-surface effect first (ties by
 * name); flagged centres and flags are sorted by name.
 *
 * <p>Rules, checked in this order (the verdict is the most severe one that fires; the reported
 * rule is the first that fires; every fired rule adds its reason):
 * <ol>
 * <li>{@code centre-shift} → re-annotate: at least one centre is flagged.</li>
 * <li>{@code significant-but-small} → review: the test is significant but no centre is flagged.</li>
 * <li>{@code uncertain-centre-effect} → review: a centre that is not flagged has an interval that
 * excludes "no shift" (0 mm or ratio 1) and either crosses the minimum (size uncertain) or lies
 * beyond the minimum while the test is not significant (evidence disagrees). An interval entirely
 * between "no shift" and the minimum (a detectable but negligible shift) does not fire.</li>
 * <li>{@code design-cannot-reach-alpha} → review: the design's smallest attainable p-value is
 * above α and some centre's point estimate exceeds the minimum.</li>
 * <li>{@code many-cases-to-adjudicate} → review: more than {@code adjudicationShare} of the cases
 * need adjudication.</li>
 * <li>{@code readers-to-recalibrate} → review: at least one reader needs recalibration.</li>
 * <li>{@code no-shift} → pool: none of the above.</li>
 * </ol>
 * When the design cannot reach α, its plain statement is always added to the reasons.
 */
public final class VerdictRules {
    public static final String CENTRE_SHIFT = "centre-shift";
    public static final String SIGNIFICANT_BUT_SMALL = "significant-but-small";
    public static final String UNCERTAIN_CENTRE_EFFECT = "uncertain-centre-effect";
    public static final String DESIGN_CANNOT_REACH_ALPHA = "design-cannot-reach-alpha";
    public static final String MANY_CASES_TO_ADJUDICATE = "many-cases-to-adjudicate";
    public static final String READERS_TO_RECALIBRATE = "readers-to-recalibrate";
    public static final String NO_SHIFT = "no-shift";

    /** Centre flag values used in centres.csv. */
    public static final String FLAG_SHIFT = "shift";
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

    public static Decision decide(PermutationResult test, List<GroupEffect> centres, int casesToAdjudicate,
            int totalCases, List<ReaderToRecalibrate> readers, ShiftSettings s) {
        boolean significant = test.canReachAlpha() && test.pValue() <= s.alpha();
        String testWords = testWords(test, s);
        List<String> flagged = new ArrayList<>();
        Map<String, String> flags = new LinkedHashMap<>();
        List<String> shiftReasons = new ArrayList<>();
        List<String> uncertainReasons = new ArrayList<>();
        List<String> pointLarge = new ArrayList<>();
        // largest signed-surface effect first, so the first reason names the likely source
        List<GroupEffect> ordered = new ArrayList<>(centres);
        ordered.sort(java.util.Comparator.comparingDouble((GroupEffect e) -> Double.isNaN(e.signedSurfaceMm())
                ? Double.NEGATIVE_INFINITY : Math.abs(e.signedSurfaceMm())).reversed()
                .thenComparing(GroupEffect::group));
        for (GroupEffect e : ordered) {
            boolean surface = e.surfaceBeyond(s.minimumShiftMm());
            boolean volume = e.volumeBeyond(s.minimumVolumeShiftPercent());
            boolean uncertain = e.crossesMinimum(s.minimumShiftMm(), s.minimumVolumeShiftPercent());
            String words = "Centre " + e.group() + " " + e.describe("the other centres");
            if (significant && (surface || volume)) {
                flagged.add(e.group());
                flags.put(e.group(), FLAG_SHIFT);
                shiftReasons.add(String.format(Locale.ROOT,
                        "%s; the %s interval lies entirely beyond the minimum shift (%s) and %s.", words,
                        surface && volume ? "surface and volume" : surface ? "surface" : "volume",
                        minimumWords(s), testWords));
            } else if (surface || volume) {
                flags.put(e.group(), FLAG_UNCERTAIN);
                uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the interval lies beyond the minimum shift (%s) but %s, so the evidence disagrees.",
                        words, minimumWords(s), testWords));
            } else if (uncertain) {
                flags.put(e.group(), FLAG_UNCERTAIN);
                uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the interval excludes no shift and reaches past the minimum shift (%s) without "
                                + "lying beyond it, so the size of the shift is uncertain.", words, minimumWords(s)));
            } else {
                flags.put(e.group(), FLAG_NONE);
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
            rule = CENTRE_SHIFT;
            reasons.addAll(shiftReasons);
        }
        if (significant && flagged.isEmpty()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? SIGNIFICANT_BUT_SMALL : rule;
            reasons.add(String.format(Locale.ROOT,
                    "The centres differ (%s) but no centre's interval lies entirely beyond the minimum shift (%s).",
                    testWords, minimumWords(s)));
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
        flagged.sort(null);
        Map<String, String> sortedFlags = new LinkedHashMap<>();
        centres.stream().map(GroupEffect::group).sorted().forEach(g -> sortedFlags.put(g, flags.get(g)));
        return new Decision(verdict, rule, reasons, flagged, sortedFlags);
    }

    private static Verdict max(Verdict a, Verdict b) {
        return a.ordinal() >= b.ordinal() ? a : b;
    }

    private static String minimumWords(ShiftSettings s) {
        return String.format(Locale.ROOT, "%.1f mm or %.0f%% volume", s.minimumShiftMm(), s.minimumVolumeShiftPercent());
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
