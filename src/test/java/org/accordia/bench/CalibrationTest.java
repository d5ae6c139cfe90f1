package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.List;
import java.util.Map;
import org.accordia.cli.Main;
import org.accordia.demo.DemoSpec;
import org.accordia.shift.Verdict;
import org.accordia.study.ReaderId;
import org.junit.jupiter.api.Test;

/**
 * A reduced calibration of the centre and reader findings (the full one is {@code accordia
 * calibrate}, recorded in docs/calibration.md): seeded scenario runs on small grids through the
 * full pipeline, and the harness' own logic on hand-made outcomes.
 *
 * <p>Bounds, from the binomial distribution (Rscript src/test/resources/fixtures/bench/binomial.R,
 * output binomial.out beside it). Each "at most k" bound is the largest count with P(X ≥ k + 1) ≤
 * 0.001 when the true rate is at its criterion limit (X ~ Binomial(n, 0.05) for flags), each "at
 * least k" bound the smallest count with P(X ≤ k − 1) ≤ 0.001 when the rate is 0.90; 100 %
 * criteria are asserted as 100 %. The runs are seeded, so the test is deterministic; the bounds
 * say what a failure would mean.
 */
class CalibrationTest {

    private static final DemoSpec SMALL = new DemoSpec(1, 12, 3, 3, 48, 48, 24, 1.25, 1.25, 2.5, 0, 0, 0, 0.3, 0.5);

    private static Calibration.Result reduced(int runs, String... keys) throws Exception {
        SimulatedStudies runner = new SimulatedStudies(true);
        List<Scenario> chosen = Scenario.all(1.5, 6, 3).stream().filter(s -> List.of(keys).contains(s.key())).toList();
        return Calibration.run(new Calibration.Settings(20261202L, 2, runner.alpha(), SMALL, chosen, runs), runner);
    }

    private static String failures(Calibration.ScenarioResult r) {
        return r.failedRuns().stream().map(f -> f.index() + ": " + f.error()).toList().toString();
    }

    private static Calibration.Criterion row(Calibration.ScenarioResult r, String prefix) {
        return r.criteria().stream().filter(c -> c.name().startsWith(prefix)).findFirst()
            .orElseThrow(() -> new AssertionError("no criterion " + prefix + " in " + r.criteria()));
    }

    @Test
    void nullAndShiftedCentresMeetBinomialBounds() throws Exception {
        Calibration.Result r = reduced(30, "null", "plus");
        Calibration.ScenarioResult nul = r.scenario("null");
        Calibration.ScenarioResult plus = r.scenario("plus");
        assertEquals(30, nul.runs().size());
        assertEquals("norvale", plus.plantedCentre(), "the generator shifts its second centre (docs/demo.md)");
        // qbinom(0.999, 30, 0.05) = 6
        assertTrue(row(nul, "some centre flagged").count() <= 6, nul.criteria() + " " + failures(nul));
        // qbinom(0.001, 30, 0.90) = 21
        assertTrue(row(plus, "norvale flagged, wider").count() >= 21, plus.criteria() + " " + failures(plus));
        assertTrue(row(plus, "another centre flagged").count() <= 6, plus.criteria().toString());
    }

    @Test
    void narrowerCentreAndWideReaderMeetBinomialBounds() throws Exception {
        Calibration.Result r = reduced(20, "minus", "wide-reader");
        Calibration.ScenarioResult minus = r.scenario("minus");
        Calibration.ScenarioResult wide = r.scenario("wide-reader");
        // qbinom(0.001, 20, 0.90) = 13; qbinom(0.999, 20, 0.05) = 5
        assertTrue(row(minus, "norvale flagged, narrower").count() >= 13, minus.criteria() + " " + failures(minus));
        assertTrue(row(minus, "another centre flagged").count() <= 5, minus.criteria().toString());
        assertEquals(new ReaderId("qui1", "quillbay"), wide.wideReader());
        assertTrue(row(wide, "quillbay/qui1 named").count() >= 13, wide.criteria() + " " + failures(wide));
        assertTrue(row(wide, "quillbay flagged").count() <= 5, wide.criteria().toString());
    }

    @Test
    void designsThatCannotReachAlphaSaySoInEveryRun() throws Exception {
        Calibration.Result r = reduced(10, "centres-2");
        Calibration.ScenarioResult two = r.scenario("centres-2");
        Calibration.Criterion sentence = row(two, "plain sentence: the design cannot reach alpha");
        assertEquals(10, sentence.count(), two.criteria() + " " + failures(two));
        assertFalse(row(two, "norvale flagged").judged(), "detection is not judged where alpha is unreachable");
        // nothing can be flagged at p > alpha
        assertEquals(0, row(two, "another centre flagged").count());
    }

    @Test
    void hardCasesUnequalRostersAndFourCentresMeetBinomialBounds() throws Exception {
        Calibration.Result r = reduced(10, "hard", "unequal", "centres-4");
        // qbinom(0.999, 10, 0.05) = 4; qbinom(0.001, 10, 0.90) = 5
        for (String k : List.of("hard", "unequal")) {
            Calibration.ScenarioResult x = r.scenario(k);
            assertEquals(List.of(), x.failedRuns(), k);
            assertTrue(row(x, "some centre flagged").count() <= 4, k + " " + x.criteria());
            assertTrue(row(x, "a reader named for recalibration").count() <= 4, k + " " + x.criteria());
        }
        Calibration.ScenarioResult four = r.scenario("centres-4");
        assertTrue(row(four, "norvale flagged, wider").count() >= 5, four.criteria() + " " + failures(four));
        assertTrue(row(four, "another centre flagged").count() <= 4, four.criteria().toString());
    }

    @Test
    void runsDoNotDependOnTheThreadCount() throws Exception {
        DemoSpec tiny = new DemoSpec(1, 6, 3, 3, 40, 40, 20, 1.5, 1.5, 3, 0, 0, 0, 0.3, 0.5);
        List<Scenario> chosen = Scenario.all(1.5, 6, 3).stream().filter(s -> s.key().equals("unequal")
            || s.key().equals("inclusion")).toList();
        SimulatedStudies runner = new SimulatedStudies(true);
        Calibration.Result one = Calibration.run(new Calibration.Settings(5, 1, runner.alpha(), tiny, chosen, 3), runner);
        Calibration.Result two = Calibration.run(new Calibration.Settings(5, 2, runner.alpha(), tiny, chosen, 3), runner);
        for (int k = 0; k < chosen.size(); k++) {
            List<Calibration.Run> a = one.scenarios().get(k).runs();
            List<Calibration.Run> b = two.scenarios().get(k).runs();
            assertEquals(3, a.size());
            for (int i = 0; i < a.size(); i++) {
                assertEquals(null, a.get(i).error(), a.get(i).toString());
                assertEquals(a.get(i).outcome(), b.get(i).outcome(), chosen.get(k).key() + " run " + i);
                assertEquals(a.get(i).plantedDeltaMm(), b.get(i).plantedDeltaMm());
                assertEquals(a.get(i).generatorSeed(), b.get(i).generatorSeed());
            }
            assertEquals(one.scenarios().get(k).criteria(), two.scenarios().get(k).criteria());
        }
    }

    @Test
    void distinctPartitionsFollowTheMultinomialCount() {
        // 9!/(3!^3 3!) = 280; 6!/(3!^2 2!) = 10; 6!/(3! 2! 1!) = 60 (arithmetic)
        Map<String, Long> expected = Map.of("null", 280L, "centres-2", 10L, "unequal", 60L);
        for (Scenario s : Scenario.all(1.5, 6, 3)) {
            if (expected.containsKey(s.key())) {
                assertEquals(expected.get(s.key()).longValue(), s.distinctPartitions().longValue(), s.key());
            }
        }
        Scenario two = Scenario.all(1.5, 6, 3).stream().filter(s -> s.key().equals("centres-2")).findFirst().orElseThrow();
        assertFalse(two.canReachAlpha(0.05));
        assertTrue(two.canReachAlpha(0.10));
    }

    @Test
    void judgesFlagsDirectionsCoverageAndFailedRuns() {
        Scenario plus = Scenario.all(1.5, 6, 3).get(1);
        Calibration.Settings s = new Calibration.Settings(1, 1, 0.05, SMALL, List.of(plus), 4);
        Map<String, Double> delta = Map.of("esterhaven", -0.7, "norvale", 1.4, "quillbay", -0.7);
        List<Calibration.Run> runs = List.of(
            run(0, outcome(List.of(new ScenarioOutcome.FlaggedCentre("norvale", 1)), 1.3, 1.5), delta),
            // right centre, wrong direction; interval misses the planted 1.4
            run(1, outcome(List.of(new ScenarioOutcome.FlaggedCentre("norvale", -1)), 1.0, 1.2), delta),
            // an innocent centre flagged as well
            run(2, outcome(List.of(new ScenarioOutcome.FlaggedCentre("esterhaven", -1),
                new ScenarioOutcome.FlaggedCentre("norvale", 1)), 1.35, 1.45), delta),
            new Calibration.Run("plus", 3, 0, 0, null, delta, "IllegalStateException: boom"));
        Calibration.ScenarioResult r = Calibration.judge(plus, runs, s, 0);
        assertEquals(2, row(r, "norvale flagged, wider").count(), "runs 0 and 2; the failed run is a miss");
        assertEquals(2, row(r, "another centre flagged").count(), "run 2 and the failed run");
        assertEquals(2, row(r, "norvale interval covers").count(), "runs 0 and 2");
        assertEquals(4, row(r, "norvale interval covers").trials());
        assertEquals(1, r.failedRuns().size());
        assertFalse(r.passes());
    }

    @Test
    void nullLimitIsAlphaPlusTwoStandardErrors() {
        Calibration.Settings s = new Calibration.Settings(1, 1, 0.05, SMALL, Scenario.all(1.5, 6, 3), 0);
        // 0.05 + 2 * sqrt(0.05 * 0.95 / 200) = 0.0808221 (arithmetic)
        assertEquals(0.0808221, s.nullLimit(200), 1e-6);
        assertEquals(200, s.runsOf(Scenario.all(1.5, 6, 3).get(0)));
        assertEquals(100, s.runsOf(Scenario.all(1.5, 6, 3).get(2)));
    }

    @Test
    void commandPrintsEveryChosenScenarioWithIntervalsAndVerdicts() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(new PrintWriter(out), new PrintWriter(err), "calibrate", "--runs", "2", "--threads", "2",
            "--size", "40,40,20", "--spacing", "1.5,1.5,3", "--cases", "6", "--scenario", "null,centres-2");
        assertEquals(0, code, err.toString());
        String text = out.toString();
        assertTrue(text.contains("scenario null: "), text);
        assertTrue(text.contains("scenario centres-2: "), text);
        assertFalse(text.contains("scenario plus: "), text);
        assertTrue(text.contains("some centre flagged"), text);
        assertTrue(text.contains("plain sentence: the design cannot reach alpha"), text);
        assertTrue(text.contains("| centres-2 | "), text);
        assertTrue(text.matches("(?s).*overall: (PASS|FAIL).*"), text);
        StringWriter err2 = new StringWriter();
        assertEquals(2, Main.execute(new PrintWriter(new StringWriter()), new PrintWriter(err2), "calibrate",
            "--scenario", "nonsense"));
        assertTrue(err2.toString().contains("unknown scenario 'nonsense'"), err2.toString());
    }

    private static Calibration.Run run(int i, ScenarioOutcome o, Map<String, Double> delta) {
        return new Calibration.Run("plus", i, i, i, o, delta, null);
    }

    private static ScenarioOutcome outcome(List<ScenarioOutcome.FlaggedCentre> flagged, double lo, double hi) {
        List<ScenarioOutcome.CentreEstimate> effects = List.of(
            new ScenarioOutcome.CentreEstimate("esterhaven", 3, -0.7, -0.8, -0.6),
            new ScenarioOutcome.CentreEstimate("norvale", 3, (lo + hi) / 2, lo, hi),
            new ScenarioOutcome.CentreEstimate("quillbay", 3, -0.7, -0.8, -0.6));
        return new ScenarioOutcome("lesion", flagged, List.of(), List.of(), effects, false, false,
            flagged.isEmpty() ? Verdict.POOL : Verdict.RE_ANNOTATE, "x", List.of(), 0.01, true);
    }
}
