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
 * <p><b>Which effect is judged.</b> centres.csv reports each centre against the consensus of the
 * OTHER centres (e_c). That consensus contains a shifted centre, so when one of G centres draws Δ
 * wider, the others appear about Δ/(G−1) narrower (the mirror effect) and could pass the minimum
 * although they did nothing different. With G ≥ 3 the rules therefore judge the median-centred
 * offsets r_c ({@link EffectEstimator#centreOffsets}): the shifted centre keeps its shift and the
 * others drop to about 0. With G = 2 the two centres are exact mirrors and the data cannot say
 * which one departs: the pair is judged once (through the first centre by name) and, when it
 * passes, BOTH centres are listed in {@code flagged_centres} with the flag {@code differ} and the
 * rule {@code centre-pair-differs}. With one centre there is nothing to compare.
 *
 * <p>A centre is <em>flagged</em> only when BOTH the reader-level permutation test is significant
 * (p ≤ α, and the design can reach α) AND the judged effect's interval lies entirely beyond the
 * minimum: signed surface interval lo &gt; +minimumShiftMm or hi &lt; −minimumShiftMm; or
 * volume-ratio interval lo &gt; 1 + m or hi &lt; 1 − m (m = minimumVolumeShiftPercent/100)
 * <em>and</em> the signed-surface interval excludes 0 on the same side. A volume interval beyond
 * the minimum without that support flags the centre {@code uncertain} (review), never {@code shift}:
 * on small structures a sub-millimetre margin change already moves the volume by 15 % and more.
 *
 * <p>Centre reasons are listed with the largest absolute judged signed-surface effect first (ties
 * by name); flagged centres and flags are sorted by name.
 *
 * <p>Rules, checked in this order (the verdict is the most severe one that fires; the reported
 * rule is the first that fires; every fired rule adds its reason):
 * <ol>
 * <li>{@code centre-shift} → re-annotate: at least one centre is flagged (G ≥ 3, or G = 1);
 * {@code centre-pair-differs} → re-annotate: the two centres of a two-centre study differ.</li>
 * <li>{@code significant-but-small} → review: the test is significant but no centre is flagged.</li>
 * <li>{@code uncertain-centre-effect} → review: a centre that is not flagged has an interval that
 * excludes "no shift" (0 mm or ratio 1) and either crosses the minimum (size uncertain), lies
 * beyond the minimum while the test is not significant (evidence disagrees), or passes the volume
 * minimum without the surface moving the same way. An interval entirely between "no shift" and
 * the minimum (a detectable but negligible shift) does not fire.</li>
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
     * @param test              the reader-level permutation test
     * @param centres           each centre's effect against the other centres' consensus (raw,
     *                          as in centres.csv)
     * @param offsets           the median-centred offsets of the same centres
     *                          ({@link EffectEstimator#centreOffsets}); used to judge centres when
     *                          there are at least 3
     * @param casesToAdjudicate cases that need adjudication
     * @param totalCases        all cases
     * @param readers           readers that need recalibration
     * @param s                 thresholds
     */
    public static Decision decide(PermutationResult test, List<GroupEffect> centres, List<GroupEffect> offsets,
            int casesToAdjudicate, int totalCases, List<ReaderToRecalibrate> readers, ShiftSettings s) {
        boolean significant = test.canReachAlpha() && test.pValue() <= s.alpha();
        String testWords = testWords(test, s);
        List<String> flagged = new ArrayList<>();
        Map<String, String> flags = new LinkedHashMap<>();
        List<String> shiftReasons = new ArrayList<>();
        List<String> uncertainReasons = new ArrayList<>();
        List<String> pointLarge = new ArrayList<>();
        Map<String, GroupEffect> offsetOf = new LinkedHashMap<>();
        offsets.forEach(o -> offsetOf.put(o.group(), o));
        // centres with a usable effect; two of them are a pair even when a third centre has no value
        List<GroupEffect> usable = centres.stream()
                .filter(e -> Double.isFinite(e.signedSurfaceMm()) || Double.isFinite(e.volumeRatio())).toList();
        boolean pair = usable.size() == 2;
        boolean centred = usable.size() >= 3;
        List<GroupEffect> judged = new ArrayList<>();
        if (pair) {
            // two centres are exact mirrors: judge the pair once, through the first centre by name
            judged.add(usable.stream().min(java.util.Comparator.comparing(GroupEffect::group)).orElseThrow());
        } else if (centred) {
            for (GroupEffect e : usable) {
                GroupEffect o = offsetOf.get(e.group());
                if (o == null) {
                    throw new IllegalArgumentException("no median-centred offset for centre " + e.group());
                }
                judged.add(o);
            }
        } else {
            judged.addAll(centres);
        }
        // largest signed-surface effect first, so the first reason names the likely source
        judged.sort(java.util.Comparator.comparingDouble((GroupEffect e) -> Double.isNaN(e.signedSurfaceMm())
                ? Double.NEGATIVE_INFINITY : Math.abs(e.signedSurfaceMm())).reversed()
                .thenComparing(GroupEffect::group));
        Map<String, GroupEffect> rawOf = new LinkedHashMap<>();
        centres.forEach(e -> rawOf.put(e.group(), e));
        for (GroupEffect e : judged) {
            boolean surface = e.surfaceBeyond(s.minimumShiftMm());
            boolean volumeBeyond = e.volumeBeyond(s.minimumVolumeShiftPercent());
            boolean volume = volumeBeyond && surfaceSameWay(e);
            boolean volumeAlone = volumeBeyond && !volume && !surface;
            boolean uncertain = e.crossesMinimum(s.minimumShiftMm(), s.minimumVolumeShiftPercent());
            String words;
            List<String> who;
            if (pair) {
                String other = usable.stream().map(GroupEffect::group).filter(g -> !g.equals(e.group()))
                        .findFirst().orElseThrow();
                who = List.of(e.group(), other);
                words = "Centres " + e.group() + " and " + other + " differ from each other: " + e.group() + " "
                        + e.describe("centre " + other);
            } else if (centred) {
                who = List.of(e.group());
                words = "Centre " + e.group() + " " + e.describe("the typical centre")
                        + " (the other centres' consensus includes this centre's own shift, so the comparison is"
                        + " re-centred on the median centre; against the other centres' consensus it "
                        + rawOf.get(e.group()).describe("them") + ")";
            } else {
                who = List.of(e.group());
                words = "Centre " + e.group() + " " + e.describe("the other centres");
            }
            String which = surface && volume ? "surface and volume" : surface ? "surface"
                    : "volume (with the surface interval on the same side of 0)";
            if (significant && (surface || volume)) {
                for (String g : who) {
                    flagged.add(g);
                    flags.put(g, pair ? FLAG_PAIR : FLAG_SHIFT);
                }
                shiftReasons.add(pair
                        ? String.format(Locale.ROOT,
                                "%s; the %s interval lies entirely beyond the minimum shift (%s) and %s. With only two "
                                        + "centres each is measured against the other, so the data cannot tell which "
                                        + "centre departs from the common way of drawing: both are flagged as a pair. "
                                        + "Settle it against the written protocol or a reading from a third centre.",
                                words, which, minimumWords(s), testWords)
                        : String.format(Locale.ROOT, "%s; the %s interval lies entirely beyond the minimum shift (%s) and %s.",
                                words, which, minimumWords(s), testWords));
            } else if (surface || volume) {
                who.forEach(g -> flags.put(g, FLAG_UNCERTAIN));
                uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the interval lies beyond the minimum shift (%s) but %s, so the evidence disagrees.",
                        words, minimumWords(s), testWords));
            } else if (volumeAlone) {
                who.forEach(g -> flags.put(g, FLAG_UNCERTAIN));
                uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the volume interval lies beyond %.0f%% but the surface distance does not move the same "
                                + "way with confidence, so the volume difference alone does not flag the centre "
                                + "(a volume ratio moves far more than the boundary on small structures); look at "
                                + "the masks.", words, s.minimumVolumeShiftPercent()));
            } else if (uncertain) {
                who.forEach(g -> flags.put(g, FLAG_UNCERTAIN));
                uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the interval excludes no shift and reaches past the minimum shift (%s) without "
                                + "lying beyond it, so the size of the shift is uncertain.", words, minimumWords(s)));
            } else {
                who.forEach(g -> flags.put(g, FLAG_NONE));
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
        centres.stream().map(GroupEffect::group).sorted().forEach(g -> sortedFlags.put(g, flags.getOrDefault(g, FLAG_NONE)));
        return new Decision(verdict, rule, reasons, flagged, sortedFlags);
    }

    /**
     * Whether the signed-surface interval excludes 0 on the side the volume interval points to:
     * the volume criterion counts only when the boundary moves the same way.
     */
    static boolean surfaceSameWay(GroupEffect e) {
        return e.volumeRatioLo() > 1 && e.signedSurfaceLoMm() > 0 || e.volumeRatioHi() < 1 && e.signedSurfaceHiMm() < 0;
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
