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
 * <li>{@code empty-centre} / {@code empty-reader} → review: a centre's (reader's) masks are all
 * empty for a structure the others draw ({@link EmptyGroups}); no centre is judged and no pooling
 * verdict is given while it stands.</li>
 * <li>{@code centre-shift} → re-annotate: at least one centre is flagged (G ≥ 3); a centre's
 * effect is beyond the minimum through its surface or supported volume interval, or through the
 * share of its border beyond the structure's tolerance ({@link LocalEffects});
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
 * <li>{@code single-centre} → pool level: one centre, so a shift is not testable, and none of the
 * above fired (the report's headline says "single centre: shift not testable").</li>
 * <li>{@code no-shift} → pool: none of the above.</li>
 * </ol>
 * The design limitations ({@link DesignLimits}) travel with the decision as typed values; the report
 * gives each its plain sentence. Masks a reader should correct are counted in a sentence and never
 * raise the verdict by themselves.
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
        return decide(test, centres, casesToAdjudicate, totalCases, readers, s, Context.none());
    }

    /** The decision with the design limits, empty groups and masks to correct of {@code ctx}. */
    public static Decision decide(PermutationResult test, CentreFindings.Result centres, int casesToAdjudicate,
            int totalCases, List<ReaderToRecalibrate> readers, ShiftSettings s, Context ctx) {
        boolean withheld = !ctx.emptyGroups().isEmpty();
        if (withheld) {
            centres = centres.withheld();
        }
        boolean significant = !withheld && test.canReachAlpha() && test.pValue() <= s.alpha();
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
                            + e.describe("centre " + f.partner(), s.minimumShiftMm(), s.minimumVolumeShiftPercent())
                    : "Centre " + f.centre() + " " + e.describe("the other centres", s.minimumShiftMm(),
                            s.minimumVolumeShiftPercent());
            String own = ownTestWords(f.test(), pair, s);
            String which = f.surfaceBeyond() && f.volumeSupported() ? "surface and volume intervals lie" : f.surfaceBeyond()
                    ? "surface interval lies" : "volume interval, with the surface interval on the same side of 0, lies";
            boolean localOnly = f.localBeyond() && !f.surfaceBeyond() && !f.volumeSupported();
            if (localOnly && f.kind() != CentreFindings.Kind.NONE) {
                String subject = pair ? "Centres " + f.centre() + " and " + f.partner() + " differ on one side of the "
                        + "structure: centre " + f.centre() : "Centre " + f.centre();
                String local = localWords(f.local(), pair ? "centre " + f.partner() : "the typical centre");
                String minimum = Wording.plain(100 * LocalEffects.MINIMUM_EXCESS, 3);
                if (f.kind().flagged()) {
                    shiftReasons.add(String.format(Locale.ROOT, "%s: %s; the excess interval lies entirely above the "
                            + "minimum (%s points) and %s. The mean distance and the volume dilute a difference on one "
                            + "side of the structure; the report shows where the centre differs.", subject, local,
                            minimum, own));
                } else if (f.kind() == CentreFindings.Kind.EVIDENCE_DISAGREES) {
                    uncertainReasons.add(String.format(Locale.ROOT, "%s: %s; the excess interval lies entirely above "
                            + "the minimum (%s points), but %s.", subject, local, minimum, disagree(f, own)));
                }
                if (e.pointBeyond(s.minimumShiftMm(), s.minimumVolumeShiftPercent())) {
                    pointLarge.add(words);
                }
                continue;
            }
            String beyond = f.surfaceBeyond() && f.volumeSupported() ? "surface and volume intervals lie"
                    : f.surfaceBeyond() ? "surface interval lies"
                    : "volume interval, with the surface interval on the same side of 0, lies";
            switch (f.kind()) {
                case SHIFT -> shiftReasons.add(String.format(Locale.ROOT,
                        "%s; the %s entirely beyond the minimum shift (%s) and %s.", words, which,
                        minimumWords(s), own));
                case PAIR_DIFFERS -> shiftReasons.add(String.format(Locale.ROOT,
                        "%s; the %s entirely beyond the minimum shift (%s) and %s. With only two "
                                + "centres each is measured against the other, so the data cannot tell which "
                                + "centre departs from the common way of drawing: both are flagged as a pair. "
                                + "Settle it against the written protocol or a reading from a third centre.",
                        words, which, minimumWords(s), own));
                case EVIDENCE_DISAGREES -> uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; the %s beyond the minimum shift (%s), but %s.", words, beyond, minimumWords(s),
                        disagree(f, own)));
                case VOLUME_WITHOUT_SURFACE -> uncertainReasons.add(String.format(Locale.ROOT,
                        "%s; %s, and the volume interval lies beyond %s%%, but the surface distance does not move "
                                + "the same way with confidence, so the volume difference alone does not flag the "
                                + "centre (a volume ratio moves far more than the boundary on small structures); "
                                + "look at the masks.", words, own, Wording.plain(s.minimumVolumeShiftPercent(), 3)));
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
        return new Decision(verdict, rule, reasons, flagged, centres.flags(), ctx.designLimits(), ctx.emptyGroups());
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

    /** Why an interval beyond the minimum does not flag: the own test, or the design. */
    private static String disagree(CentreFindings.Finding f, String own) {
        return f.test() != null && !f.test().canReachAlpha()
                ? "this design cannot confirm it with the centre's own test (" + own + ")"
                : own + ", so the evidence disagrees";
    }

    private static Verdict max(Verdict a, Verdict b) {
        return a.ordinal() >= b.ordinal() ? a : b;
    }

    private static String minimumWords(ShiftSettings s) {
        return Wording.plain(s.minimumShiftMm(), 3) + " mm or " + Wording.plain(s.minimumVolumeShiftPercent(), 3)
                + "% volume";
    }

    /** The centre's own test in words, e.g. "its own test against the other centres' readers gives p = ...". */
    static String ownTestWords(CentreVsRest.Result t, boolean pair, ShiftSettings s) {
        if (t == null || Double.isNaN(t.pValue())) {
            return "its own test is not applicable";
        }
        String p = Wording.pValue(t.pValue(), t.permutations(), t.exact(), "distinct reader splits",
                "random reader splits");
        String against = pair ? "the test of the pair" : "its own test against the other centres' readers";
        String adjusted = pair ? "" : ", Holm-adjusted " + Wording.plain(t.adjustedP(), 3);
        if (!t.canReachAlpha()) {
            return pair
                    ? String.format(Locale.ROOT, "%s gives %s, and cannot reach %s (smallest reachable p = %s)",
                            against, p, Wording.alpha(s.alpha()), Wording.plain(t.minP(), 3))
                    : String.format(Locale.ROOT, "%s gives %s%s, and cannot reach %s once adjusted for testing every "
                            + "centre (Holm)", against, p, adjusted, Wording.alpha(s.alpha()));
        }
        return String.format(Locale.ROOT, "%s gives %s%s, %s %s", against, p, adjusted,
                t.rejects(s.alpha()) ? "at most" : "above", Wording.alpha(s.alpha()));
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
