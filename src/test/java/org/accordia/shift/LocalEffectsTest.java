package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.accordia.consensus.BorderProfile;
import org.junit.jupiter.api.Test;

/** Per-centre shares of border beyond tolerance, their excess over the typical centre, and the rule. */
class LocalEffectsTest {
    private static BorderProfile profile(long border, long out, long in, int dir) {
        long[] bd = new long[6];
        long[] od = new long[6];
        bd[dir] = border;
        od[dir] = out;
        return new BorderProfile(2.0, border, out, in, bd, od);
    }

    /**
     * Hand example, three centres of two readers on two cases. Centre a's readers have 30 of 100
     * and 10 of 100 border voxels beyond outside on case 1 (share (30 + 10)/200 = 0.20), 20 of 100
     * and 20 of 100 on case 2 (0.20): mean 0.20. Centres b and c: 5 of 100 per reader on both
     * cases (0.05). Median 0.05, so a's excess is 0.15 and b's and c's are 0; inside: b and c have
     * 15 of 100 (the mirror of a's part), a has 0: median 0.15, excesses −0.15, 0, 0.
     */
    @Test
    void handExample() {
        List<ReaderCaseMeasure> rows = new ArrayList<>();
        rows.add(new ReaderCaseMeasure("a1", "a", "k1", 0.3, 1.1, profile(100, 30, 0, 0)));
        rows.add(new ReaderCaseMeasure("a2", "a", "k1", 0.2, 1.1, profile(100, 10, 0, 0)));
        rows.add(new ReaderCaseMeasure("a1", "a", "k2", 0.3, 1.1, profile(100, 20, 0, 0)));
        rows.add(new ReaderCaseMeasure("a2", "a", "k2", 0.2, 1.1, profile(100, 20, 0, 0)));
        for (String c : List.of("b", "c")) {
            for (String k : List.of("k1", "k2")) {
                rows.add(new ReaderCaseMeasure(c + "1", c, k, -0.1, 0.95, profile(100, 5, 15, 1)));
                rows.add(new ReaderCaseMeasure(c + "2", c, k, -0.1, 0.95, profile(100, 5, 15, 1)));
            }
        }
        List<LocalEffect> l = LocalEffects.byCentre(rows, 500, 7);
        assertEquals(List.of("a", "b", "c"), l.stream().map(LocalEffect::centre).toList());
        assertEquals(0.20, l.get(0).outsideShare(), 1e-12);
        assertEquals(0.15, l.get(0).outsideExcess(), 1e-12);
        assertEquals(0.0, l.get(1).outsideExcess(), 1e-12);
        assertEquals(-0.15, l.get(0).insideExcess(), 1e-12);
        assertEquals(0.0, l.get(2).insideExcess(), 1e-12);
        // a's cases both give 0.20, so every bootstrap resample does: the interval is the point
        assertEquals(0.15, l.get(0).outsideExcessLo(), 1e-12);
        assertEquals(0.15, l.get(0).outsideExcessHi(), 1e-12);
        assertTrue(l.get(0).beyond(LocalEffects.MINIMUM_EXCESS));
        assertTrue(!l.get(1).beyond(LocalEffects.MINIMUM_EXCESS));
        assertEquals(0, l.get(0).mainDirection());
        assertEquals(0.20, l.get(0).outsideByDirection().get(0), 1e-12);
        assertEquals(2, l.get(0).readers());
        assertEquals(2, l.get(0).cases());
    }

    /** Findings with centre a's own test at p and the others at 0.5, and the local effects. */
    static CentreFindings.Result withLocal(List<GroupEffect> effects, double p, List<LocalEffect> local) {
        List<CentreVsRest.Result> tests = effects.stream().map(e -> e.group().equals("a")
                ? new CentreVsRest.Result(e.group(), 3, 9.0, p, p, 84, true, 1.0 / 84, true, p <= 0.05)
                : new CentreVsRest.Result(e.group(), 3, 1.0, 0.5, 0.5, 84, true, 1.0 / 84, true, false)).toList();
        return CentreFindings.judge(tests, effects, local, ShiftSettings.defaults());
    }

    @Test
    void excessIsAgainstTheMedianOrTheOtherCentre() {
        double[] three = LocalEffects.excess(new double[] {0.3, 0.05, Double.NaN, 0.07});
        assertEquals(0.23, three[0], 1e-12);
        assertEquals(-0.02, three[1], 1e-12);
        assertTrue(Double.isNaN(three[2]));
        assertEquals(0.0, three[3], 1e-12);
        double[] two = LocalEffects.excess(new double[] {0.3, 0.05});
        assertEquals(0.25, two[0], 1e-12);
        assertEquals(-0.25, two[1], 1e-12);
        assertTrue(Double.isNaN(LocalEffects.excess(new double[] {0.3})[0]));
    }

    @Test
    void aLocalPartFlagsTheCentreWhenTheTestIsSignificantAndOnlyThen() {
        ShiftSettings s = ShiftSettings.defaults();
        // mean signed distance and volume small: the old rule says significant-but-small
        List<GroupEffect> centres = List.of(VerdictRulesTest.centre("a", 0.4, 0.2, 0.6),
            VerdictRulesTest.centre("b", 0.0, -0.2, 0.2), VerdictRulesTest.centre("c", 0.0, -0.2, 0.2));
        LocalEffect a = new LocalEffect("a", 3, 12, 2.0, 0.25, 0.18, 0.13, 0.23, 0.02, 0.0, -0.01, 0.01,
            List.of(0.6, 0.05, 0.1, 0.1, 0.1, 0.1));
        LocalEffect b = new LocalEffect("b", 3, 12, 2.0, 0.07, 0.0, -0.02, 0.02, 0.10, 0.0, -0.01, 0.02,
            List.of(0.07, 0.07, 0.07, 0.07, 0.07, 0.07));
        LocalEffect c = new LocalEffect("c", 3, 12, 2.0, 0.07, 0.0, -0.02, 0.02, 0.10, 0.0, -0.01, 0.02,
            List.of(0.07, 0.07, 0.07, 0.07, 0.07, 0.07));
        VerdictRules.Context ctx = new VerdictRules.Context(List.of(), List.of(), List.of(a, b, c), 0);
        VerdictRules.Decision d = VerdictRules.decide(VerdictRulesTest.test(0.004, 0.0036),
            withLocal(centres, 0.004, List.of(a, b, c)), 0, 12, List.of(), s, ctx);
        assertEquals("centre-shift", d.rule(), d.reasons().toString());
        assertEquals(List.of("a"), d.flaggedCentres());
        assertEquals("Centre a: 25% of its readers' border lies more than 2 mm outside the other centres' consensus, "
            + "18 points [13, 23] more than the typical centre; most on the +x side (60% of the border there); the "
            + "excess interval lies entirely above the minimum (10 points)", d.reasons().get(0).substring(0,
                d.reasons().get(0).indexOf(" and its own test")));
        VerdictRules.Decision quiet = VerdictRules.decide(VerdictRulesTest.test(0.30, 0.0036),
            withLocal(centres, 0.30, List.of(a, b, c)), 0, 12, List.of(), s, ctx);
        assertEquals("uncertain-centre-effect", quiet.rule());
        assertEquals("uncertain", quiet.centreFlags().get("a"));
        assertEquals("none", quiet.centreFlags().get("b"));
    }
}
