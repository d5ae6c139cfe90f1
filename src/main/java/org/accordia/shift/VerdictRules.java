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
    /** A centre's masks are all empty for a structure the others draw: no pooling verdict while it stands. */
    public static final String EMPTY_CENTRE = "empty-centre";
    /** A reader's masks are all empty for a structure the others draw. */
    public static final String EMPTY_READER = "empty-reader";
    /** One centre only: a between-centre shift is not testable (pool level when nothing else fires). */
    public static final String SINGLE_CENTRE = "single-centre";

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
            Map<String, String> centreFlags, List<DesignLimit> designLimits, List<EmptyGroup> emptyGroups) {
        public Decision {
            reasons = List.copyOf(reasons);
            flaggedCentres = List.copyOf(flaggedCentres);
            centreFlags = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(centreFlags));
            designLimits = List.copyOf(designLimits);
            emptyGroups = List.copyOf(emptyGroups);
        }
    }

    /**
     * What the decision needs beyond the test and the effects.
     *
     * @param designLimits   what the roster cannot answer ({@link DesignLimits})
     * @param emptyGroups    centres or readers whose masks are all empty ({@link EmptyGroups})
     * @param localEffects   the centres' shares of border beyond tolerance ({@link LocalEffects});
     *                       empty when not computed
     * @param masksToCorrect masks a reader should correct (reported, not a rule of their own)
     */
    public record Context(List<DesignLimit> designLimits, List<EmptyGroup> emptyGroups,
            List<LocalEffect> localEffects, int masksToCorrect) {
        public Context {
            designLimits = List.copyOf(designLimits);
            emptyGroups = List.copyOf(emptyGroups);
            localEffects = List.copyOf(localEffects);
        }

        /** Nothing beyond the test and the effects. */
        public static Context none() {
            return new Context(List.of(), List.of(), List.of(), 0);
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
        return decide(test, centres, offsets, casesToAdjudicate, totalCases, readers, s, Context.none());
    }

    /** The decision with the design limits, empty groups and local effects of {@code ctx}. */
    public static Decision decide(PermutationResult test, List<GroupEffect> centres, List<GroupEffect> offsets,
            int casesToAdjudicate, int totalCases, List<ReaderToRecalibrate> readers, ShiftSettings s, Context ctx) {
        boolean withheld = !ctx.emptyGroups().isEmpty();
        boolean significant = !withheld && test.canReachAlpha() && test.pValue() <= s.alpha();
        Map<String, LocalEffect> localOf = new LinkedHashMap<>();
        ctx.localEffects().forEach(l -> localOf.put(l.centre(), l));
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
            LocalEffect local = localOf.get(e.group());
            boolean localBeyond = local != null && local.beyond(LocalEffects.MINIMUM_EXCESS);
            String words;
            List<String> who;
            if (pair) {
                String other = usable.stream().map(GroupEffect::group).filter(g -> !g.equals(e.group()))
                        .findFirst().orElseThrow();
                who = List.of(e.group(), other);
                words = "Centres " + e.group() + " and " + other + " differ from each other: " + e.group() + " "
                        + e.describe("centre " + other, s.minimumShiftMm(), s.minimumVolumeShiftPercent());
            } else if (centred) {
                who = List.of(e.group());
                words = "Centre " + e.group() + " " + e.describe("the typical centre", s.minimumShiftMm(),
                        s.minimumVolumeShiftPercent())
                        + " (the other centres' consensus includes this centre's own shift, so the comparison is"
                        + " re-centred on the median centre; against the other centres' consensus it "
                        + rawOf.get(e.group()).describe("them") + ")";
            } else {
                who = List.of(e.group());
                words = "Centre " + e.group() + " " + e.describe("the other centres", s.minimumShiftMm(),
                        s.minimumVolumeShiftPercent());
            }
            String which = surface && volume ? "surface and volume" : surface ? "surface"
                    : "volume (with the surface interval on the same side of 0)";
            if (withheld) {
                who.forEach(g -> flags.put(g, FLAG_NONE));
                continue;
            }
            if (localBeyond && !surface && !volume) {
                String localWords = localWords(local, pair ? "centre " + who.get(1) : "the typical centre");
                if (significant) {
                    for (String g : who) {
                        flagged.add(g);
                        flags.put(g, pair ? FLAG_PAIR : FLAG_SHIFT);
                    }
                    String subject = pair ? "Centres " + who.get(0) + " and " + who.get(1) + " differ on one side "
                            + "of the structure: centre " + who.get(0) : "Centre " + who.get(0);
                    shiftReasons.add(String.format(Locale.ROOT, "%s: %s; the excess interval lies entirely above the "
                            + "minimum (%s points) and %s. The mean distance and the volume dilute a difference on "
                            + "one side of the structure; the report shows where the centre differs.", subject,
                            localWords, Wording.plain(100 * LocalEffects.MINIMUM_EXCESS, 3), testWords));
                } else {
                    who.forEach(g -> flags.put(g, FLAG_UNCERTAIN));
                    uncertainReasons.add(String.format(Locale.ROOT, "Centre %s: %s; the excess interval lies entirely "
                            + "above the minimum (%s points), but %s.", who.get(0), localWords,
                            Wording.plain(100 * LocalEffects.MINIMUM_EXCESS, 3), test.canReachAlpha()
                                    ? testWords + ", so the evidence disagrees"
                                    : "this design cannot confirm it with the permutation test (" + testWords + ")"));
                }
                if (e.pointBeyond(s.minimumShiftMm(), s.minimumVolumeShiftPercent())) {
                    pointLarge.add(words);
                }
                continue;
            }
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
                String beyond = surface && volume ? "surface and volume intervals lie"
                        : surface ? "surface interval lies" : "volume interval lies (with the surface interval on the same side of 0)";
                uncertainReasons.add(test.canReachAlpha()
                        ? String.format(Locale.ROOT, "%s; the %s beyond the minimum shift (%s) but %s, so the evidence "
                                + "disagrees.", words, beyond, minimumWords(s), testWords)
                        : String.format(Locale.ROOT, "%s; the %s beyond the minimum shift (%s), but this design "
                                + "cannot confirm it with the permutation test (%s).", words, beyond, minimumWords(s),
                                testWords));
            } else if (volumeAlone) {
                who.forEach(g -> flags.put(g, FLAG_UNCERTAIN));
                uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the volume interval lies beyond %s%% but the surface distance does not move the same "
                                + "way with confidence, so the volume difference alone does not flag the centre "
                                + "(a volume ratio moves far more than the boundary on small structures); look at "
                                + "the masks.", words, Wording.plain(s.minimumVolumeShiftPercent(), 3)));
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
        if (withheld) {
            verdict = Verdict.REVIEW;
            boolean centre = ctx.emptyGroups().stream().anyMatch(g -> g.level() == EmptyGroup.Level.CENTRE);
            rule = centre ? EMPTY_CENTRE : EMPTY_READER;
            for (EmptyGroup g : ctx.emptyGroups()) {
                reasons.add(emptyWords(g));
            }
            reasons.add("No pooling verdict is given while this stands: the between-centre comparison is withheld "
                    + "until the empty masks are explained (a label convention, a wrong export, or a structure this "
                    + "group was not asked to draw), and these readers are left out of the cases to adjudicate.");
        }
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
        if (!withheld && !test.canReachAlpha() && !Double.isNaN(test.pValue()) && !pointLarge.isEmpty()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? DESIGN_CANNOT_REACH_ALPHA : rule;
            reasons.add("The point estimate exceeds the minimum shift for: " + String.join("; ", pointLarge)
                    + "; this design cannot reach " + Wording.alpha(s.alpha()) + " (smallest reachable p = "
                    + Wording.plain(test.minP(), 3) + "), so the test cannot confirm it.");
        }
        if (totalCases > 0 && (double) casesToAdjudicate / totalCases > s.adjudicationShare()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? MANY_CASES_TO_ADJUDICATE : rule;
            double share = 100.0 * casesToAdjudicate / totalCases;
            reasons.add(String.format(Locale.ROOT, "%d of %d cases (%s%%) need adjudication, more than %s%%.",
                    casesToAdjudicate, totalCases, Wording.beside(share, 0, 100 * s.adjudicationShare()),
                    Wording.threshold(100 * s.adjudicationShare(), share, 0)));
        }
        if (!readers.isEmpty()) {
            verdict = max(verdict, Verdict.REVIEW);
            rule = rule == null ? READERS_TO_RECALIBRATE : rule;
            List<String> names = readers.stream().map(r -> r.reader() + " (" + r.centre() + ")").toList();
            reasons.add(readers.size() + " reader" + (readers.size() == 1 ? " needs" : "s need") + " recalibration: "
                    + String.join(", ", names) + ".");
        }
        boolean single = ctx.designLimits().stream().anyMatch(l -> l.kind() == DesignLimitation.SINGLE_CENTRE);
        if (single && !withheld) {
            String words = "Single centre: a between-centre shift is not testable; the decision rests on the "
                    + "readers' agreement within the centre.";
            if (rule == null) {
                rule = SINGLE_CENTRE;
                reasons.add(0, String.format(Locale.ROOT, "%s %d of %d cases need adjudication and no reader needs "
                        + "recalibration.", words, casesToAdjudicate, totalCases));
            } else {
                reasons.add(words);
            }
        }
        if (rule == null) {
            rule = NO_SHIFT;
            reasons.add(0, String.format(Locale.ROOT,
                    "No centre shift: %s, no centre's interval reaches the minimum shift, %d of %d cases need "
                            + "adjudication and no reader needs recalibration.",
                    testWords, casesToAdjudicate, totalCases));
        }
        if (ctx.masksToCorrect() > 0) {
            reasons.add(ctx.masksToCorrect() + " mask" + (ctx.masksToCorrect() == 1 ? "" : "s")
                    + " should be corrected by " + (ctx.masksToCorrect() == 1 ? "its reader" : "their readers")
                    + " (a part left out, or an empty mask where every other reader draws the structure); they are "
                    + "listed apart and do not count as cases to adjudicate.");
        }
        flagged.sort(null);
        Map<String, String> sortedFlags = new LinkedHashMap<>();
        centres.stream().map(GroupEffect::group).sorted().forEach(g -> sortedFlags.put(g, flags.getOrDefault(g, FLAG_NONE)));
        return new Decision(verdict, rule, reasons, flagged, sortedFlags, ctx.designLimits(), ctx.emptyGroups());
    }

    /** "23% [15%, 31%] of its border lies more than 2 mm outside ..., 18 points [10, 26] more than ...". */
    static String localWords(LocalEffect l, String typical) {
        boolean outside = l.outsideSide();
        double share = outside ? l.outsideShare() : l.insideShare();
        double ex = outside ? l.outsideExcess() : l.insideExcess();
        double lo = outside ? l.outsideExcessLo() : l.insideExcessLo();
        double hi = outside ? l.outsideExcessHi() : l.insideExcessHi();
        double m = 100 * LocalEffects.MINIMUM_EXCESS;
        String where = "";
        int d = l.mainDirection();
        if (outside && d >= 0) {
            where = String.format(Locale.ROOT, "; most on the %s side (%s%% of the border there)",
                    org.accordia.consensus.BorderProfile.DIRECTION_NAMES.get(d),
                    Wording.beside(100 * l.outsideByDirection().get(d), 0));
        }
        return String.format(Locale.ROOT, "%s%% of its readers' border lies more than %s mm %s the other centres' "
                + "consensus, %s points [%s, %s] more than %s%s", Wording.beside(100 * share, 0),
                Wording.plain(l.toleranceMm(), 3), outside ? "outside" : "inside", Wording.beside(100 * ex, 0, m),
                Wording.beside(100 * lo, 0, 0, m), Wording.beside(100 * hi, 0, 0, m), typical, where);
    }

    /** "Centre norvale: all 30 masks are empty for this structure ...; labels 5, 6 occur only there — ...". */
    static String emptyWords(EmptyGroup g) {
        String who = g.level() == EmptyGroup.Level.CENTRE ? "Centre " + g.group() : "Reader " + g.group() + " ("
                + g.centre() + ")";
        String labels = g.labelsOnlyHere().isEmpty() ? ""
                : String.format(Locale.ROOT, "; label%s %s occur%s only %s — a label convention?",
                        g.labelsOnlyHere().size() == 1 ? "" : "s",
                        String.join(" and ", g.labelsOnlyHere().stream().map(String::valueOf).toList()),
                        g.labelsOnlyHere().size() == 1 ? "s" : "",
                        g.level() == EmptyGroup.Level.CENTRE ? "at centre " + g.group() : "in reader " + g.group()
                                + "'s masks");
        return String.format(Locale.ROOT, "%s: all %d mask%s empty for this structure, which most other readers draw "
                + "on %d of %s cases%s", who, g.masks(), g.masks() == 1 ? " is" : "s are", g.othersDraw(),
                g.level() == EmptyGroup.Level.CENTRE ? "its" : "the reader's", labels.isEmpty() ? "." : labels);
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
        return Wording.plain(s.minimumShiftMm(), 3) + " mm or " + Wording.plain(s.minimumVolumeShiftPercent(), 3)
                + "% volume";
    }

    static String testWords(PermutationResult t, ShiftSettings s) {
        if (Double.isNaN(t.pValue())) {
            return "the permutation test is not applicable";
        }
        String pseudoF = "pseudo-F " + Wording.plain(t.pseudoF(), 3);
        if (!t.canReachAlpha()) {
            return String.format(Locale.ROOT, "the permutation test gives %s; %s; the design cannot reach %s",
                    Wording.pValue(t), pseudoF, Wording.alpha(s.alpha()));
        }
        String relation = t.pValue() <= s.alpha() ? "at most" : "above";
        return String.format(Locale.ROOT, "the permutation test gives %s, %s %s; %s", Wording.pValue(t), relation,
                Wording.alpha(s.alpha()), pseudoF);
    }
}
