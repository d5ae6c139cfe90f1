package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The rule table of {@link VerdictRules} and {@link CentreFindings} (our own documented rules;
 * defaults of ShiftSettings). The first centre's own test gets the row's p (Holm-adjusted p = p,
 * smallest p = minP); the other centres' tests give 0.5.
 */
class VerdictRulesTest {
    static final ShiftSettings S = ShiftSettings.defaults();

    static PermutationResult test(double p, double minP) {
        return new PermutationResult(4.2, p, 280, true, minP, minP <= 0.05,
                minP <= 0.05 ? "" : "With readers per centre (a: 2, b: 2) ... cannot show a centre effect ...");
    }

    /** The findings with {@code first}'s own test at p (adjusted p) and every other centre at 0.5. */
    static CentreFindings.Result findings(List<GroupEffect> effects, String first, double p, double minP) {
        List<CentreVsRest.Result> tests = effects.stream().map(e -> e.group().equals(first)
                ? new CentreVsRest.Result(e.group(), 3, 9.0, p, p, 84, true, minP, minP * 3 <= 0.05,
                        minP * 3 <= 0.05 && p <= 0.05)
                : new CentreVsRest.Result(e.group(), 3, 1.0, 0.5, 0.5, 84, true, minP, minP * 3 <= 0.05, false)).toList();
        return CentreFindings.judge(tests, effects, S);
    }

    static GroupEffect centre(String name, double mm, double lo, double hi) {
        return new GroupEffect(name, name, 3, 12, mm, lo, hi, 1.0, 0.95, 1.05);
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({
        // description,                      p,     minP,   mm,   lo,   hi,  adjudicate, recal, verdict,     rule
        "'large, supported shift',            0.004, 0.0036, 1.4,  1.1,  1.7,  0, false, re-annotate, centre-shift",
        "'large shift inside',                0.004, 0.0036, -1.4, -1.7, -1.1, 0, false, re-annotate, centre-shift",
        "'significant, small effect',         0.004, 0.0036, 0.3,  0.1,  0.5,  0, false, review,      significant-but-small",
        "'crosses minimum, own test rejects', 0.004, 0.0036, 0.9,  0.4,  1.4,  0, false, review,      significant-but-small",
        "'crosses minimum, no own evidence',  0.30,  0.0036, 0.9,  0.4,  1.4,  0, false, pool,        no-shift",
        "'beyond minimum, test not signif.',  0.30,  0.0036, 1.6,  1.2,  2.0,  0, false, review,      uncertain-centre-effect",
        "'design cannot reach alpha',         0.333, 0.3333, 1.5,  -0.2, 3.2,  0, false, review,      design-cannot-reach-alpha",
        "'design cannot reach, small effect', 0.333, 0.3333, 0.2,  -0.2, 0.6,  0, false, pool,        no-shift",
        "'many cases to adjudicate',          0.30,  0.0036, 0.1,  -0.3, 0.5,  5, false, review,      many-cases-to-adjudicate",
        "'at the share limit',                0.30,  0.0036, 0.1,  -0.3, 0.5,  4, false, pool,        no-shift",
        "'reader to recalibrate',             0.30,  0.0036, 0.1,  -0.3, 0.5,  0, true,  review,      readers-to-recalibrate",
        "'negligible but detectable',         0.30,  0.0036, 0.3,  0.2,  0.4,  0, false, pool,        no-shift",
        "'nothing',                           0.30,  0.0036, 0.1,  -0.3, 0.5,  0, false, pool,        no-shift",
    })
    void ruleTable(String description, double p, double minP, double mm, double lo, double hi, int adjudicate,
            boolean recalibrate, String verdict, String rule) {
        List<GroupEffect> centres = List.of(centre("north", mm, lo, hi), centre("south", 0.0, -0.3, 0.3),
                centre("west", 0.0, -0.3, 0.3));
        List<ReaderToRecalibrate> readers = recalibrate
                ? List.of(new ReaderToRecalibrate("r7", "south", List.of("draws 2.0 mm [1.5, 2.5] outside")))
                : List.of();
        VerdictRules.Decision d = VerdictRules.decide(test(p, minP), findings(centres, "north", p, minP), adjudicate, 20,
                readers, S);
        assertEquals(verdict, d.verdict().word(), description + ": " + d.reasons());
        assertEquals(rule, d.rule(), description);
        assertTrue(!d.reasons().isEmpty());
        if (rule.equals("centre-shift")) {
            assertEquals(List.of("north"), d.flaggedCentres());
            assertEquals("shift", d.centreFlags().get("north"));
            assertTrue(d.reasons().get(0).startsWith("Centre north draws 1.4 mm [1.1, 1.7] " + (mm > 0 ? "outside" : "inside")),
                    d.reasons().get(0));
        } else {
            assertTrue(d.flaggedCentres().isEmpty());
        }
        if (minP > 0.05) {
            assertTrue(d.reasons().stream().anyMatch(r -> r.contains("cannot reach α = 0.05")), d.reasons().toString());
        }
    }

    /**
     * The volume minimum counts only with the surface moving the same way. The first two rows
     * used to read "surface 0.1 [-0.2, 0.4], volume beyond 15 % -> shift": that encoded the defect
     * (a volume ratio alone passes 15 % with a sub-millimetre margin change on small structures),
     * so they now expect {@code uncertain}; with a surface interval on the same side they flag.
     */
    @ParameterizedTest(name = "surface [{0}, {1}], volume {2} [{3}, {4}] -> {5}")
    @CsvSource({
        // surface lo, hi,  ratio, lo,   hi,   flag
        "0.2,  0.6,  1.25, 1.18, 1.33, shift",       // volume beyond, boundary outside: supported
        "-0.6, -0.2, 0.78, 0.70, 0.84, shift",       // smaller, boundary inside: supported
        "-0.2, 0.4,  1.25, 1.18, 1.33, uncertain",   // volume alone (was: shift)
        "-0.2, 0.4,  0.78, 0.70, 0.84, uncertain",   // volume alone (was: shift)
        "-0.6, -0.2, 1.25, 1.18, 1.33, uncertain",   // volume larger but boundary inside: contradictory
        "-0.2, 0.4,  1.15, 1.05, 1.25, uncertain",   // crosses the volume minimum
        "-0.2, 0.4,  1.02, 0.95, 1.10, none",
    })
    void volumeNeedsTheSurfaceTheSameWay(double sLo, double sHi, double ratio, double lo, double hi, String flag) {
        GroupEffect e = new GroupEffect("east", "east", 3, 12, (sLo + sHi) / 2, sLo, sHi, ratio, lo, hi);
        List<GroupEffect> centres = List.of(e, centre("north", 0, -0.2, 0.2), centre("south", 0, -0.2, 0.2));
        VerdictRules.Decision d = VerdictRules.decide(test(0.01, 0.0036), findings(centres, "east", 0.01, 0.0036), 0,
                20, List.of(), S);
        assertEquals(flag, d.centreFlags().get("east"), d.reasons().toString());
        assertEquals(flag.equals("shift") ? List.of("east") : List.of(), d.flaggedCentres());
    }

    /**
     * The mirror effect: harbour draws 1.4 mm wider; against the mean of the other centres the two
     * others look 0.7 mm narrower with 30 % less volume, beyond the 15 % minimum. Their own tests do
     * not reject (their readers look like a random subset), so they are not flagged, and their
     * beyond-the-minimum intervals, opposite to the flagged centre, are read as its mirror: no
     * review finding either. A centre whose own test rejects but is the mirror cannot occur in a
     * correct test; here the rule alone is shown.
     */
    @org.junit.jupiter.api.Test
    void mirrorImagesAreNotFlagged() {
        List<GroupEffect> delta = List.of(
                new GroupEffect("harbour", "harbour", 3, 12, 1.4, 1.2, 1.6, 1.6, 1.5, 1.7),
                new GroupEffect("inland", "inland", 3, 12, -0.7, -0.9, -0.5, 0.70, 0.66, 0.74),
                new GroupEffect("upland", "upland", 3, 12, -0.7, -0.9, -0.5, 0.70, 0.66, 0.74));
        CentreFindings.Result f = findings(delta, "harbour", 0.036, 1.0 / 84);
        VerdictRules.Decision d = VerdictRules.decide(test(0.004, 0.0036), f, 0, 20, List.of(), S);
        assertEquals("re-annotate", d.verdict().word());
        assertEquals("centre-shift", d.rule());
        assertEquals(List.of("harbour"), d.flaggedCentres());
        assertEquals("none", d.centreFlags().get("inland"));
        assertEquals("none", d.centreFlags().get("upland"));
        assertEquals(CentreFindings.Kind.SHIFT, f.of("harbour").kind());
        assertEquals(CentreFindings.Kind.NONE, f.of("inland").kind());
        assertTrue(d.reasons().get(0).startsWith("Centre harbour draws 1.4 mm [1.2, 1.6] outside the other centres"),
                d.reasons().get(0));
        assertTrue(d.reasons().stream().noneMatch(r -> r.contains("inland") || r.contains("upland")), d.reasons().toString());
        // without the flagged centre (its test does not reject) the same intervals are a review finding
        CentreFindings.Result g = findings(delta, "harbour", 0.2, 1.0 / 84);
        assertEquals(CentreFindings.Kind.EVIDENCE_DISAGREES, g.of("inland").kind());
        assertEquals("uncertain", VerdictRules.decide(test(0.2, 0.0036), g, 0, 20, List.of(), S).centreFlags().get("inland"));
    }

    /** Two centres are mirrors: the pair is flagged together and the reason says which one cannot be told. */
    @ParameterizedTest(name = "p = {0}")
    @CsvSource({
        "0.004, 0.0036, re-annotate, centre-pair-differs, differ",
        "0.30,  0.0036, review,      uncertain-centre-effect, uncertain",
    })
    void twoCentresAreFlaggedAsAPair(double p, double minP, String verdict, String rule, String flag) {
        List<GroupEffect> delta = List.of(
                new GroupEffect("west", "west", 3, 12, -1.4, -1.7, -1.1, 0.7, 0.65, 0.75),
                new GroupEffect("east", "east", 3, 12, 1.4, 1.1, 1.7, 1.43, 1.33, 1.54));
        // two centres: one split, the same test for both
        List<CentreVsRest.Result> tests = List.of(
                new CentreVsRest.Result("east", 3, 9.0, p, p, 10, true, minP, minP <= 0.05, p <= 0.05),
                new CentreVsRest.Result("west", 3, 9.0, p, p, 10, true, minP, minP <= 0.05, p <= 0.05));
        CentreFindings.Result f = CentreFindings.judge(tests, delta, S);
        assertTrue(f.pair());
        VerdictRules.Decision d = VerdictRules.decide(test(p, minP), f, 0, 20, List.of(), S);
        assertEquals(verdict, d.verdict().word(), d.reasons().toString());
        assertEquals(rule, d.rule());
        assertEquals(flag, d.centreFlags().get("east"));
        assertEquals(flag, d.centreFlags().get("west"));
        assertEquals(flag.equals("differ") ? List.of("east", "west") : List.of(), d.flaggedCentres());
        assertTrue(d.reasons().get(0).startsWith("Centres east and west differ from each other: east draws 1.4 mm "
                + "[1.1, 1.7] outside centre west"), d.reasons().get(0));
        if (flag.equals("differ")) {
            assertTrue(d.reasons().get(0).contains("cannot tell which centre"), d.reasons().get(0));
        }
    }

    /** Three centres of which one has no usable effect: the other two are judged as a pair. */
    @org.junit.jupiter.api.Test
    void twoUsableCentresOfThreeAreAPair() {
        GroupEffect empty = new GroupEffect("north", "north", 3, 0, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN);
        List<GroupEffect> raw = List.of(
                new GroupEffect("east", "east", 3, 12, 1.4, 1.1, 1.7, 1.43, 1.33, 1.54), empty,
                new GroupEffect("west", "west", 3, 12, -1.4, -1.7, -1.1, 0.7, 0.65, 0.75));
        List<CentreVsRest.Result> tests = List.of(
                new CentreVsRest.Result("east", 3, 9.0, 0.004, 0.004, 84, true, 0.0036, true, true),
                new CentreVsRest.Result("north", 3, 1.0, 0.5, 0.5, 84, true, 0.0036, true, false),
                new CentreVsRest.Result("west", 3, 9.0, 0.004, 0.004, 84, true, 0.0036, true, true));
        VerdictRules.Decision d = VerdictRules.decide(test(0.004, 0.0036), CentreFindings.judge(tests, raw, S), 0, 20,
                List.of(), S);
        assertEquals("centre-pair-differs", d.rule());
        assertEquals(List.of("east", "west"), d.flaggedCentres());
        assertEquals("none", d.centreFlags().get("north"));
    }
}
