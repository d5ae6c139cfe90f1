package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.demo.ExtraPlants;
import org.accordia.report.DecisionWords;
import org.accordia.shift.CentreRow;
import org.accordia.shift.LabelShiftSummary;
import org.accordia.shift.ShiftSettings;
import org.accordia.shift.Wording;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Every sentence of the decision is true of the numbers beside it, on generated studies of several
 * designs (null, a shifted centre, a local inclusion, a wide reader, two centres, a one-reader
 * centre, missed lesions): numbers are parsed back out of the words and compared with the result
 * they describe.
 */
class DecisionSentencesTest {
    private static final Pattern P_EXACT = Pattern.compile("p = ([0-9.]+) \\((\\d+) of ([0-9,]+) distinct reader");
    private static final Pattern P_MC = Pattern.compile(
        "p = ([0-9.]+) \\(Monte Carlo: ([0-9,]+) of ([0-9,]+) random reader [a-z]+ at least as large; 95% interval "
            + "([0-9.]+) to ([0-9.]+)\\)");
    private static final Pattern DRAWS = Pattern.compile(
        "draws ([0-9.]+) mm \\[(-?[0-9.]+), (-?[0-9.]+)\\] (outside|inside)");
    private static final Pattern VOLUMES = Pattern.compile(
        "volumes ([0-9.]+)% \\[(-?[0-9.]+)%, (-?[0-9.]+)%\\] (larger|smaller)");
    private static final Pattern ADJ = Pattern.compile(
        "(\\d+) of (\\d+) cases \\(([0-9.]+)%\\) need adjudication, more than ([0-9.]+)%");
    private static final Pattern DICE = Pattern.compile("median pairwise Dice ([0-9.]+) is below ([0-9.]+)");
    private static final Pattern RECAL = Pattern.compile("(\\d+) readers? needs? recalibration");
    private static final Pattern SURFACE_BEYOND = Pattern.compile(
        "draws ([0-9.]+) mm \\[(-?[0-9.]+), (-?[0-9.]+)\\] [a-z]+ [^;]*;[^;]*; the surface( and volume)? intervals? lies? "
            + "(entirely )?beyond the minimum shift \\(([0-9.]+) mm");
    private static final Pattern LOCAL = Pattern.compile(
        "([0-9.]+) points \\[(-?[0-9.]+), (-?[0-9.]+)\\] more than [^;]*(;[^;]*)?; the excess interval lies entirely "
            + "above the minimum \\(([0-9.]+) points\\)");

    private static double num(String s) {
        return Double.parseDouble(s.replace(",", ""));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({
        "null 3x3,          3, 3, 0.0, 0, 0.0, 0.0, 0, 11",
        "shifted centre,    3, 3, 1.5, 0, 0.0, 0.0, 0, 12",
        "local inclusion,   3, 3, 0.0, 0, 6.0, 0.0, 0, 13",
        "wide reader,       3, 3, 0.0, 0, 0.0, 1.5, 0, 14",
        "two centres of 3,  2, 3, 1.5, 0, 0.0, 0.0, 0, 15",
        "one-reader centre, 3, 0, 1.5, 0, 0.0, 0.0, 0, 16",
        "missed lesions,    3, 2, 0.0, 4, 0.0, 0.0, 2, 17",
    })
    void sentencesMatchTheirNumbers(String name, int centres, int readers, double shiftMm, int missed, double inclusionMm,
            double wideMm, int hard, long seed) throws Exception {
        DemoSpec spec = DemoSpec.defaults().withSeed(seed).withRoster(8, centres, readers == 0 ? 3 : readers)
            .withGrid(48, 48, 16, 1.0, 1.0, 2.0).withPlants(shiftMm, missed, hard);
        ExtraPlants extra = ExtraPlants.NONE;
        if (readers == 0) {
            extra = extra.withRoster(List.of(3, 3, 1));
        }
        if (inclusionMm > 0) {
            extra = extra.withInclusion(1, inclusionMm);
        }
        if (wideMm > 0) {
            extra = extra.withWideReader(2, 0, wideMm);
        }
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(spec, extra);
        ShiftSettings settings = StudyAnalysis.shiftSettings(StudyAnalysisTest.protocol()).withResampling(999, 300, 0, 0);
        StudyResult r = StudyAnalysis.run(CaseSource.of(demo.caseIds(), demo::load, null), StudyAnalysisTest.protocol(),
            new AnalysisOptions(2, settings, false));
        for (LabelResult l : r.labels()) {
            check(l, settings);
        }
    }

    private static void check(LabelResult l, ShiftSettings s) {
        LabelShiftSummary sum = l.summary();
        List<String> sentences = new ArrayList<>(sum.reasons());
        sum.designLimitations().forEach(d -> sentences.add(DecisionWords.design(d, s.alpha())));
        sum.casesToAdjudicate().forEach(c -> sentences.addAll(c.reasons()));
        sum.readersToRecalibrate().forEach(c -> sentences.addAll(c.reasons()));
        String all = String.join("\n", sentences);
        assertFalse(all.contains("alpha ="), all);
        assertFalse(all.contains("-0.0") || all.contains("[0.0,") && all.contains("excludes"), all);
        assertFalse(all.matches("(?s).*\\b(\\d+\\.\\d+) is below \\1\\b.*"), all);
        double p = l.shift().permutation().pValue();
        int matched = 0;
        for (String t : sentences) {
            Matcher m = P_EXACT.matcher(t);
            while (m.find()) {
                matched++;
                long k = Long.parseLong(m.group(2));
                long n = (long) num(m.group(3));
                assertEquals(Wording.plain((double) k / n, 3), m.group(1), t);
                assertTrue(k >= 1 && k <= n, t);
            }
            if (t.contains("the permutation test gives p = ")) {
                Matcher x = Pattern.compile("the permutation test gives p = ([0-9.]+)").matcher(t);
                assertTrue(x.find());
                assertEquals(Wording.plain(p, l.shift().permutation().exact() ? 3 : 2), x.group(1), t);
                assertEquals(p <= s.alpha() && l.shift().permutation().canReachAlpha(), t.contains(", at most α"), t);
            }
            m = P_MC.matcher(t);
            while (m.find()) {
                matched++;
                double lo = num(m.group(4));
                double hi = num(m.group(5));
                double k = num(m.group(2));
                double mm = num(m.group(3));
                assertTrue(lo <= k / mm * 1.05 + 1e-9 && k / mm <= hi * 1.05 + 1e-9, t);
            }
            m = DRAWS.matcher(t);
            while (m.find()) {
                matched++;
                double est = num(m.group(1));
                assertTrue(num(m.group(2)) <= est + 1e-9 && est <= num(m.group(3)) + 1e-9, "estimate inside its interval: " + t);
            }
            m = VOLUMES.matcher(t);
            while (m.find()) {
                matched++;
                double est = num(m.group(1));
                assertTrue(num(m.group(2)) <= est + 1e-9 && est <= num(m.group(3)) + 1e-9, "estimate inside its interval: " + t);
            }
            m = SURFACE_BEYOND.matcher(t);
            while (m.find()) {
                matched++;
                assertTrue(num(m.group(2)) > num(m.group(6)), "the surface interval is beyond the minimum: " + t);
            }
            m = LOCAL.matcher(t);
            while (m.find()) {
                matched++;
                assertTrue(num(m.group(2)) > num(m.group(5)), "the excess interval is above the minimum: " + t);
            }
            m = ADJ.matcher(t);
            while (m.find()) {
                matched++;
                assertEquals(sum.casesToAdjudicate().size(), Integer.parseInt(m.group(1)), t);
                assertTrue(num(m.group(3)) > num(m.group(4)), t);
            }
            m = DICE.matcher(t);
            while (m.find()) {
                matched++;
                assertTrue(num(m.group(1)) < num(m.group(2)), t);
            }
            m = RECAL.matcher(t);
            while (m.find()) {
                matched++;
                assertEquals(sum.readersToRecalibrate().size(), Integer.parseInt(m.group(1)), t);
            }
            if (t.startsWith("No centre shift")) {
                assertTrue(sum.shift().flaggedCentres().isEmpty(), t);
                assertTrue(sum.readersToRecalibrate().isEmpty(), t);
            }
        }
        assertTrue(matched >= 1, "no sentence with numbers was checked: " + all);
        if (System.getProperty("accordia.print.decisions") != null) {
            System.out.println(l.name() + ": " + all);
        }
        // every flagged centre is named in a reason, with the flag in centres.csv
        for (String c : sum.shift().flaggedCentres()) {
            assertTrue(sum.reasons().stream().anyMatch(x -> x.contains(c)), c + " flagged but not named: " + all);
            assertTrue(l.shift().centreRows().stream().filter(row -> row.centre().equals(c)).map(CentreRow::flag)
                .anyMatch(f -> f.equals("shift") || f.equals("differ")), c);
        }
        // the design sentences are there exactly when the design is limited
        assertEquals(!l.shift().permutation().canReachAlpha() && !Double.isNaN(p),
            sum.designLimitations().stream().anyMatch(d -> d.kind().key().equals("cannot-reach-alpha")), all);
    }
}
