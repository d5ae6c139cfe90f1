package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.io.LabelVolume;
import org.accordia.report.DecisionWords;
import org.accordia.shift.EmptyGroup;
import org.accordia.shift.LabelShiftSummary;
import org.accordia.shift.MaskToCorrect;
import org.accordia.shift.ShiftSettings;
import org.accordia.shift.VerdictRules;
import org.accordia.study.LoadedCase;
import org.junit.jupiter.api.Test;

/**
 * Through the whole pipeline: a centre coding its labels differently, readers who leave out a
 * second lesion, a single-centre study.
 */
class StudyFindingsTest {
    private static final ShiftSettings QUICK = StudyAnalysis.shiftSettings(StudyAnalysisTest.protocol())
        .withResampling(999, 200, 0, 0);

    private static StudyResult run(DemoSpec spec, java.util.function.UnaryOperator<LoadedCase> change) throws Exception {
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(spec);
        return StudyAnalysis.run(CaseSource.of(demo.caseIds(), id -> change.apply(demo.load(id)), null),
            StudyAnalysisTest.protocol(), new AnalysisOptions(2, QUICK, false));
    }

    private static DemoSpec spec() {
        return DemoSpec.defaults().withSeed(31).withRoster(8, 3, 3).withGrid(48, 48, 16, 1.0, 1.0, 2.0)
            .withPlants(0.0, 0, 0);
    }

    /** norvale writes 5 for 1 and 6 for 2: its masks hold nothing of the protocol's lesion {1, 2}. */
    @Test
    void aCentreWithAnotherLabelConventionIsTheHeadlineAndGetsNoPoolingVerdict() throws Exception {
        StudyResult r = run(spec(), lc -> {
            List<LabelVolume> masks = new ArrayList<>();
            for (int j = 0; j < lc.masks().size(); j++) {
                LabelVolume v = lc.masks().get(j);
                if (!lc.readers().get(j).centre().equals("norvale")) {
                    masks.add(v);
                    continue;
                }
                byte[] b = new byte[v.voxelCount()];
                for (int i = 0; i < b.length; i++) {
                    int l = v.label(i);
                    b[i] = (byte) (l == 0 ? 0 : l + 4);
                }
                masks.add(LabelVolume.ofBytes(v.geometry(), b));
            }
            return new LoadedCase(lc.caseId(), lc.geometry(), lc.readers(), masks);
        });
        LabelShiftSummary s = r.labels().get(0).summary();
        assertEquals(VerdictRules.EMPTY_CENTRE, s.rule(), s.reasons().toString());
        assertEquals("review", s.verdict().word());
        assertEquals(List.of(new EmptyGroup(EmptyGroup.Level.CENTRE, "norvale", "norvale", 24, 8, List.of(5, 6))),
            s.emptyGroups());
        assertTrue(s.reasons().get(0).startsWith("Centre norvale: all 24 masks are empty for this structure"),
            s.reasons().get(0));
        assertTrue(s.reasons().get(0).contains("labels 5 and 6 occur only at centre norvale — a label convention?"));
        assertTrue(s.shift().flaggedCentres().isEmpty());
        r.labels().get(0).shift().centreRows().forEach(c -> assertEquals("none", c.flag(), c.centre()));
        // the empty centre's pairs are the finding, not disagreement: the cases do not all go to adjudication
        assertTrue(s.casesToAdjudicate().size() < 8, s.casesToAdjudicate().toString());
        assertTrue(s.masksToCorrect().stream().noneMatch(m -> m.centre().equals("norvale")));
        assertTrue(s.readersToRecalibrate().stream().noneMatch(m -> m.centre().equals("norvale")));
    }

    @Test
    void aLeftOutSecondLesionIsAMaskToCorrectNotACaseToAdjudicate() throws Exception {
        // the demo's grid (0.8 x 0.8 x 2.5 mm): its second lesion is larger than the smallest part counted
        StudyResult r = run(DemoSpec.defaults().withSeed(31).withRoster(6, 3, 2).withPlants(0.0, 3, 0), lc -> lc);
        LabelShiftSummary s = r.labels().get(0).summary();
        List<MaskToCorrect> fix = s.masksToCorrect();
        assertFalse(fix.isEmpty(), s.toString());
        assertTrue(fix.stream().allMatch(m -> m.kind() == MaskToCorrect.Kind.LEAVES_OUT_PART && m.parts() >= 1));
        for (MaskToCorrect m : fix) {
            assertTrue(s.casesToAdjudicate().stream().noneMatch(c -> c.caseId().equals(m.caseId())),
                m + " also listed for adjudication: " + s.casesToAdjudicate());
        }
        assertFalse(s.rule().equals(VerdictRules.MANY_CASES_TO_ADJUDICATE), s.reasons().toString());
        assertTrue(s.reasons().stream().anyMatch(x -> x.contains(fix.size() + " mask" + (fix.size() == 1 ? "" : "s")
            + " should be corrected")), s.reasons().toString());
        assertTrue(DecisionWords.correction(fix.get(0)).contains("leaves out " + fix.get(0).parts() + " part"));
    }

    @Test
    void aSingleCentreSaysTheShiftIsNotTestable() throws Exception {
        StudyResult r = run(spec().withRoster(6, 1, 3), lc -> lc);
        LabelShiftSummary s = r.labels().get(0).summary();
        assertTrue(s.rule().equals(VerdictRules.SINGLE_CENTRE) || s.reasons().stream()
            .anyMatch(x -> x.startsWith("Single centre")), s.reasons().toString());
        assertEquals(List.of("single-centre"), s.designLimitations().stream().map(d -> d.kind().key()).toList());
        if (s.rule().equals(VerdictRules.SINGLE_CENTRE)) {
            assertEquals("single centre: shift not testable", DecisionWords.headline(s.rule()));
        }
        assertFalse(s.rule().equals(VerdictRules.NO_SHIFT));
    }
}
