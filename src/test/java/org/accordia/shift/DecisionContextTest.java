package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;

/** Empty groups, a single centre, masks to correct apart from adjudication. */
class DecisionContextTest {
    private static final ShiftSettings S = ShiftSettings.defaults();

    @Test
    void anEmptyCentreWithholdsThePoolingVerdict() {
        List<GroupEffect> centres = List.of(VerdictRulesTest.centre("esterhaven", 3.0, 2.5, 3.5),
            VerdictRulesTest.centre("norvale", -3.0, -3.5, -2.5), VerdictRulesTest.centre("quillbay", 0.0, -0.2, 0.2));
        EmptyGroup e = new EmptyGroup(EmptyGroup.Level.CENTRE, "norvale", "norvale", 30, 10, List.of(5, 6));
        VerdictRules.Decision d = VerdictRules.decide(VerdictRulesTest.test(0.004, 0.0036),
            VerdictRulesTest.findings(centres, "esterhaven", 0.004, 0.0036), 0, 10, List.of(), S,
            new VerdictRules.Context(List.of(), List.of(e), List.of(), 0));
        assertEquals(Verdict.REVIEW, d.verdict());
        assertEquals("empty-centre", d.rule());
        assertTrue(d.reasons().get(0).startsWith("Centre norvale: all 30 masks are empty"), d.reasons().get(0));
        assertTrue(d.flaggedCentres().isEmpty());
        assertTrue(d.centreFlags().values().stream().allMatch("none"::equals), d.centreFlags().toString());
        assertEquals(List.of(e), d.emptyGroups());
    }

    @Test
    void aSingleCentreSaysTheShiftIsNotTestable() {
        PermutationResult none = new PermutationResult(Double.NaN, Double.NaN, 0, true, 1.0, false, "Only one centre");
        GroupEffect only = new GroupEffect("esterhaven", "esterhaven", 3, 10, Double.NaN, Double.NaN, Double.NaN,
            Double.NaN, Double.NaN, Double.NaN);
        List<DesignLimit> limits = DesignLimits.of(Map.of("esterhaven", 3), 0.05, 100_000, 9_999);
        CentreFindings.Result one = CentreFindings.judge(List.of(), List.of(only), S);
        VerdictRules.Decision d = VerdictRules.decide(none, one, 0, 10, List.of(), S,
            new VerdictRules.Context(limits, List.of(), List.of(), 0));
        assertEquals(Verdict.POOL, d.verdict());
        assertEquals("single-centre", d.rule());
        assertTrue(d.reasons().get(0).startsWith("Single centre: a between-centre shift is not testable"));
        VerdictRules.Decision busy = VerdictRules.decide(none, one, 5, 10, List.of(), S,
            new VerdictRules.Context(limits, List.of(), List.of(), 0));
        assertEquals("many-cases-to-adjudicate", busy.rule());
        assertTrue(busy.reasons().stream().anyMatch(r -> r.startsWith("Single centre")));
    }

    @Test
    void twoCentresOfThreeDoNotSayTheEvidenceDisagrees() {
        // min p = 0.1: "beyond the minimum but not significant" is the design, not disagreeing evidence
        PermutationResult t = new PermutationResult(5.0, 0.1, 10, true, 0.1, false, "");
        List<GroupEffect> centres = List.of(VerdictRulesTest.centre("esterhaven", 1.6, 1.2, 2.0),
            VerdictRulesTest.centre("norvale", -1.6, -2.0, -1.2));
        CentreFindings.Result pair = CentreFindings.judge(List.of(
                new CentreVsRest.Result("esterhaven", 3, 5.0, 0.1, 0.1, 10, true, 0.1, false, false),
                new CentreVsRest.Result("norvale", 3, 5.0, 0.1, 0.1, 10, true, 0.1, false, false)), centres, S);
        VerdictRules.Decision d = VerdictRules.decide(t, pair, 0, 10, List.of(), S,
            new VerdictRules.Context(DesignLimits.of(Map.of("esterhaven", 3, "norvale", 3), 0.05, 100_000, 9_999),
                List.of(), List.of(), 0));
        String all = String.join(" ", d.reasons());
        assertTrue(!all.contains("evidence disagrees"), all);
        assertTrue(all.contains("p = 0.1 (1 of 10 distinct reader splits, the smallest reachable)"), all);
        assertTrue(all.contains("this design cannot confirm it"), all);
        assertEquals(List.of("cannot-reach-alpha", "two-centres"), d.designLimits().stream().map(x -> x.kind().key()).toList());
    }

    /**
     * Reader nor1 leaves out a second lesion on case k1 (its Dice with the others 0.55; the others
     * agree at 0.85): a mask to correct, not a case to adjudicate. On k2 the readers genuinely
     * disagree (0.5 among all).
     */
    @Test
    void masksToCorrectDoNotCountAsAdjudication() {
        List<String> readers = List.of("est1", "nor1", "qui1", "qui2");
        // pairs in order (0,1) (0,2) (0,3) (1,2) (1,3) (2,3)
        MaskToCorrect slip = new MaskToCorrect("k1", "nor1", "norvale", MaskToCorrect.Kind.LEAVES_OUT_PART, 1, 0.12);
        CaseSummary k1 = new CaseSummary("k1", 0.70, 4.0, 0, 4, readers,
            new double[] {0.55, 0.85, 0.86, 0.55, 0.56, 0.87}, new double[] {12, 2, 2, 12, 12, 2},
            new boolean[4], List.of(slip));
        CaseSummary k2 = new CaseSummary("k2", 0.5, 4.0, 0, 4, readers,
            new double[] {0.5, 0.5, 0.5, 0.5, 0.5, 0.5}, new double[] {4, 4, 4, 4, 4, 4}, new boolean[4], List.of());
        List<CaseToAdjudicate> adj = ReviewLists.casesToAdjudicate(List.of(k1, k2), S, Set.of());
        assertEquals(List.of("k2"), adj.stream().map(CaseToAdjudicate::caseId).toList());
        assertEquals(List.of("median pairwise Dice 0.50 is below 0.70"), adj.get(0).reasons());
        assertEquals(List.of(slip), ReviewLists.masksToCorrect(List.of(k1, k2), Set.of()));
        // without the pairs (older callers) every reader counts, as before
        assertEquals(List.of("k1"), ReviewLists.casesToAdjudicate(List.of(new CaseSummary("k1", 0.69, 4.0, 0, 4)), S)
            .stream().map(CaseToAdjudicate::caseId).toList());
        // the readers of an empty centre are set aside: their one-empty pairs are not disagreement
        CaseSummary k3 = new CaseSummary("k3", 0.0, Double.NaN, 4, 4, readers,
            new double[] {0.0, 0.9, 0.9, 0.0, 0.0, 0.9}, new double[] {Double.NaN, 2, 2, Double.NaN, Double.NaN, 2},
            new boolean[] {false, true, false, false}, List.of());
        assertEquals(List.of(), ReviewLists.casesToAdjudicate(List.of(k3), S, Set.of("nor1")));
        assertEquals(1, ReviewLists.casesToAdjudicate(List.of(k3), S, Set.of()).size());
    }
}
