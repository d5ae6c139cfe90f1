package org.accordia.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.function.Predicate;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.study.ReaderId;

/**
 * Calibration of the centre and reader findings by simulation (docs/calibration.md): for every
 * {@link Scenario}, many seeded studies are generated in memory and analysed by a
 * {@link StudyRunner} (the full analysis path); what the analysis found is read through
 * {@link ScenarioOutcome} and judged against the criteria of the scenario's kind, each printed as a
 * count, a rate with its exact Clopper–Pearson 95 % interval ({@link BinomialInterval}) and PASS or
 * FAIL.
 *
 * <p>Criteria (α the analysis' significance level, SE = sqrt(α(1 − α)/runs)):
 * <ul>
 *   <li>every scenario: the reported interval of the reference centre (the planted centre, else
 *       the first centre) covers the planted Δ ({@link PlantedTruth}) in ≥ 90 % of the runs; when
 *       the design cannot reach α, the decision says so in a plain sentence in 100 %; when a centre
 *       has one reader, the decision says that its effect cannot be told apart from its reader's
 *       bias in 100 %.</li>
 *   <li>{@link Scenario.Kind#NULL}: some centre flagged ≤ α + 2 SE; an "uncertain centre effect"
 *       review ≤ 10 %; a reader named for recalibration ≤ 10 %.</li>
 *   <li>{@link Scenario.Kind#CENTRE}: the planted centre flagged in the planted direction ≥ 90 %
 *       (only where the design can reach α); another centre flagged ≤ α + 2 SE.</li>
 *   <li>{@link Scenario.Kind#READER}: the wide reader named for recalibration ≥ 90 %; its centre
 *       flagged ≤ α + 2 SE.</li>
 * </ul>
 * A run whose analysis throws is listed with its seed and counts against every criterion (as a
 * flag where a flag is bad, as a miss where a detection is wanted).
 *
 * <p>Seeds: run i of a scenario uses the generator seed {@code mix(seed, stream, i)} (SplitMix64
 * finaliser; stream 1 for the null scenario and 2 for +1.5 mm as before) and the analysis seed
 * {@code seed + i}; nothing depends on the thread count.
 */
public final class Calibration {

    /** Analyses one generated study along the full path and reads its outcome. */
    @FunctionalInterface
    public interface StudyRunner {
        /**
         * @param study the study, generated in memory
         * @param analysisSeed seed of the analysis' random generators
         */
        ScenarioOutcome run(DemoGenerator.InMemory study, long analysisSeed) throws Exception;
    }

    /**
     * @param seed master seed
     * @param threads studies analysed in parallel
     * @param alpha the significance level the analysis uses
     * @param base generator spec of every run (grid, cases, noise); seed, roster and plants are the scenario's
     * @param scenarios the scenarios to run, in output order
     * @param runs runs per scenario, or 0 for each scenario's default
     */
    public record Settings(long seed, int threads, double alpha, DemoSpec base, List<Scenario> scenarios, int runs) {
        public Settings {
            scenarios = List.copyOf(scenarios);
            if (threads < 1 || runs < 0 || scenarios.isEmpty()) {
                throw new IllegalArgumentException("threads must be at least 1, runs not negative, and a scenario chosen");
            }
            if (!(alpha > 0 && alpha < 1)) {
                throw new IllegalArgumentException("alpha must lie in (0, 1)");
            }
        }

        /** Runs of one scenario. */
        public int runsOf(Scenario s) {
            return runs > 0 ? runs : s.defaultRuns();
        }

        /** Largest rate of a "≤ α + 2 SE" criterion that passes: α + 2·sqrt(α(1 − α)/runs). */
        public double nullLimit(int n) {
            return alpha + 2 * Math.sqrt(alpha * (1 - alpha) / n);
        }
    }

    /**
     * One run: its seeds, the outcome (null when the analysis failed; {@code error} then says why)
     * and the planted Δ of every centre, mm.
     */
    public record Run(String scenario, int index, long generatorSeed, long analysisSeed, ScenarioOutcome outcome,
                      Map<String, Double> plantedDeltaMm, String error) {
        public boolean failed() {
            return outcome == null;
        }
    }

    /**
     * One criterion or diagnostic row.
     *
     * @param name what is counted
     * @param count runs where it happened
     * @param trials runs
     * @param comparison "<=", ">=" or "" for a diagnostic without a criterion
     * @param limit the rate the criterion compares with
     * @param note why the criterion does not apply (the row is then shown without PASS/FAIL), or empty
     */
    public record Criterion(String name, int count, int trials, String comparison, double limit, String note) {
        public BinomialInterval interval() {
            return BinomialInterval.of95(count, trials);
        }

        public boolean judged() {
            return !comparison.isEmpty() && note.isEmpty();
        }

        public boolean passes() {
            if (!judged()) {
                return true;
            }
            double r = interval().rate();
            return comparison.equals("<=") ? r <= limit + 1e-12 : r >= limit - 1e-12;
        }

        /** PASS, FAIL or "-" for rows that are not judged. */
        public String result() {
            return judged() ? (passes() ? "PASS" : "FAIL") : "-";
        }

        /** The criterion in words, e.g. "<= 0.0808" or "-" for a diagnostic. */
        public String criterionText() {
            if (comparison.isEmpty()) {
                return "-";
            }
            if (!note.isEmpty()) {
                return "n/a (" + note + ")";
            }
            return String.format(Locale.ROOT, "%s %.4f", comparison, limit);
        }
    }

    /**
     * The runs of one scenario and how they were judged.
     *
     * @param referenceCentre the centre whose interval coverage is a criterion
     * @param plantedCentre the centre with the plant, or null
     * @param wideReader the wide reader, or null
     * @param seconds wall time of the scenario's runs
     */
    public record ScenarioResult(Scenario scenario, String referenceCentre, String plantedCentre, ReaderId wideReader,
                                 List<Run> runs, List<Criterion> criteria, List<Criterion> diagnostics, double seconds) {
        public ScenarioResult {
            runs = List.copyOf(runs);
            criteria = List.copyOf(criteria);
            diagnostics = List.copyOf(diagnostics);
        }

        public boolean passes() {
            return criteria.stream().allMatch(Criterion::passes);
        }

        public List<Run> failedRuns() {
            return runs.stream().filter(Run::failed).toList();
        }
    }

    /** Every scenario's result, in the order run. */
    public record Result(Settings settings, List<ScenarioResult> scenarios) {
        public Result {
            scenarios = List.copyOf(scenarios);
        }

        public boolean passes() {
            return scenarios.stream().allMatch(ScenarioResult::passes);
        }

        public ScenarioResult scenario(String key) {
            return scenarios.stream().filter(s -> s.scenario().key().equals(key)).findFirst()
                .orElseThrow(() -> new IllegalArgumentException("scenario " + key + " was not run"));
        }
    }

    private Calibration() {
    }

    /** Runs every scenario of the settings, one scenario after the other (each timed). */
    public static Result run(Settings s, StudyRunner runner) throws Exception {
        return run(s, runner, r -> { });
    }

    /**
     * As {@link #run(Settings, StudyRunner)}, handing each scenario's result to {@code done} as soon
     * as its runs are finished (for progress output).
     */
    public static Result run(Settings s, StudyRunner runner, java.util.function.Consumer<ScenarioResult> done)
            throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(s.threads(), CaseBench.daemon("accordia-calibrate"));
        try {
            List<ScenarioResult> out = new ArrayList<>();
            for (Scenario sc : s.scenarios()) {
                long t0 = System.nanoTime();
                List<Future<Run>> fs = new ArrayList<>();
                for (int i = 0; i < s.runsOf(sc); i++) {
                    int k = i;
                    fs.add(pool.submit(() -> attempt(sc, k, s, runner)));
                }
                List<Run> runs = collect(fs);
                ScenarioResult r = judge(sc, runs, s, (System.nanoTime() - t0) / 1e9);
                out.add(r);
                done.accept(r);
            }
            return new Result(s, out);
        } finally {
            pool.shutdownNow();
        }
    }

    private static Run attempt(Scenario sc, int index, Settings s, StudyRunner runner) {
        DemoSpec spec = sc.spec(s.base(), s.seed(), index);
        long analysisSeed = s.seed() + index;
        Map<String, Double> delta = Map.of();
        try {
            DemoGenerator.InMemory study = DemoGenerator.inMemory(spec, sc.extras());
            delta = PlantedTruth.deltasMm(PlantedTruth.centreMeansMm(study, sc));
            ScenarioOutcome o = runner.run(study, analysisSeed);
            return new Run(sc.key(), index, spec.seed(), analysisSeed, o, delta, null);
        } catch (Exception | AssertionError e) {
            return new Run(sc.key(), index, spec.seed(), analysisSeed, null, delta,
                e.getClass().getSimpleName() + ": " + e.getMessage());
        }
    }

    /** Judges one scenario's runs. */
    static ScenarioResult judge(Scenario sc, List<Run> runs, Settings s, double seconds) {
        DemoGenerator.InMemory names = DemoGenerator.inMemory(sc.spec(s.base(), s.seed(), 0), sc.extras());
        List<String> centres = names.centres();
        String planted = sc.kind() == Scenario.Kind.CENTRE ? centres.get(Scenario.PLANTED_CENTRE) : null;
        ReaderId wide = names.wideReader();
        String reference = planted != null ? planted : wide != null ? wide.centre() : centres.get(0);
        int n = runs.size();
        double nullLimit = s.nullLimit(n);
        boolean reach = sc.canReachAlpha(s.alpha());
        List<Criterion> crit = new ArrayList<>();
        List<Criterion> diag = new ArrayList<>();
        Criterion anyFlag = bad("some centre flagged", runs, o -> !o.flagged().isEmpty(), "<=", nullLimit);
        Criterion uncertain = bad("\"uncertain centre effect\" review", runs, o -> !o.uncertainCentres().isEmpty(),
            "<=", 0.10);
        Criterion readerNamed = bad("a reader named for recalibration", runs, o -> !o.readersToRecalibrate().isEmpty(),
            "<=", 0.10);
        switch (sc.kind()) {
            case NULL -> {
                crit.add(anyFlag);
                crit.add(uncertain);
                crit.add(readerNamed);
            }
            case CENTRE -> {
                int dir = sc.plantedDirection();
                Criterion found = good(String.format(Locale.ROOT, "%s flagged, %s", planted, dir > 0 ? "wider" : "narrower"),
                    runs, o -> o.flags(planted, dir), ">=", 0.90);
                crit.add(reach ? found : new Criterion(found.name(), found.count(), found.trials(), ">=", 0.90,
                    "design cannot reach alpha"));
                crit.add(bad("another centre flagged", runs, o -> o.flagsOtherThan(planted), "<=", nullLimit));
                diag.add(diagnostic(uncertain));
                diag.add(diagnostic(readerNamed));
            }
            case READER -> {
                crit.add(good(wide + " named for recalibration", runs, o -> o.readersToRecalibrate().contains(wide),
                    ">=", 0.90));
                crit.add(bad(wide.centre() + " flagged", runs, o -> o.flags(wide.centre()), "<=", nullLimit));
                diag.add(diagnostic(bad("another centre flagged", runs, o -> o.flagsOtherThan(wide.centre()), "", 0)));
                diag.add(diagnostic(bad("another reader named for recalibration", runs,
                    o -> o.readersToRecalibrate().stream().anyMatch(r -> !r.equals(wide)), "", 0)));
                diag.add(diagnostic(uncertain));
            }
            default -> throw new IllegalStateException();
        }
        crit.add(coverage(reference, runs));
        if (!reach) {
            crit.add(good("plain sentence: the design cannot reach alpha", runs, ScenarioOutcome::alphaSentence, ">=",
                1.0));
        }
        if (sc.hasOneReaderCentre()) {
            crit.add(good("plain sentence: a one-reader centre cannot be told from its reader", runs,
                ScenarioOutcome::oneReaderSentence, ">=", 1.0));
        }
        diag.add(bad("permutation test alone at p <= alpha", runs, o -> o.pValue() <= s.alpha(), "", 0));
        for (String c : centres) {
            if (!c.equals(reference)) {
                diag.add(diagnostic(coverage(c, runs)));
            }
        }
        return new ScenarioResult(sc, reference, planted, wide, runs, crit, diag, seconds);
    }

    private static Criterion coverage(String centre, List<Run> runs) {
        int covered = 0;
        double sum = 0;
        int known = 0;
        for (Run r : runs) {
            Double delta = r.plantedDeltaMm().get(centre);
            if (delta != null) {
                sum += delta;
                known++;
            }
            ScenarioOutcome.CentreEstimate e = r.failed() ? null : r.outcome().effectOf(centre);
            if (delta != null && e != null && e.covers(delta)) {
                covered++;
            }
        }
        return new Criterion(String.format(Locale.ROOT, "%s interval covers the planted effect (mean %+.3f mm)", centre,
            known == 0 ? Double.NaN : sum / known), covered, runs.size(), ">=", 0.90, "");
    }

    /** A count where the event is bad (a failed analysis counts as the event). */
    private static Criterion bad(String name, List<Run> runs, Predicate<ScenarioOutcome> event, String cmp, double limit) {
        int k = (int) runs.stream().filter(r -> r.failed() || event.test(r.outcome())).count();
        return new Criterion(name, k, runs.size(), cmp, limit, "");
    }

    /** A count where the event is wanted (a failed analysis counts as a miss). */
    private static Criterion good(String name, List<Run> runs, Predicate<ScenarioOutcome> event, String cmp, double limit) {
        int k = (int) runs.stream().filter(r -> !r.failed() && event.test(r.outcome())).count();
        return new Criterion(name, k, runs.size(), cmp, limit, "");
    }

    private static Criterion diagnostic(Criterion c) {
        return new Criterion(c.name(), c.count(), c.trials(), "", 0, "");
    }

    private static List<Run> collect(List<Future<Run>> fs) throws Exception {
        List<Run> out = new ArrayList<>();
        for (Future<Run> f : fs) {
            try {
                out.add(f.get());
            } catch (ExecutionException e) {
                if (e.getCause() instanceof Exception ex) {
                    throw ex;
                }
                throw e;
            }
        }
        return out;
    }
}
