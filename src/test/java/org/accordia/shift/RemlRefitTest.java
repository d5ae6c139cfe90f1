package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The bootstrap refits ({@link RemlFit#fit(double[], double[])}: Nelder–Mead from a given start)
 * against the full fit ({@link RemlFit#fit(double[])}: BOBYQA from three starts at tolerance 1e-10,
 * itself checked against lme4 in {@link RemlFitTest}), on data simulated as the analysis simulates
 * them: from a fitted model, refitted from that fit's θ. The refit must reach the full fit's
 * criterion (never more than 1e-7 above it) and the same variance components (to 1e-4 of the total
 * variance). Designs: readers nested in centres, crossed with cases, as in a study; balanced and
 * with a tenth of the measurements missing; with and without the centre term; true centre variance
 * zero (the null, optimum on the boundary) and positive.
 */
class RemlRefitTest {

    @ParameterizedTest(name = "{0} cases, {1} centres x {2} readers, sd case {3}, centre {4}, reader {5}, "
            + "missing {6}, centre term {7}")
    @CsvSource({
        "12, 3, 3, 0.5, 0.0, 0.2, 0.0, true",
        "12, 3, 3, 0.5, 0.6, 0.2, 0.0, true",
        "20, 3, 3, 0.1, 0.3, 0.1, 0.1, true",
        "10, 2, 4, 1.0, 1.0, 0.0, 0.0, true",
        "8, 4, 2, 0.0, 0.4, 0.3, 0.1, true",
        "12, 3, 3, 0.5, 0.0, 0.2, 0.0, false",
        "15, 3, 3, 0.3, 0.0, 0.0, 0.1, false",
    })
    void refitsReachTheFullFit(int cases, int centres, int readersPerCentre, double sdCase, double sdCentre,
            double sdReader, double missing, boolean centreTerm) {
        Random rnd = new Random(cases * 1000L + centres * 100L + readersPerCentre + (centreTerm ? 7 : 0));
        List<int[]> rows = new ArrayList<>();
        for (int c = 0; c < cases; c++) {
            for (int g = 0; g < centres; g++) {
                for (int r = 0; r < readersPerCentre; r++) {
                    if (rnd.nextDouble() >= missing) {
                        rows.add(new int[] {c, g, g * readersPerCentre + r});
                    }
                }
            }
        }
        int n = rows.size();
        int[] caseLevel = rows.stream().mapToInt(r -> r[0]).toArray();
        int[] centreLevel = rows.stream().mapToInt(r -> r[1]).toArray();
        int[] readerLevel = rows.stream().mapToInt(r -> r[2]).toArray();
        RemlFit model = centreTerm
                ? new RemlFit(List.of("case", "centre", "reader"), List.of(caseLevel, centreLevel, readerLevel), null)
                : new RemlFit(List.of("case", "reader"), List.of(caseLevel, readerLevel), null);
        // the "observed" data: drawn from the stated standard deviations, residual sd 0.3
        double[] y = new double[n];
        double[] uCase = gaussians(rnd, cases, sdCase);
        double[] uCentre = gaussians(rnd, centres, sdCentre);
        double[] uReader = gaussians(rnd, centres * readersPerCentre, sdReader);
        for (int i = 0; i < n; i++) {
            y[i] = 1.0 + uCase[caseLevel[i]] + uCentre[centreLevel[i]] + uReader[readerLevel[i]]
                    + 0.3 * rnd.nextGaussian();
        }
        RemlResult fit = model.fit(y);
        assertTrue(fit.converged());
        Random sim = RemlFit.random(99);
        int atBoundary = 0;
        for (int b = 0; b < 40; b++) {
            double[] ys = model.simulate(fit, sim);
            RemlResult full = model.fit(ys);
            RemlResult refit = model.fit(ys, fit.theta());
            assertTrue(full.converged() && refit.converged());
            assertTrue(refit.remlCriterion() <= full.remlCriterion() + 1e-7,
                    "resample " + b + ": refit criterion " + refit.remlCriterion() + " vs full " + full.remlCriterion());
            double total = full.residualVariance();
            for (double v : full.variances()) {
                total += v;
            }
            for (int k = 0; k < full.variances().length; k++) {
                assertEquals(full.variances()[k], refit.variances()[k], 1e-4 * total, "resample " + b + ", component " + k);
                atBoundary += full.variances()[k] == 0 ? 1 : 0;
            }
            assertEquals(full.residualVariance(), refit.residualVariance(), 1e-4 * total, "resample " + b + ", residual");
        }
        if (sdCentre == 0 && centreTerm) {
            assertTrue(atBoundary > 0, "the null designs put some refits on the boundary");
        }
    }

    private static double[] gaussians(Random rnd, int count, double sd) {
        double[] u = new double[count];
        for (int i = 0; i < count; i++) {
            u[i] = sd * rnd.nextGaussian();
        }
        return u;
    }
}
