package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.List;
import org.accordia.cli.Main;
import org.accordia.demo.DemoSpec;
import org.accordia.shift.GroupEffect;
import org.junit.jupiter.api.Test;

/**
 * A reduced calibration of the shift flag (the full one is {@code accordia calibrate}, recorded in
 * docs/calibration.md): 30 null and 30 shifted seeded studies on small grids through the full
 * pipeline.
 *
 * <p>Bounds, from the binomial distribution (Rscript src/test/resources/fixtures/bench/binomial.R,
 * output binomial.out beside it):
 * <ul>
 *   <li>null: at most 6 of 30 runs flag. If the flag's false-positive probability is at most
 *       α = 0.05, P(X ≥ 7) ≤ 0.00057 for X ~ Binomial(30, 0.05) ({@code qbinom(0.999, 30, 0.05) = 6}).</li>
 *   <li>shifted (+1.5 mm at one centre): at least 21 of 30 runs flag the right centre with the right
 *       direction. If the power is at least 0.90, P(X ≤ 20) ≤ 0.00046 for X ~ Binomial(30, 0.90)
 *       ({@code qbinom(0.001, 30, 0.90) = 21}).</li>
 * </ul>
 * The runs are seeded, so the test is deterministic; the bounds say what a failure would mean.
 */
class CalibrationTest {

    private static final DemoSpec SMALL = new DemoSpec(1, 12, 3, 3, 48, 48, 24, 1.25, 1.25, 2.5, 0, 0, 0, 0.3, 0.5);

    @Test
    void reducedCalibrationMeetsBinomialBounds() throws Exception {
        SimulatedStudies runner = new SimulatedStudies(true);
        Calibration.Settings s = new Calibration.Settings(30, 20261202L, 2, 1.5, runner.alpha(), SMALL);
        Calibration.Result r = Calibration.run(s, runner.shiftedCentre(SMALL), runner);
        assertEquals(30, r.nullRuns().size());
        assertEquals(30, r.shiftedRuns().size());
        assertEquals("norvale", r.shiftedCentre(), "the generator shifts its second centre (docs/demo.md)");
        String failures = r.failedRuns().stream().map(f -> f.index() + ": " + f.error()).toList().toString();
        assertTrue(r.nullFlags() <= 6, "null flags " + r.nullFlags() + " of 30; failed " + failures);
        assertTrue(r.correctDetections() >= 21, "detections " + r.correctDetections() + " of 30; failed " + failures);
    }

    @Test
    void judgesThePrimaryFlaggedCentreAndItsDirection() {
        GroupEffect wide = effect("b", 1.4);
        GroupEffect mirror = effect("a", -0.9);
        Calibration.ShiftOutcome right = new Calibration.ShiftOutcome(List.of("a", "b"), List.of(mirror, wide), 0.01);
        Calibration.Run ok = Calibration.judge(0, true, SMALL, right, "b", 1.5);
        assertTrue(ok.flagged() && ok.correct());
        assertEquals("b", ok.primaryCentre());
        // the mirror image is larger: the primary flagged centre is the wrong one
        Calibration.ShiftOutcome wrong = new Calibration.ShiftOutcome(List.of("a", "b"),
            List.of(effect("a", -1.6), wide), 0.01);
        assertTrue(!Calibration.judge(0, true, SMALL, wrong, "b", 1.5).correct());
        // right centre, wrong direction
        Calibration.ShiftOutcome narrow = new Calibration.ShiftOutcome(List.of("b"), List.of(effect("b", -1.4)), 0.01);
        assertTrue(!Calibration.judge(0, true, SMALL, narrow, "b", 1.5).correct());
        // nothing flagged
        Calibration.Run none = Calibration.judge(0, false, SMALL, new Calibration.ShiftOutcome(List.of(),
            List.of(wide), 0.5), "b", 1.5);
        assertTrue(!none.flagged() && !none.correct() && none.primaryCentre() == null);
    }

    @Test
    void nullLimitIsAlphaPlusTwoStandardErrors() {
        Calibration.Settings s = new Calibration.Settings(200, 1, 1, 1.5, 0.05, SMALL);
        // 0.05 + 2 * sqrt(0.05 * 0.95 / 200) = 0.0808221 (arithmetic)
        assertEquals(0.0808221, s.nullLimit(), 1e-6);
    }

    @Test
    void commandPrintsRatesIntervalsAndVerdicts() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(new PrintWriter(out), new PrintWriter(err), "calibrate", "--runs", "3", "--threads", "2",
            "--size", "40,40,20", "--spacing", "1.5,1.5,3", "--cases", "6");
        assertEquals(0, code, err.toString());
        String text = out.toString();
        assertTrue(text.contains("null false-positive rate: "), text);
        assertTrue(text.contains("power (right centre and direction): "), text);
        assertTrue(text.contains("95% CI ["), text);
        assertTrue(text.contains("criterion: <= alpha + 2 SE"), text);
        assertTrue(text.matches("(?s).*overall: (PASS|FAIL).*"), text);
    }

    private static GroupEffect effect(String centre, double mm) {
        return new GroupEffect(centre, centre, 3, 12, mm, mm - 0.1, mm + 0.1, 1 + mm / 10, 1 + mm / 10 - 0.01,
            1 + mm / 10 + 0.01);
    }
}
