package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.accordia.agreement.PatternHistogram;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Binary STAPLE against the general-purpose toolkit's filter: itk::STAPLEImageFilter (ITK 5.2,
 * Debian libinsighttoolkit5-dev). Fixtures, the C++ program, the commands and its output are in
 * src/test/resources/fixtures/consensus/itk/ (run.sh regenerates them).
 *
 * <p>The filter starts like ours (W = fraction of readers, M-step first), uses the prior g =
 * mean foreground fraction × confidence weight, and stops at the first iteration after the first
 * where every squared change of p and q is at most 1e-14, i.e. |Δ| ≤ 1e-7 (hard-coded in
 * itkSTAPLEImageFilter.hxx). Its elapsed-iteration counter is the 0-based index of that
 * iteration. Run with tolerance 1e-7 our EM therefore stops at exactly one more iteration than the
 * filter's counter, with the same parameters up to rounding; with our default tolerance 1e-10 the
 * values differ from the filter's by less than 1e-6.
 */
class BinaryStapleItkTest {
    private static final String DIR = "/fixtures/consensus/itk/";

    @Test
    void workedExampleMatchesToolkit() {
        // Three readers over ten voxels (r1 = 1111100000, r2 = 1111000000, r3 = 0111111000), prior
        // 0.5: the filter gives p = (1, 0.8, 0.8), q = (1, 1, 0.6), W ≈ 1 on voxels 1-5, ≈ 0 after.
        boolean[][] d = Fixtures.readMasks(DIR + "worked.txt");
        StapleResult res = BinaryStaple.run(Fixtures.histogram(d));
        assertEquals(0.5, res.prior(), 0);
        double[] p = {1, 0.8, 0.8};
        double[] q = {1, 1, 0.6};
        for (int j = 0; j < 3; j++) {
            assertEquals(p[j], res.sensitivity(j), 1e-6);
            assertEquals(q[j], res.specificity(j), 1e-6);
        }
        for (int i = 0; i < 10; i++) {
            assertEquals(i < 5 ? 1.0 : 0.0, res.weightOfPattern(Fixtures.pattern(d, i)), 1e-6);
        }
        assertEquals(5, res.consensusCount());
    }

    @ParameterizedTest(name = "{0} weight {1}")
    @CsvSource({
        "worked.txt, worked.out",
        "random_a.txt, random_a.out",
        "random_b.txt, random_b.out",
        "random_c.txt, random_c.out",
        "random_b.txt, random_b_weight0.6.out"
    })
    void matchesToolkitOutput(String fixture, String output) {
        boolean[][] d = Fixtures.readMasks(DIR + fixture);
        PatternHistogram h = Fixtures.histogram(d);
        Fixtures.ItkOutput itk = Fixtures.readItk(DIR + output);

        // Same stopping rule as the filter: identical iteration count, values to rounding.
        StapleResult same = BinaryStaple.run(h, StapleOptions.defaults().withFixedPrior(itk.prior()).withTolerance(1e-7));
        assertEquals(itk.elapsedIterations() + 1, same.iterations());
        compare(itk, same, h, 1e-9, 1e-9);
        if (output.equals(fixture.replace(".txt", ".out"))) {
            // the prior we estimate is the one the filter estimates
            assertEquals(itk.prior(), BinaryStaple.run(h).prior(), 1e-15);
        }
        // Our default tolerance (1e-10) runs a few iterations past the filter's stop: p and q stay
        // within 1e-6 of the filter's; W, being a ratio of products over up to 12 readers,
        // amplifies the remaining change (measured: 1.4e-6 on random_c), so within 1e-5.
        StapleResult ours = BinaryStaple.run(h, StapleOptions.defaults().withFixedPrior(itk.prior()));
        compare(itk, ours, h, 1e-6, 1e-5);
        if (itk.wVoxel() != null) {
            for (int i = 0; i < itk.wVoxel().length; i++) {
                assertEquals(itk.wVoxel()[i], same.weightOfPattern(Fixtures.pattern(d, i)), 1e-9);
            }
        }
    }

    private static void compare(Fixtures.ItkOutput itk, StapleResult res, PatternHistogram h, double tol, double wTol) {
        for (int j = 0; j < h.readers(); j++) {
            assertEquals(itk.p()[j], res.sensitivity(j), tol, "p" + j);
            assertEquals(itk.q()[j], res.specificity(j), tol, "q" + j);
        }
        List<long[]> pc = itk.patternCounts();
        assertEquals(h.size(), pc.size());
        for (int i = 0; i < pc.size(); i++) {
            assertEquals(h.pattern(i), pc.get(i)[0]);
            assertEquals(h.count(i), pc.get(i)[1]);
            assertEquals(itk.patternW().get(i), res.weight(i), wTol, "W of pattern " + pc.get(i)[0]);
        }
    }
}
