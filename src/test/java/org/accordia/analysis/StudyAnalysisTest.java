package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.shift.ShiftSettings;
import org.accordia.study.Protocol;
import org.accordia.study.Structure;
import org.junit.jupiter.api.Test;

/** The pipeline on small studies generated in memory (the demo generator's plants are the truth). */
class StudyAnalysisTest {

    /** A small study: 6 cases, 3 centres x 2 readers, 64x64x20 voxels of 1.2x1.2x2.5 mm, centre 2 drawing 2 mm wider. */
    static DemoSpec small() {
        return DemoSpec.defaults().withRoster(6, 3, 2).withGrid(64, 64, 20, 1.2, 1.2, 2.5).withPlants(2.0, 2, 1);
    }

    static Protocol protocol() {
        Protocol d = Protocol.defaults();
        return new Protocol("small", List.of(new Structure("lesion", List.of(1, 2), 2.0)), d.geometryToleranceMm(),
            d.maxVoxels(), 7, d.agreement(), new Protocol.Consensus(Protocol.ConsensusRegion.UNION_MARGIN, 200),
            d.shift(), d.review());
    }

    static AnalysisOptions quick(int threads) {
        return new AnalysisOptions(threads, StudyAnalysis.shiftSettings(protocol()).withResampling(999, 200, 20, 0), true);
    }

    @Test
    void sameResultWhateverTheThreads() throws Exception {
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(small());
        CaseSource source = CaseSource.of(demo.caseIds(), demo::load, null);
        StudyResult one = StudyAnalysis.run(source, protocol(), quick(1));
        StudyResult two = StudyAnalysis.run(source, protocol(), quick(3));
        assertEquals(one.cases(), two.cases());
        assertEquals(one.labels().get(0).summary(), two.labels().get(0).summary());
        assertEquals(one.labels().get(0).readerSummaries(), two.labels().get(0).readerSummaries());
        assertEquals(demo.caseIds(), one.cases().stream().map(CaseRecord::caseId).toList());
    }

    @Test
    void findsThePlantedShiftAndTheMissedLesion() throws Exception {
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(small());
        StudyResult r = StudyAnalysis.run(CaseSource.of(demo.caseIds(), demo::load, null), protocol(), quick(2));
        LabelResult lesion = r.labels().get(0);
        var truth = demo.truth();
        // the primary centre finding is the planted one, drawn outside (positive = wider)
        var top = lesion.shift().centreEffects().stream()
            .max(java.util.Comparator.comparingDouble(e -> Math.abs(e.signedSurfaceMm()))).orElseThrow();
        assertEquals(truth.shiftedCentre(), top.group());
        assertTrue(top.signedSurfaceMm() > 0);
        if (!lesion.summary().shift().flaggedCentres().isEmpty()) {
            assertEquals(truth.shiftedCentre(), lesion.summary().shift().flaggedCentres().get(0));
        }
        // the reader who misses the second lesion, in exactly the planted cases
        // the reader who misses the second lesion, only in planted cases (on this coarse grid a
        // second lesion of 2-3 voxels across may not reach a majority; the committed demo study's
        // test checks the exact list)
        MissedStructure m = lesion.missedStructure().get(0);
        assertEquals(truth.missingLesionReader(), m.reader());
        assertTrue(truth.missedLesionCases().containsAll(m.cases()), m.cases().toString());
        assertFalse(r.cases().isEmpty());
    }

    @Test
    void settingsFromTheProtocol() {
        ShiftSettings s = StudyAnalysis.shiftSettings(protocol());
        assertEquals(7, s.seed());
        assertEquals(200, s.bootstrapResamples());
        assertEquals(0.05, s.alpha());
    }

    /** Degenerate designs run through and say what cannot be estimated instead of failing. */
    @org.junit.jupiter.params.ParameterizedTest
    @org.junit.jupiter.params.provider.CsvSource({"3, 1, 3", "3, 3, 1", "2, 2, 2", "1, 3, 2"})
    void degenerateDesignsRunThrough(int cases, int centres, int readersPerCentre) throws Exception {
        DemoSpec spec = small().withRoster(cases, centres, readersPerCentre);
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(spec);
        StudyResult r = StudyAnalysis.run(CaseSource.of(demo.caseIds(), demo::load, null), protocol(), quick(2));
        assertEquals(cases, r.cases().size());
        LabelResult l = r.labels().get(0);
        assertTrue(l.summary().verdict() != null && !l.summary().reasons().isEmpty());
    }
}
