package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.concurrent.atomic.AtomicInteger;
import org.accordia.demo.DemoGenerator;
import org.accordia.study.LoadedCase;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The pool never holds more cases in memory than threads: an instrumented case source counts the
 * cases loaded and not yet finished (a case is loaded, analysed and handed to the sink inside one
 * task; the count goes down when the task reports the case done) and records the largest count.
 * Loading is slowed down so that the workers really overlap.
 */
class CasesInMemoryTest {
    @ParameterizedTest(name = "threads = {0}")
    @ValueSource(ints = {1, 2, 3})
    void neverMoreCasesInMemoryThanThreads(int threads) throws Exception {
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(StudyAnalysisTest.small().withRoster(8, 2, 2));
        AtomicInteger live = new AtomicInteger();
        AtomicInteger most = new AtomicInteger();
        AtomicInteger loads = new AtomicInteger();
        CaseSource counting = CaseSource.of(demo.caseIds(), id -> {
            int now = live.incrementAndGet();
            most.accumulateAndGet(now, Math::max);
            loads.incrementAndGet();
            try {
                Thread.sleep(40);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            LoadedCase c = demo.load(id);
            return c;
        }, null);
        StudyAnalysis.run(counting, StudyAnalysisTest.protocol(), StudyAnalysisTest.quick(threads), CaseSink.NONE,
            live::decrementAndGet);
        assertEquals(demo.caseIds().size(), loads.get(), "each case loaded once (explicit structures: no label scan)");
        assertEquals(0, live.get(), "every loaded case finished");
        assertTrue(most.get() <= threads, "at most " + threads + " cases in memory, saw " + most.get());
        assertTrue(most.get() >= 1);
    }
}
