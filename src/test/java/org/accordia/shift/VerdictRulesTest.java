package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** The rule table of {@link VerdictRules} (our own documented rules; defaults of ShiftSettings). */
class VerdictRulesTest {
    static final ShiftSettings S = ShiftSettings.defaults();

    static PermutationResult test(double p, double minP) {
        return new PermutationResult(4.2, p, 280, true, minP, minP <= 0.05,
                minP <= 0.05 ? "" : "With readers per centre (a: 2, b: 2) ... cannot show a centre effect ...");
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
        "'interval crosses minimum',          0.30,  0.0036, 0.9,  0.4,  1.4,  0, false, review,      uncertain-centre-effect",
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
        List<GroupEffect> centres = List.of(centre("north", mm, lo, hi), centre("south", 0.0, -0.3, 0.3));
        List<ReaderToRecalibrate> readers = recalibrate
                ? List.of(new ReaderToRecalibrate("r7", "south", List.of("draws 2.0 mm [1.5, 2.5] outside")))
                : List.of();
        VerdictRules.Decision d = VerdictRules.decide(test(p, minP), centres, adjudicate, 20, readers, S);
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
            assertTrue(d.reasons().stream().anyMatch(r -> r.contains("cannot show a centre effect")), d.reasons().toString());
        }
    }

    @ParameterizedTest(name = "volume {0} [{1}, {2}] -> {3}")
    @CsvSource({
        "1.25, 1.18, 1.33, shift",
        "0.78, 0.70, 0.84, shift",
        "1.15, 1.05, 1.25, uncertain",
        "1.02, 0.95, 1.10, none",
    })
    void volumeShiftAlsoFlags(double ratio, double lo, double hi, String flag) {
        GroupEffect e = new GroupEffect("east", "east", 3, 12, 0.1, -0.2, 0.4, ratio, lo, hi);
        VerdictRules.Decision d = VerdictRules.decide(test(0.01, 0.0036), List.of(e), 0, 20, List.of(), S);
        assertEquals(flag, d.centreFlags().get("east"));
    }
}
