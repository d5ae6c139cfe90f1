package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.accordia.demo.DemoGenerator;
import org.accordia.io.InputException;
import org.junit.jupiter.api.Test;

/**
 * The seams of the pipeline: the plan computed once, the public per-case unit, the study level as
 * a function of the records, and a runner of our own behind {@link CaseExecutor} give what
 * {@link StudyAnalysis#run} gives.
 */
class PerCaseUnitTest {

    @Test
    void stepByStepWithAnotherExecutorEqualsTheRun() throws Exception {
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(StudyAnalysisTest.small());
        CaseSource source = CaseSource.of(demo.caseIds(), demo::load, null);
        AnalysisOptions options = StudyAnalysisTest.quick(2);
        StudyResult whole = StudyAnalysis.run(source, StudyAnalysisTest.protocol(), options);

        // a runner of our own: cases one at a time, last case first
        List<Integer> order = new ArrayList<>();
        CaseExecutor backwards = (count, task) -> {
            for (int i = count - 1; i >= 0; i--) {
                order.add(i);
                task.run(i);
            }
        };
        CasePlan plan = StudyAnalysis.plan(source, StudyAnalysisTest.protocol(), options, backwards);
        List<String> ids = source.caseIds();
        CaseRecord[] records = new CaseRecord[ids.size()];
        backwards.forEachCase(ids.size(), i -> records[i] = CaseAnalysis.analyse(source.load(ids.get(i)), plan,
            CaseSink.NONE, CaseSink.CaseImage.NONE));
        StudyResult stepwise = StudyAnalysis.studyLevel(plan, StudyAnalysisTest.protocol(), List.of(records),
            source.missing(), options, null);

        assertEquals(ids.size() - 1, order.get(0), "the runner chose the order");
        assertEquals(whole.cases(), stepwise.cases());
        assertEquals(whole.labels().get(0).summary(), stepwise.labels().get(0).summary());
        assertEquals(whole.labels().get(0).readerSummaries(), stepwise.labels().get(0).readerSummaries());
        assertEquals(whole.events(), stepwise.events());
        assertEquals(whole.settings(), stepwise.settings());
    }

    @Test
    void theLocalPoolStopsAtTheFirstFailureAndRethrowsIt() {
        CaseExecutor pool = CaseExecutor.local(2);
        InputException e = assertThrows(InputException.class, () -> pool.forEachCase(50, i -> {
            if (i == 3) {
                throw new InputException(null, "case 3 is bad");
            }
        }));
        assertTrue(e.getMessage().contains("case 3 is bad"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> CaseExecutor.local(0));
    }
}
