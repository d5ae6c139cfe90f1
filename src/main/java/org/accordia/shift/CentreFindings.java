package org.accordia.shift;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The centre-flag decision: each centre's finding from evidence about that centre.
 *
 * <p>A centre is flagged ({@link Kind#SHIFT}) only when BOTH its own centre-vs-rest test rejects
 * after the family-wise adjustment ({@link CentreVsRest}, Holm) AND its effect Δ_c
 * ({@link CentreContrasts}) lies beyond the protocol minimum: the signed-surface interval entirely
 * beyond ±minimumShiftMm, or the volume-ratio interval entirely beyond 1 ± minimumVolumeShiftPercent
 * <em>with</em> the signed-surface interval excluding 0 on the same side (volume evidence needs
 * surface evidence on the same side: on small structures a sub-millimetre margin change already
 * moves the volume by 15 % and more).
 *
 * <p>With two centres the two splits are one partition and Δ_1 = −Δ_2: the pair is judged once
 * (through the first centre by name) and both centres get the same finding
 * ({@link Kind#PAIR_DIFFERS} when it passes: the pair differs, the data cannot say which one
 * departs). With one centre nothing is compared.
 *
 * <p>Other findings, each a reason for review, never a flag: {@link Kind#EVIDENCE_DISAGREES} (the
 * interval lies beyond the minimum but the own test does not reject); and, only when the own test
 * rejects, {@link Kind#VOLUME_WITHOUT_SURFACE} (the volume interval is beyond the minimum but the
 * surface does not move the same way), {@link Kind#SIZE_UNCERTAIN} (the interval reaches past the
 * minimum without lying beyond it) and {@link Kind#NEGLIGIBLE} (the effect is within the
 * minimum); {@link Kind#NONE} otherwise. An interval that merely excludes 0 is not evidence about
 * the centre: it is an unadjusted 95 % statement per centre (under no shift one of G centres
 * excludes 0 in up to G × 5 % of studies), so without the own test it does not make a review
 * finding. Δ_c contains the mirror of another centre's shift by definition (one
 * of G centres drawing Δ wider gives the others −Δ/(G−1)), so when a centre is flagged, a
 * review finding of the opposite direction at an unflagged centre is the mirror and is dropped
 * ({@link Kind#NONE}): the centre's own test, not its contrast, speaks for it.
 */
public final class CentreFindings {
    private CentreFindings() {
    }

    /** What the evidence says about one centre. */
    public enum Kind {
        /** Own adjusted test rejects and the effect is beyond the minimum. */
        SHIFT("shift", VerdictRules.FLAG_SHIFT),
        /** Two centres: the pair's test rejects and the difference is beyond the minimum. */
        PAIR_DIFFERS("pair-differs", VerdictRules.FLAG_PAIR),
        /** Own test rejects; the volume passes the minimum without the surface moving the same way. */
        VOLUME_WITHOUT_SURFACE("volume-without-surface", VerdictRules.FLAG_UNCERTAIN),
        /** Own test rejects; the interval excludes no shift and crosses the minimum. */
        SIZE_UNCERTAIN("size-uncertain", VerdictRules.FLAG_UNCERTAIN),
        /** The interval is beyond the minimum but the own test does not reject. */
        EVIDENCE_DISAGREES("evidence-disagrees", VerdictRules.FLAG_UNCERTAIN),
        /** Own test rejects; the effect is within the minimum. */
        NEGLIGIBLE("negligible", VerdictRules.FLAG_NONE),
        /** Nothing to report. */
        NONE("none", VerdictRules.FLAG_NONE);

        private final String key;
        private final String flag;

        Kind(String key, String flag) {
            this.key = key;
            this.flag = flag;
        }

        /** Stable key (for tests and machine-readable output). */
        public String key() {
            return key;
        }

        /** The value of the {@code flag} column of centres.csv. */
        public String flag() {
            return flag;
        }

        public boolean flagged() {
            return this == SHIFT || this == PAIR_DIFFERS;
        }
    }

    /**
     * One centre's finding.
     *
     * @param centre          centre name
     * @param kind            the finding
     * @param effect          the judged effect: Δ_c (for a pair, the first centre's Δ, the full difference)
     * @param test            the centre's own test (null when the centre had no usable reader)
     * @param partner         the other centre of a two-centre study, else null
     * @param surfaceBeyond   the signed-surface interval lies beyond ±minimum
     * @param volumeBeyond    the volume interval lies beyond 1 ± minimum
     * @param volumeSupported volumeBeyond and the surface interval excludes 0 on the same side
     * @param local           the centre's share of border beyond tolerance (null when not computed)
     * @param localBeyond     its excess interval lies entirely above {@link LocalEffects#MINIMUM_EXCESS}
     */
    public record Finding(String centre, Kind kind, GroupEffect effect, CentreVsRest.Result test, String partner,
            boolean surfaceBeyond, boolean volumeBeyond, boolean volumeSupported, LocalEffect local,
            boolean localBeyond) {
        /** A finding without the local measure. */
        public Finding(String centre, Kind kind, GroupEffect effect, CentreVsRest.Result test, String partner,
                boolean surfaceBeyond, boolean volumeBeyond, boolean volumeSupported) {
            this(centre, kind, effect, test, partner, surfaceBeyond, volumeBeyond, volumeSupported, null, false);
        }
    }

    /**
     * @param findings  one per centre, sorted by name
     * @param pair      whether the study has exactly two centres with a usable effect
     * @param method    how the family-wise error rate is controlled, in words
     */
    public record Result(List<Finding> findings, boolean pair, String method) {
        public Result {
            findings = List.copyOf(findings);
        }

        /** Flagged centres, sorted by name. */
        public List<String> flagged() {
            return findings.stream().filter(f -> f.kind().flagged()).map(Finding::centre).sorted().toList();
        }

        /** centre → flag value for centres.csv, sorted by name. */
        public Map<String, String> flags() {
            Map<String, String> m = new LinkedHashMap<>();
            findings.forEach(f -> m.put(f.centre(), f.kind().flag()));
            return m;
        }

        public Finding of(String centre) {
            return findings.stream().filter(f -> f.centre().equals(centre)).findFirst().orElse(null);
        }

        /** The same findings with every kind {@link Kind#NONE}: no centre is judged (an all-empty group). */
        public Result withheld() {
            return new Result(findings.stream().map(f -> with(f, Kind.NONE)).toList(), pair, method);
        }
    }

    /**
     * @param tests      each centre's own test ({@link CentreVsRest#test})
     * @param effects    each centre's Δ_c ({@link CentreContrasts})
     * @param s          α and the minimum effects
     */
    public static Result judge(List<CentreVsRest.Result> tests, List<GroupEffect> effects, ShiftSettings s) {
        return judge(tests, effects, List.of(), s);
    }

    /**
     * As {@link #judge(List, List, ShiftSettings)}, with the centres' shares of border beyond the
     * structure's tolerance ({@link LocalEffects}): a centre whose excess interval lies entirely above
     * {@link LocalEffects#MINIMUM_EXCESS} counts as beyond the minimum like a surface or supported
     * volume interval (a part added or left out on one side, which the mean distance and the volume
     * dilute); {@link Finding#localBeyond()} says so.
     */
    public static Result judge(List<CentreVsRest.Result> tests, List<GroupEffect> effects, List<LocalEffect> local,
            ShiftSettings s) {
        Map<String, LocalEffect> localOf = new LinkedHashMap<>();
        local.forEach(l -> localOf.put(l.centre(), l));
        Map<String, CentreVsRest.Result> testOf = new LinkedHashMap<>();
        tests.forEach(t -> testOf.put(t.centre(), t));
        List<GroupEffect> usable = effects.stream()
                .filter(e -> Double.isFinite(e.signedSurfaceMm()) || Double.isFinite(e.volumeRatio()))
                .sorted(Comparator.comparing(GroupEffect::group)).toList();
        boolean pair = usable.size() == 2;
        List<Finding> out = new ArrayList<>();
        if (usable.size() < 2) {
            for (GroupEffect e : effects) {
                out.add(new Finding(e.group(), Kind.NONE, e, testOf.get(e.group()), null, false, false, false,
                        localOf.get(e.group()), false));
            }
            out.sort(Comparator.comparing(Finding::centre));
            return new Result(out, false, CentreVsRest.method(usable.size()));
        }
        List<Finding> judged = new ArrayList<>();
        for (GroupEffect e : pair ? usable.subList(0, 1) : usable) {
            CentreVsRest.Result t = testOf.get(e.group());
            boolean rejects = t != null && t.rejects(s.alpha());
            boolean surface = e.surfaceBeyond(s.minimumShiftMm());
            boolean volumeBeyond = e.volumeBeyond(s.minimumVolumeShiftPercent());
            boolean volume = volumeBeyond && surfaceSameWay(e);
            boolean volumeAlone = volumeBeyond && !volume && !surface;
            boolean crosses = e.crossesMinimum(s.minimumShiftMm(), s.minimumVolumeShiftPercent());
            LocalEffect l = localOf.get(e.group());
            boolean localBeyond = l != null && l.beyond(LocalEffects.MINIMUM_EXCESS);
            Kind kind;
            if (rejects && (surface || volume || localBeyond)) {
                kind = pair ? Kind.PAIR_DIFFERS : Kind.SHIFT;
            } else if (surface || volume || localBeyond) {
                kind = Kind.EVIDENCE_DISAGREES;
            } else if (rejects && volumeAlone) {
                kind = Kind.VOLUME_WITHOUT_SURFACE;
            } else if (rejects && crosses) {
                kind = Kind.SIZE_UNCERTAIN;
            } else if (rejects) {
                kind = Kind.NEGLIGIBLE;
            } else {
                kind = Kind.NONE;
            }
            judged.add(new Finding(e.group(), kind, e, t, pair ? usable.get(1).group() : null, surface, volumeBeyond,
                    volume, l, localBeyond));
        }
        // a flagged centre's shift shows at every other centre as a mirror of opposite sign (Δ_c is a
        // contrast with the others' mean): such findings at unflagged centres say nothing of their own
        double flaggedSign = 0;
        for (Finding f : judged) {
            if (f.kind().flagged()) {
                flaggedSign += Math.signum(direction(f.effect()));
            }
        }
        for (Finding f : judged) {
            boolean mirror = !f.kind().flagged() && f.kind().flag().equals(VerdictRules.FLAG_UNCERTAIN)
                    && flaggedSign != 0 && Math.signum(direction(f.effect())) == -Math.signum(flaggedSign);
            Finding g = mirror ? with(f, Kind.NONE) : f;
            out.add(g);
            if (pair) {
                GroupEffect other = usable.get(1);
                out.add(new Finding(other.group(), g.kind(), g.effect(), testOf.get(other.group()), g.centre(),
                        g.surfaceBeyond(), g.volumeBeyond(), g.volumeSupported(), g.local(), g.localBeyond()));
            }
        }
        for (GroupEffect e : effects) {
            if (out.stream().noneMatch(f -> f.centre().equals(e.group()))) {
                out.add(new Finding(e.group(), Kind.NONE, e, testOf.get(e.group()), null, false, false, false,
                        localOf.get(e.group()), false));
            }
        }
        out.sort(Comparator.comparing(Finding::centre));
        return new Result(out, pair, CentreVsRest.method(usable.size()));
    }

    /** The effect's direction: the signed surface, else the log volume ratio. */
    private static double direction(GroupEffect e) {
        return Double.isFinite(e.signedSurfaceMm()) ? e.signedSurfaceMm() : Math.log(e.volumeRatio());
    }

    private static Finding with(Finding f, Kind kind) {
        return new Finding(f.centre(), kind, f.effect(), f.test(), f.partner(), f.surfaceBeyond(), f.volumeBeyond(),
                f.volumeSupported(), f.local(), f.localBeyond());
    }

    /**
     * Whether the signed-surface interval excludes 0 on the side the volume interval points to:
     * the volume criterion counts only when the boundary moves the same way.
     */
    static boolean surfaceSameWay(GroupEffect e) {
        return e.volumeRatioLo() > 1 && e.signedSurfaceLoMm() > 0 || e.volumeRatioHi() < 1 && e.signedSurfaceHiMm() < 0;
    }
}
