package org.accordia.bench;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.shift.GroupEffect;

/**
 * Calibration of the annotation-shift flag by simulation: many seeded studies without any centre
 * effect (reader noise only) and as many with a wider margin at one centre, each analysed by a
 * {@link StudyRunner} (the full analysis path), counting how often the flag fires.
 *
 * <p>The flag fires in a run when the verdict rules flag at least one centre (permutation test
 * p ≤ α and a centre-effect interval entirely beyond the minimum effect). In a shifted run it is a
 * <em>correct detection</em> when the primary flagged centre (the flagged centre with the largest
 * absolute signed-surface effect) is the planted one and its effect has the planted sign (wider =
 * positive).
 *
 * <p>Criteria: null flag rate ≤ α + 2·SE with SE = sqrt(α(1 − α)/runs); correct-detection rate ≥
 * 0.90. Rates are reported with exact Clopper–Pearson 95 % intervals ({@link BinomialInterval}).
 *
 * <p>Seeds: null run i uses the generator seed {@code mix(seed, 1, i)}, shifted run i
 * {@code mix(seed, 2, i)} (SplitMix64 finaliser), and the analysis seed {@code seed + i}; the result
 * does not depend on the thread count.
 */
public final class Calibration {

    /** The outcome of the analysis of one simulated study, for the calibrated structure. */
    public record ShiftOutcome(List<String> flaggedCentres, List<GroupEffect> centreEffects, double pValue) {
        public ShiftOutcome {
            flaggedCentres = List.copyOf(flaggedCentres);
            centreEffects = List.copyOf(centreEffects);
        }
    }

    /** Analyses one simulated study (generated in memory from the spec) along the full path. */
    @FunctionalInterface
    public interface StudyRunner {
        /**
         * @param spec the generator specification of the study
         * @param analysisSeed seed of the analysis' random generators
         * @return the outcome for the calibrated structure
         */
        ShiftOutcome run(DemoSpec spec, long analysisSeed) throws Exception;
    }

    /**
     * @param runs runs of each kind (null and shifted)
     * @param seed master seed
     * @param threads runs analysed in parallel
     * @param shiftMm margin shift of the shifted centre in the shifted runs, mm
     * @param alpha the significance level the analysis uses
     * @param base generator spec of every run (roster, grid, noise); seed and plants are replaced
     */
    public record Settings(int runs, long seed, int threads, double shiftMm, double alpha, DemoSpec base) {
        public Settings {
            if (runs < 1 || threads < 1) {
                throw new IllegalArgumentException("runs and threads must be at least 1");
            }
            if (!(shiftMm != 0 && Double.isFinite(shiftMm))) {
                throw new IllegalArgumentException("the shift must be a non-zero number of mm");
            }
            if (!(alpha > 0 && alpha < 1)) {
                throw new IllegalArgumentException("alpha must lie in (0, 1)");
            }
        }

        /** The spec of null run i: no centre shift, no missed lesion, no hard case. */
        public DemoSpec nullSpec(int i) {
            return base.withSeed(DemoGenerator.mix(seed, 1, i)).withPlants(0, 0, 0);
        }

        /** The spec of shifted run i: the generator's shifted centre draws {@code shiftMm} wider. */
        public DemoSpec shiftedSpec(int i) {
            return base.withSeed(DemoGenerator.mix(seed, 2, i)).withPlants(shiftMm, 0, 0);
        }

        /** Largest null flag rate that passes: α + 2·sqrt(α(1 − α)/runs). */
        public double nullLimit() {
            return alpha + 2 * Math.sqrt(alpha * (1 - alpha) / runs);
        }
    }

    /**
     * One run: its generator seed, the outcome (null when the analysis failed, {@code error} then
     * says why), and how it was judged. A failed run counts as neither a flag nor a detection.
     */
    public record Run(int index, boolean shifted, long generatorSeed, ShiftOutcome outcome, String primaryCentre,
                      double primaryEffectMm, boolean flagged, boolean correct, String error) {
        public boolean failed() {
            return outcome == null;
        }
    }

    /**
     * @param settings what was run
     * @param shiftedCentre the centre the generator shifts in the shifted runs
     * @param nullRuns the null runs, by index
     * @param shiftedRuns the shifted runs, by index
     */
    public record Result(Settings settings, String shiftedCentre, List<Run> nullRuns, List<Run> shiftedRuns) {
        public Result {
            nullRuns = List.copyOf(nullRuns);
            shiftedRuns = List.copyOf(shiftedRuns);
        }

        public int nullFlags() {
            return (int) nullRuns.stream().filter(Run::flagged).count();
        }

        public int shiftedFlags() {
            return (int) shiftedRuns.stream().filter(Run::flagged).count();
        }

        public int correctDetections() {
            return (int) shiftedRuns.stream().filter(Run::correct).count();
        }

        /** Runs whose analysis threw (listed, never silently dropped). */
        public List<Run> failedRuns() {
            List<Run> out = new ArrayList<>();
            nullRuns.stream().filter(Run::failed).forEach(out::add);
            shiftedRuns.stream().filter(Run::failed).forEach(out::add);
            return out;
        }

        public BinomialInterval nullRate() {
            return BinomialInterval.of95(nullFlags(), nullRuns.size());
        }

        public BinomialInterval power() {
            return BinomialInterval.of95(correctDetections(), shiftedRuns.size());
        }

        /** Null criterion: flag rate ≤ α + 2·SE. */
        public boolean nullPasses() {
            return nullRate().rate() <= settings.nullLimit() + 1e-12;
        }

        /** Power criterion: correct detections in at least 90 % of the shifted runs. */
        public boolean powerPasses() {
            return power().rate() >= 0.90 - 1e-12;
        }
    }

    private Calibration() {
    }

    /** Runs every null and shifted study. */
    public static Result run(Settings s, String shiftedCentre, StudyRunner runner) throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(s.threads(), CaseBench.daemon("accordia-calibrate"));
        try {
            List<Future<Run>> nul = new ArrayList<>();
            List<Future<Run>> sh = new ArrayList<>();
            for (int i = 0; i < s.runs(); i++) {
                int k = i;
                nul.add(pool.submit(() -> attempt(k, false, s.nullSpec(k), s.seed() + k, runner, shiftedCentre,
                    s.shiftMm())));
                sh.add(pool.submit(() -> attempt(k, true, s.shiftedSpec(k), s.seed() + k, runner, shiftedCentre,
                    s.shiftMm())));
            }
            return new Result(s, shiftedCentre, collect(nul), collect(sh));
        } finally {
            pool.shutdownNow();
        }
    }

    private static Run attempt(int index, boolean shifted, DemoSpec spec, long analysisSeed, StudyRunner runner,
            String shiftedCentre, double shiftMm) {
        ShiftOutcome o;
        try {
            o = runner.run(spec, analysisSeed);
        } catch (Exception | AssertionError e) {
            return new Run(index, shifted, spec.seed(), null, null, Double.NaN, false, false,
                e.getClass().getSimpleName() + ": " + e.getMessage());
        }
        return judge(index, shifted, spec, o, shiftedCentre, shiftMm);
    }

    static Run judge(int index, boolean shifted, DemoSpec spec, ShiftOutcome o, String shiftedCentre, double shiftMm) {
        boolean flagged = !o.flaggedCentres().isEmpty();
        GroupEffect primary = o.centreEffects().stream()
            .filter(e -> o.flaggedCentres().contains(e.group()))
            .max(Comparator.comparingDouble((GroupEffect e) -> Double.isNaN(e.signedSurfaceMm()) ? -1
                : Math.abs(e.signedSurfaceMm())).thenComparing(GroupEffect::group, Comparator.reverseOrder()))
            .orElse(null);
        boolean correct = shifted && primary != null && primary.group().equals(shiftedCentre)
            && Math.signum(primary.signedSurfaceMm()) == Math.signum(shiftMm);
        return new Run(index, shifted, spec.seed(), o, primary == null ? null : primary.group(),
            primary == null ? Double.NaN : primary.signedSurfaceMm(), flagged, correct, null);
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
