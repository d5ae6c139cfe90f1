package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;
import java.util.Map;

import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;

/**
 * REML variance components against lme4 1.1-31 (Debian r-cran-lme4), fitted with
 * {@code src/test/resources/fixtures/shift/lme4_reml.R} (output in lme4_reml_output.txt, values in
 * the *_lme4.csv files; lme4's BOBYQA with rhoend = 1e-12 so that its optimum is tight).
 */
class RemlFitTest {
    private static final double RELATIVE = 1e-4;

    private static void assertRelative(double expected, double actual, double relative, String what) {
        assertEquals(expected, actual, relative * Math.abs(expected), what);
    }

    @Test
    void pastesMatchesLme4() throws IOException {
        // lme4: lmer(strength ~ 1 + (1|batch) + (1|batch:cask), Pastes), REML.
        // Published (lme4 documentation, default optimiser): cask-in-batch 8.4337, batch 1.6573, residual 0.6780.
        List<CSVRecord> rows = Fixtures.csv("pastes.csv");
        double[] y = rows.stream().mapToDouble(r -> Double.parseDouble(r.get("strength"))).toArray();
        RemlFit model = new RemlFit(List.of("batch", "batch:cask"),
                List.of(Fixtures.levels(rows, "batch"), Fixtures.levels(rows, "batch", "cask")), null);
        RemlResult fit = model.fit(y);
        Map<String, Double> ref = Fixtures.components("pastes_lme4.csv");
        assertRelative(ref.get("batch"), fit.variance("batch"), RELATIVE, "batch");
        assertRelative(ref.get("batch:cask"), fit.variance("batch:cask"), RELATIVE, "cask in batch");
        assertRelative(ref.get("Residual"), fit.residualVariance(), RELATIVE, "residual");
        assertEquals(ref.get("(REMLcrit)"), fit.remlCriterion(), 1e-6, "REML criterion");
        assertRelative(ref.get("(Intercept)"), fit.beta()[0], 1e-9, "intercept");
        assertEquals(8.4337, fit.variance("batch:cask"), 1e-4);
        assertEquals(1.6573, fit.variance("batch"), 1e-4);
        assertEquals(0.6780, fit.residualVariance(), 1e-4);
    }

    @Test
    void penicillinMatchesLme4() throws IOException {
        // lme4: lmer(diameter ~ 1 + (1|plate) + (1|sample), Penicillin), REML.
        // Published: plate 0.71691, sample 3.73113, residual 0.30241 (default optimiser).
        List<CSVRecord> rows = Fixtures.csv("penicillin.csv");
        double[] y = rows.stream().mapToDouble(r -> Double.parseDouble(r.get("diameter"))).toArray();
        RemlFit model = new RemlFit(List.of("plate", "sample"),
                List.of(Fixtures.levels(rows, "plate"), Fixtures.levels(rows, "sample")), null);
        RemlResult fit = model.fit(y);
        Map<String, Double> ref = Fixtures.components("penicillin_lme4.csv");
        assertRelative(ref.get("plate"), fit.variance("plate"), RELATIVE, "plate");
        assertRelative(ref.get("sample"), fit.variance("sample"), RELATIVE, "sample");
        assertRelative(ref.get("Residual"), fit.residualVariance(), RELATIVE, "residual");
        assertEquals(ref.get("(REMLcrit)"), fit.remlCriterion(), 1e-6, "REML criterion");
        assertEquals(0.71691, fit.variance("plate"), 1e-4);
        assertEquals(3.73113, fit.variance("sample"), 3e-4); // published value from the default optimiser
        assertEquals(0.30241, fit.residualVariance(), 1e-4);
    }

    @org.junit.jupiter.params.ParameterizedTest(name = "{0}")
    @org.junit.jupiter.params.provider.ValueSource(strings = {"dyestuff", "dyestuff2"})
    void oneGroupingFactorMatchesLme4(String data) throws IOException {
        // lme4: lmer(Yield ~ 1 + (1|Batch), Dyestuff / Dyestuff2), REML. Dyestuff2's batch variance is
        // exactly 0 in lme4 (a boundary, "singular" fit); ours must be an exact 0 too.
        List<CSVRecord> rows = Fixtures.csv(data + ".csv");
        double[] y = rows.stream().mapToDouble(r -> Double.parseDouble(r.get("Yield"))).toArray();
        RemlFit model = new RemlFit(List.of("Batch"), List.of(Fixtures.levels(rows, "Batch")), null);
        RemlResult fit = model.fit(y);
        Map<String, Double> ref = Fixtures.components(data + "_lme4.csv");
        if (ref.get("Batch") == 0) {
            assertEquals(0.0, fit.variance("Batch"), 0.0, "exact zero");
        } else {
            assertRelative(ref.get("Batch"), fit.variance("Batch"), RELATIVE, "batch");
        }
        assertRelative(ref.get("Residual"), fit.residualVariance(), RELATIVE, "residual");
        assertEquals(ref.get("(REMLcrit)"), fit.remlCriterion(), 1e-6, "REML criterion");
    }

    @Test
    void unbalancedCrossedCaseByReaderInCentreMatchesLme4() throws IOException {
        // Invented design (lme4_reml.R): 14 cases x 9 readers in 3 centres, ~15% cells removed;
        // lmer(y ~ 1 + (1|case) + (1|centre) + (1|centre:reader)), REML.
        List<CSVRecord> rows = Fixtures.csv("crossed.csv");
        double[] y = rows.stream().mapToDouble(r -> Double.parseDouble(r.get("y"))).toArray();
        RemlFit model = new RemlFit(List.of("case", "centre", "centre:reader"),
                List.of(Fixtures.levels(rows, "case"), Fixtures.levels(rows, "centre"),
                        Fixtures.levels(rows, "centre", "reader")), null);
        RemlResult fit = model.fit(y);
        Map<String, Double> ref = Fixtures.components("crossed_lme4.csv");
        assertRelative(ref.get("case"), fit.variance("case"), RELATIVE, "case");
        assertRelative(ref.get("centre"), fit.variance("centre"), RELATIVE, "centre");
        assertRelative(ref.get("centre:reader"), fit.variance("centre:reader"), RELATIVE, "reader in centre");
        assertRelative(ref.get("Residual"), fit.residualVariance(), RELATIVE, "residual");
        assertEquals(ref.get("(REMLcrit)"), fit.remlCriterion(), 1e-6, "REML criterion");
        // the model without the centre term, same data: lme4's REML criterion
        RemlFit reduced = new RemlFit(List.of("case", "centre:reader"),
                List.of(Fixtures.levels(rows, "case"), Fixtures.levels(rows, "centre", "reader")), null);
        double ref0 = Fixtures.components("crossed_null_lme4.csv").get("(REMLcrit0)");
        assertEquals(ref0, reduced.fit(y).remlCriterion(), 1e-6, "REML criterion without centre");
    }

    @Test
    void zeroComponentIsReachedExactly() {
        // a x b fully crossed, 2 replicates per cell, random noise; the b-level means are then made
        // exactly equal, so MS_b = 0 < MS_e and the REML estimate of sigma2_b is on the boundary.
        int n = 40;
        int[] a = new int[n];
        int[] b = new int[n];
        double[] y = new double[n];
        java.util.Random random = new java.util.Random(3);
        double[] effectA = {3, -1, 0.5, -2.5};
        double[] bSum = new double[5];
        for (int i = 0; i < n; i++) {
            a[i] = i % 4;
            b[i] = (i / 4) % 5;
            y[i] = random.nextGaussian();
            bSum[b[i]] += y[i];
        }
        for (int i = 0; i < n; i++) {
            y[i] += effectA[a[i]] - bSum[b[i]] / 8;
        }
        RemlFit model = new RemlFit(List.of("a", "b"), List.of(a, b), null);
        RemlResult fit = model.fit(y);
        assertEquals(0.0, fit.variance("b"), 0.0, "exact zero on the boundary");
        assertTrue(fit.variance("a") > 1);
    }

    @Test
    void criterionEqualsDenseRemlLogLikelihood() {
        // Brute-force oracle: -2 REML log-lik computed from V directly, log|V| + log|X'V^-1X| + r'V^-1 r
        // + (n-p) log(2 pi), at an arbitrary theta and the implied sigma2 profile.
        int n = 18;
        int[] f1 = new int[n];
        int[] f2 = new int[n];
        double[] y = new double[n];
        java.util.Random random = new java.util.Random(11);
        for (int i = 0; i < n; i++) {
            f1[i] = i % 3;
            f2[i] = (i * 7) % 5;
            y[i] = random.nextGaussian() + f1[i];
        }
        RemlFit model = new RemlFit(List.of("f1", "f2"), List.of(f1, f2), null);
        RemlResult fit = model.fit(y);
        double s2e = fit.residualVariance();
        double[] s2 = fit.variances();
        org.apache.commons.math3.linear.RealMatrix v = new org.apache.commons.math3.linear.Array2DRowRealMatrix(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double value = (i == j ? s2e : 0) + (f1[i] == f1[j] ? s2[0] : 0) + (f2[i] == f2[j] ? s2[1] : 0);
                v.setEntry(i, j, value);
            }
        }
        org.apache.commons.math3.linear.CholeskyDecomposition chol = new org.apache.commons.math3.linear.CholeskyDecomposition(v);
        org.apache.commons.math3.linear.RealMatrix vi = chol.getSolver().getInverse();
        org.apache.commons.math3.linear.RealVector one = new org.apache.commons.math3.linear.ArrayRealVector(n, 1.0);
        double xtvix = one.dotProduct(vi.operate(one));
        org.apache.commons.math3.linear.RealVector yy = new org.apache.commons.math3.linear.ArrayRealVector(y);
        double beta = one.dotProduct(vi.operate(yy)) / xtvix;
        org.apache.commons.math3.linear.RealVector r = yy.subtract(one.mapMultiply(beta));
        double dense = Math.log(chol.getDeterminant()) + Math.log(xtvix) + r.dotProduct(vi.operate(r))
                + (n - 1) * Math.log(2 * Math.PI);
        assertEquals(dense, fit.remlCriterion(), 1e-8 * Math.abs(dense));
        assertEquals(beta, fit.beta()[0], 1e-9);
    }

    /**
     * Regression: on these data (variance-measure rows of a simulated null study, 3 centres x 3
     * readers x 12 cases, generator seed 9033492840204814643, analysis seed 20261307) commons-math's
     * BOBYQA from the start theta = (4, 4) stops with "trust region step has failed to reduce Q" on
     * the model without the centre term, which used to end the whole analysis. The fit must go on
     * and reach lme4's optimum. Reference: lme4 1.1-31 (Debian r-cran-lme4) via
     * fixtures/shift/reml_bobyqa_failure.R, output in reml_bobyqa_failure_output.txt.
     */
    @Test
    void bobyqaFailureIsRecoveredAndMatchesLme4() throws IOException {
        List<CSVRecord> rows = Fixtures.csv("reml_bobyqa_failure.csv");
        double[] y = rows.stream().mapToDouble(r -> Double.parseDouble(r.get("y"))).toArray();
        int[] caseLevels = Fixtures.levels(rows, "case");
        int[] centreLevels = Fixtures.levels(rows, "centre");
        int[] readerLevels = Fixtures.levels(rows, "centre", "reader");
        RemlFit reduced = new RemlFit(List.of("case", "reader"), List.of(caseLevels, readerLevels), null);

        // the defect is still there in the library: BOBYQA alone throws on these data from theta = (4, 4)
        org.junit.jupiter.api.Assertions.assertThrows(
                org.apache.commons.math3.exception.MathIllegalStateException.class,
                () -> new org.apache.commons.math3.optim.nonlinear.scalar.noderiv.BOBYQAOptimizer(5, 0.2, 1e-10)
                        .optimize(new org.apache.commons.math3.optim.MaxEval(50_000),
                                org.apache.commons.math3.optim.nonlinear.scalar.GoalType.MINIMIZE,
                                new org.apache.commons.math3.optim.InitialGuess(new double[] {4, 4}),
                                new org.apache.commons.math3.optim.SimpleBounds(new double[2],
                                        new double[] {1e3, 1e3}),
                                new org.apache.commons.math3.optim.nonlinear.scalar.ObjectiveFunction(
                                        t -> reduced.criterion(y, t))));

        RemlResult fit0 = reduced.fit(y);
        assertTrue(fit0.converged());
        assertTrue(fit0.notes().stream().anyMatch(n -> n.contains("BOBYQA failed")), "the fallback is noted");
        // lme4 (reml_bobyqa_failure_output.txt): case 0, reader 0.03245972349, residual 0.01429300287,
        // REMLcrit -119.4700473024
        assertEquals(0.0, fit0.variance("case"), 0.0, "case variance on the boundary");
        assertRelative(0.03245972349, fit0.variance("reader"), RELATIVE, "reader");
        assertRelative(0.01429300287, fit0.residualVariance(), RELATIVE, "residual");
        assertEquals(-119.4700473024, fit0.remlCriterion(), 1e-6, "REML criterion without centre");

        RemlFit full = new RemlFit(List.of("case", "centre", "reader"),
                List.of(caseLevels, centreLevels, readerLevels), null);
        RemlResult fit = full.fit(y);
        // lme4: case 0, centre 0.02755882898, centre:reader 0.0117906165, residual 0.01429300268,
        // REMLcrit -123.0955383031
        assertEquals(0.0, fit.variance("case"), 0.0);
        assertRelative(0.02755882898, fit.variance("centre"), RELATIVE, "centre");
        assertRelative(0.0117906165, fit.variance("reader"), RELATIVE, "reader in centre");
        assertRelative(0.01429300268, fit.residualVariance(), RELATIVE, "residual");
        assertEquals(-123.0955383031, fit.remlCriterion(), 1e-6, "REML criterion");

        // and through the variance-component step the analysis uses: no exception, LRT as lme4's
        List<ReaderMeasure> measures = rows.stream().map(r -> new ReaderMeasure(r.get("case"), r.get("centre"),
                r.get("reader"), Double.parseDouble(r.get("y")))).toList();
        VarianceComponents.Result vc = VarianceComponents.fit(measures, 0, 0, 1);
        assertEquals(3.6254910007, vc.centreTest().statistic(), 1e-5, "REML LRT (lme4 REMLcrit difference)");
        assertTrue(vc.notes().stream().anyMatch(n -> n.contains("BOBYQA failed")));
    }

    /** An objective that cannot be evaluated anywhere: the fit reports undefined components, never throws. */
    @Test
    void everyAttemptFailingGivesUndefinedComponents() {
        int[] a = {0, 0, 1, 1, 2, 2};
        int[] b = {0, 1, 0, 1, 0, 1};
        RemlFit model = new RemlFit(List.of("a", "b"), List.of(a, b), null);
        double[] huge = {1e308, -1e308, 1e308, -1e308, 1e308, -1e308};
        // y'y overflows (inf - inf), so the criterion is NaN at every theta
        assertTrue(Double.isNaN(model.criterion(huge, new double[] {1, 1})));
        RemlResult fit = model.fit(huge);
        org.junit.jupiter.api.Assertions.assertFalse(fit.converged());
        assertTrue(Double.isNaN(fit.variance("a")) && Double.isNaN(fit.residualVariance()));
        assertTrue(fit.notes().stream().anyMatch(n -> n.contains("every optimisation attempt failed")));
        List<ReaderMeasure> rows = new java.util.ArrayList<>();
        for (int i = 0; i < 6; i++) {
            rows.add(new ReaderMeasure("case" + a[i], "centre" + b[i], "r" + b[i], huge[i]));
        }
        VarianceComponents.Result vc = VarianceComponents.fit(rows, 5, 5, 1);
        assertTrue(vc.components().stream().allMatch(c -> Double.isNaN(c.estimate())), "undefined, not thrown");
        assertTrue(vc.notes().stream().anyMatch(n -> n.contains("every optimisation attempt failed")));
    }
}
