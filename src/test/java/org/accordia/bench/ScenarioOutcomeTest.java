package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.TreeSet;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.StudyResult;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.shift.CentreContrasts;
import org.accordia.shift.GroupEffect;
import org.accordia.shift.VerdictRules;
import org.junit.jupiter.api.Test;

/** The adapter reads what the analysis reported, field by field, on real analyses of small studies. */
class ScenarioOutcomeTest {
    private static final DemoSpec SMALL = new DemoSpec(3, 8, 3, 3, 40, 40, 20, 1.5, 1.5, 3, 0, 0, 0, 0.3, 0.5);

    @Test
    void readsFlagsDirectionsEffectsAndListsOfAShiftedStudy() throws Exception {
        Scenario plus = Scenario.all(1.5, 6, 3).get(1);
        SimulatedStudies runner = new SimulatedStudies(true);
        StudyResult r = runner.analyse(DemoGenerator.inMemory(plus.spec(SMALL, 7, 0), plus.extras()), 7);
        ScenarioOutcome o = ScenarioOutcome.of(r, SimulatedStudies.STRUCTURE);
        LabelResult l = r.labels().get(0);
        assertEquals(new TreeSet<>(l.summary().shift().flaggedCentres()),
            new TreeSet<>(o.flagged().stream().map(ScenarioOutcome.FlaggedCentre::centre).toList()));
        assertTrue(o.flags("norvale", 1), "the wider centre is flagged wider: " + o.flagged() + " " + o.reasons());
        for (ScenarioOutcome.FlaggedCentre f : o.flagged()) {
            GroupEffect judged = CentreContrasts.effects(l.shift().centreContrasts()).stream()
                .filter(e -> e.group().equals(f.centre())).findFirst().orElseThrow();
            assertEquals((int) Math.signum(judged.signedSurfaceMm()), f.direction(), f.centre());
        }
        // the reported effect is Δ_c against the common reference (centres.csv effect_* columns)
        assertEquals(l.shift().centreContrasts().size(), o.centreEffects().size());
        for (GroupEffect e : CentreContrasts.effects(l.shift().centreContrasts())) {
            ScenarioOutcome.CentreEstimate c = o.effectOf(e.group());
            assertEquals(e.signedSurfaceMm(), c.estimateMm(), 0.0);
            assertEquals(e.signedSurfaceLoMm(), c.loMm(), 0.0);
            assertEquals(e.signedSurfaceHiMm(), c.hiMm(), 0.0);
            assertEquals(e.readers(), c.readers());
        }
        assertEquals(l.shift().centreRows().stream().filter(x -> x.flag().equals(VerdictRules.FLAG_UNCERTAIN))
            .map(x -> x.centre()).sorted().toList(), o.uncertainCentres());
        assertEquals(l.summary().readersToRecalibrate().size(), o.readersToRecalibrate().size());
        assertEquals(l.summary().verdict(), o.verdict());
        assertEquals(l.summary().rule(), o.rule());
        assertEquals(l.shift().permutation().pValue(), o.pValue(), 0.0);
        assertTrue(o.canReachAlpha());
        assertFalse(o.alphaSentence(), "3 x 3 readers can reach alpha");
        assertThrows(IllegalArgumentException.class, () -> ScenarioOutcome.of(r, "nothing"));
    }

    @Test
    void twoCentresOfThreeReadersCarryTheDesignSentence() throws Exception {
        Scenario two = Scenario.all(1.5, 6, 3).stream().filter(s -> s.key().equals("centres-2")).findFirst()
            .orElseThrow();
        SimulatedStudies runner = new SimulatedStudies(true);
        StudyResult r = runner.analyse(DemoGenerator.inMemory(two.spec(SMALL, 7, 0), two.extras()), 7);
        ScenarioOutcome o = ScenarioOutcome.of(r, SimulatedStudies.STRUCTURE);
        assertFalse(o.canReachAlpha());
        assertTrue(o.alphaSentence(), o.reasons().toString());
        assertEquals(List.of(), o.flagged());
    }
}
