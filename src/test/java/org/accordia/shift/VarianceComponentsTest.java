package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;

import org.apache.commons.csv.CSVRecord;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;

class VarianceComponentsTest {

    static List<ReaderMeasure> crossed() throws IOException {
        List<ReaderMeasure> rows = new ArrayList<>();
        for (CSVRecord r : Fixtures.csv("crossed.csv")) {
            rows.add(new ReaderMeasure(r.get("case"), r.get("centre"), r.get("reader"), Double.parseDouble(r.get("y"))));
        }
        return rows;
    }

    @Test
    void crossedDesignMatchesLme4AndTestsCentre() throws IOException {
        // lme4 (lme4_reml.R): lmer(y ~ 1 + (1|case) + (1|centre) + (1|centre:reader)) and the model
        // without (1|centre); their REML criteria give the likelihood-ratio statistic.
        Map<String, Double> ref = Fixtures.components("crossed_lme4.csv");
        double lrt = Fixtures.components("crossed_null_lme4.csv").get("(REMLcrit0)") - ref.get("(REMLcrit)");
        VarianceComponents.Result r = VarianceComponents.fit(crossed(), 40, 0, 99);
        assertEquals(4, r.components().size());
        String[] names = {"case", "centre", "reader", "residual"};
        String[] lme4Names = {"case", "centre", "centre:reader", "Residual"};
        for (int i = 0; i < 4; i++) {
            VarianceComponents.Component c = r.components().get(i);
            assertEquals(names[i], c.name());
            assertEquals(ref.get(lme4Names[i]), c.estimate(), 1e-4 * ref.get(lme4Names[i]), names[i]);
            assertTrue(c.lower() <= c.upper(), names[i]);
            assertTrue(c.lower() >= 0, names[i]);
        }
        assertEquals(lrt, r.centreTest().statistic(), 1e-5);
        // Self & Liang (1987): p = P(chi2_1 > LRT)/2
        double p = 0.5 * (1 - new ChiSquaredDistribution(1).cumulativeProbability(lrt));
        assertEquals(p, r.centreTest().pValue(), 1e-9);
        assertTrue(r.centreTest().method().contains("1/2 chi2(0) + 1/2 chi2(1)"));
        assertEquals(r.observations(), Fixtures.csv("crossed.csv").size());
    }

    @Test
    void bootstrapCentreTestIsSeededAndDefined() throws IOException {
        VarianceComponents.Result a = VarianceComponents.fit(crossed(), 0, 19, 5);
        VarianceComponents.Result b = VarianceComponents.fit(crossed(), 0, 19, 5);
        assertEquals(a.centreTest().pValue(), b.centreTest().pValue(), 0.0);
        assertTrue(a.centreTest().pValue() >= 1.0 / 20 && a.centreTest().pValue() <= 1.0);
        assertEquals(19, a.centreTest().resamples());
        assertTrue(a.centreTest().method().contains("parametric bootstrap"));
    }

    @Test
    void nullCentreBootstrapTestIsNotAntiConservativeOnAverage() {
        // Unit-level calibration: data without a centre effect; p-values of the mixture test over
        // 40 seeded data sets: rejection at 0.05 no more often than alpha + 2 SE (the mixture is
        // known to be conservative with few centres; Stram & Lee 1994).
        Random random = new Random(77);
        int reject = 0;
        int runs = 40;
        for (int run = 0; run < runs; run++) {
            List<ReaderMeasure> rows = new ArrayList<>();
            double[] caseEffect = new double[10];
            for (int c = 0; c < 10; c++) {
                caseEffect[c] = random.nextGaussian();
            }
            for (int g = 0; g < 3; g++) {
                for (int r = 0; r < 3; r++) {
                    double reader = 0.5 * random.nextGaussian();
                    for (int c = 0; c < 10; c++) {
                        rows.add(new ReaderMeasure("c" + c, "g" + g, "r" + r, caseEffect[c] + reader + random.nextGaussian()));
                    }
                }
            }
            if (VarianceComponents.fit(rows, 0, 0, run).centreTest().pValue() <= 0.05) {
                reject++;
            }
        }
        assertTrue(reject <= runs * 0.05 + 2 * Math.sqrt(runs * 0.05 * 0.95), "rejections " + reject);
    }

    @Test
    void singleCentreLeavesTheCentreTermOut() {
        List<ReaderMeasure> rows = new ArrayList<>();
        Random random = new Random(1);
        for (int c = 0; c < 6; c++) {
            for (int r = 0; r < 3; r++) {
                rows.add(new ReaderMeasure("c" + c, "only", "r" + r, random.nextGaussian()));
            }
        }
        rows.add(new ReaderMeasure("c0", "only", "r9", Double.NaN));
        VarianceComponents.Result result = VarianceComponents.fit(rows, 0, 0, 1);
        assertNull(result.centreTest());
        assertEquals(List.of("case", "reader", "residual"), result.components().stream().map(VarianceComponents.Component::name).toList());
        assertTrue(result.notes().stream().anyMatch(n -> n.contains("only one centre level")), result.notes().toString());
        assertTrue(result.notes().stream().anyMatch(n -> n.contains("undefined")), result.notes().toString());
        assertEquals(18, result.observations());
        assertNotNull(result.intervalMethod());
    }
}
