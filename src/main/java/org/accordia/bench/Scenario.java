package org.accordia.bench;

import java.math.BigInteger;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.demo.ExtraPlants;

/**
 * One calibration scenario: a study design and what is planted in it (docs/calibration.md lists
 * them). Every run of a scenario generates a fresh study from the base spec with its own seed.
 *
 * @param key the scenario's name on the command line ({@code --scenario})
 * @param title what it plants, in words
 * @param kind which criteria apply
 * @param defaultRuns runs without {@code --runs}
 * @param stream the seed stream: run i uses generator seed {@code mix(seed, stream, i)}
 * @param roster readers at each centre, in centre order
 * @param centreShiftMm margin of every reader of the generator's shifted centre (the second one), or 0
 * @param hardCases cases with large reader disagreement
 * @param wideReaderMm how much wider the one wide reader draws (the first reader of the third
 *     centre), or 0
 * @param inclusionMm how far the local inclusion at the second centre reaches, or 0
 */
public record Scenario(String key, String title, Kind kind, int defaultRuns, long stream, List<Integer> roster,
                       double centreShiftMm, int hardCases, double wideReaderMm, double inclusionMm) {

    /** Which criteria a scenario is judged by. */
    public enum Kind {
        /** No centre effect: false flags, reviews and reader flags stay rare. */
        NULL,
        /** One centre draws differently: it is found, the others are left alone. */
        CENTRE,
        /** One reader draws wider: the reader is named, its centre is left alone. */
        READER
    }

    /** The centre that carries a centre plant (the generator's shifted centre; also the inclusion's). */
    public static final int PLANTED_CENTRE = 1;
    /** The wide reader: the first reader of the third centre. */
    public static final int WIDE_READER_CENTRE = 2;

    public Scenario {
        roster = List.copyOf(roster);
        if (roster.isEmpty() || defaultRuns < 1) {
            throw new IllegalArgumentException("a scenario needs a roster and at least one run");
        }
    }

    /**
     * The scenarios (order of the output).
     *
     * @param shiftMm the planted centre margin of the shifted scenarios and the wide reader's margin
     * @param inclusionMm how far the local inclusion reaches
     * @param hardCases hard cases in the hard-case scenario
     */
    public static List<Scenario> all(double shiftMm, double inclusionMm, int hardCases) {
        List<Integer> three = List.of(3, 3, 3);
        String mm = BenchNumbers.text(Math.abs(shiftMm));
        List<Scenario> out = new ArrayList<>();
        out.add(new Scenario("null", "no centre effect (reader noise only), 3 centres x 3 readers", Kind.NULL, 200, 1,
            three, 0, 0, 0, 0));
        out.add(new Scenario("plus", "every reader of norvale draws " + mm + " mm wider, 3 x 3", Kind.CENTRE, 200, 2,
            three, Math.abs(shiftMm), 0, 0, 0));
        out.add(new Scenario("minus", "every reader of norvale draws " + mm + " mm narrower, 3 x 3", Kind.CENTRE, 100, 3,
            three, -Math.abs(shiftMm), 0, 0, 0));
        out.add(new Scenario("inclusion", "every reader of norvale adds a local inclusion reaching "
            + BenchNumbers.text(inclusionMm) + " mm out on one side of the lesion, 3 x 3", Kind.CENTRE, 100, 4, three,
            0, 0, 0, inclusionMm));
        out.add(new Scenario("wide-reader", "one reader (quillbay/qui1) draws " + mm + " mm wider, 3 x 3", Kind.READER,
            100, 5, three, 0, 0, Math.abs(shiftMm), 0));
        out.add(new Scenario("hard", hardCases + " hard cases (noise 3 mm, case-specific reader biases up to 2.5 mm),"
            + " no centre effect, 3 x 3", Kind.NULL, 100, 6, three, 0, hardCases, 0, 0));
        out.add(new Scenario("centres-2", "2 centres x 3 readers, norvale " + mm + " mm wider", Kind.CENTRE, 100, 7,
            List.of(3, 3), Math.abs(shiftMm), 0, 0, 0));
        out.add(new Scenario("centres-4", "4 centres x 3 readers, norvale " + mm + " mm wider", Kind.CENTRE, 100, 8,
            List.of(3, 3, 3, 3), Math.abs(shiftMm), 0, 0, 0));
        out.add(new Scenario("centres-6", "6 centres x 3 readers, norvale " + mm + " mm wider", Kind.CENTRE, 100, 9,
            List.of(3, 3, 3, 3, 3, 3), Math.abs(shiftMm), 0, 0, 0));
        out.add(new Scenario("unequal", "unequal rosters 3, 2, 1 readers (quillbay has one reader), no centre effect",
            Kind.NULL, 100, 10, List.of(3, 2, 1), 0, 0, 0, 0));
        return List.copyOf(out);
    }

    /** The keys of {@link #all}, for messages. */
    public static List<String> keys() {
        return all(1.5, 6, 3).stream().map(Scenario::key).toList();
    }

    /** Run i's generator spec: the base grid, noise and case count; this scenario's roster and plants. */
    public DemoSpec spec(DemoSpec base, long seed, int i) {
        int maxReaders = roster.stream().mapToInt(Integer::intValue).max().orElseThrow();
        return base.withSeed(DemoGenerator.mix(seed, stream, i)).withRoster(base.cases(), roster.size(), maxReaders)
            .withPlants(centreShiftMm, 0, Math.min(hardCases, base.cases()));
    }

    /** Run i's extra plants. */
    public ExtraPlants extras() {
        ExtraPlants e = ExtraPlants.NONE;
        if (roster.stream().distinct().count() > 1) {
            e = e.withRoster(roster);
        }
        if (wideReaderMm != 0) {
            e = e.withWideReader(WIDE_READER_CENTRE, 0, wideReaderMm);
        }
        if (inclusionMm > 0) {
            e = e.withInclusion(PLANTED_CENTRE, inclusionMm);
        }
        return e;
    }

    /** The direction the planted centre should be flagged in: +1 wider, −1 narrower, 0 none planted. */
    public int plantedDirection() {
        if (inclusionMm > 0) {
            return 1;
        }
        return (int) Math.signum(centreShiftMm);
    }

    /**
     * Distinct reader partitions of this roster into centres of its sizes: N!/(∏ n_c! · ∏_k m_k!)
     * with m_k the number of centres of size k (centres of equal size are interchangeable). The
     * reader-permutation test can give no p below 1 over this number.
     */
    public BigInteger distinctPartitions() {
        int n = roster.stream().mapToInt(Integer::intValue).sum();
        BigInteger num = factorial(n);
        BigInteger den = BigInteger.ONE;
        Map<Integer, Integer> sizes = new TreeMap<>();
        for (int k : roster) {
            den = den.multiply(factorial(k));
            sizes.merge(k, 1, Integer::sum);
        }
        for (int m : sizes.values()) {
            den = den.multiply(factorial(m));
        }
        return num.divide(den);
    }

    /**
     * Whether the reader-permutation test can reach α at all: 1 / (distinct partitions) ≤ α, the
     * smallest p an exact test can give. (With very many partitions the analysis draws random
     * permutations; its smallest p is then 1/(1 + permutations), far below α at the defaults.)
     */
    public boolean canReachAlpha(double alpha) {
        return BigInteger.ONE.doubleValue() / distinctPartitions().doubleValue() <= alpha;
    }

    /** Whether some centre has a single reader, so its effect and that reader's bias are one number. */
    public boolean hasOneReaderCentre() {
        return roster.contains(1);
    }

    /** The roster in words, e.g. "3 x 3" or "3, 2, 1". */
    public String rosterWords() {
        boolean equal = roster.stream().distinct().count() == 1;
        return equal ? roster.size() + " x " + roster.get(0) : String.join(", ", roster.stream().map(String::valueOf)
            .toList());
    }

    /** Generator parameters in one line. */
    public String parameters() {
        return String.format(Locale.ROOT, "centres %d, readers %s, centre margin %s mm at the second centre, hard cases %d,"
            + " wide reader %s mm, inclusion %s mm", roster.size(), rosterWords(), BenchNumbers.text(centreShiftMm),
            hardCases, BenchNumbers.text(wideReaderMm), BenchNumbers.text(inclusionMm));
    }

    private static BigInteger factorial(int n) {
        BigInteger f = BigInteger.ONE;
        for (int i = 2; i <= n; i++) {
            f = f.multiply(BigInteger.valueOf(i));
        }
        return f;
    }
}
