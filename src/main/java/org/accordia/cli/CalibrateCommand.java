package org.accordia.cli;

import java.io.PrintWriter;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.accordia.bench.BenchNumbers;
import org.accordia.bench.BinomialInterval;
import org.accordia.bench.Calibration;
import org.accordia.bench.Machine;
import org.accordia.bench.Medians;
import org.accordia.bench.Scenario;
import org.accordia.bench.ScenarioOutcome;
import org.accordia.bench.SimulatedStudies;
import org.accordia.demo.DemoSpec;
import org.accordia.study.Protocol;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code accordia calibrate}: checks the centre and reader findings by simulation
 * (docs/calibration.md): for each scenario (null, a centre wider or narrower, a local inclusion,
 * one wide reader, hard cases, 2/4/6 centres, unequal rosters) how often the analysis flags which
 * centre, reviews, names readers, covers the planted effect and states what the design cannot show.
 */
@Command(
    name = "calibrate",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Measures how often the analysis flags centres, names readers and states design limits on simulated studies"
            + " with and without planted effects.",
        "Simulates seeded studies in memory (no file is written) and runs the full analysis on each, "
            + "scenario by scenario: null, one centre wider or narrower, a local one-sided inclusion at one centre, "
            + "one wide reader, hard cases, 2, 4 and 6 centres, unequal rosters with a one-reader centre. Prints "
            + "each criterion's count, rate and exact 95%% interval with PASS or FAIL."
    })
public final class CalibrateCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--scenario", paramLabel = "NAME", split = ",",
        description = "Scenarios to run, comma-separated (default: all): null, plus, minus, inclusion, wide-reader,"
            + " hard, centres-2, centres-4, centres-6, unequal.")
    List<String> scenarios = new ArrayList<>();

    @Option(names = "--runs", paramLabel = "N",
        description = "Runs of every chosen scenario (default: 200 for null and plus, 100 for the others).")
    int runs;

    @Option(names = "--seed", paramLabel = "N", description = "Master seed (default: ${DEFAULT-VALUE}).")
    long seed = 20261202L;

    @Option(names = "--threads", paramLabel = "N",
        description = "Studies analysed in parallel (default: the processors, ${DEFAULT-VALUE}).")
    int threads = Runtime.getRuntime().availableProcessors();

    @Option(names = "--shift-mm", paramLabel = "MM",
        description = "Margin of the shifted centre (plus: wider, minus: narrower, centres-N: wider) and of the wide"
            + " reader, mm (default: ${DEFAULT-VALUE}).")
    double shiftMm = 1.5;

    @Option(names = "--inclusion-mm", paramLabel = "MM",
        description = "How far the local inclusion reaches beyond the lesion, mm (default: ${DEFAULT-VALUE}).")
    double inclusionMm = 6.0;

    @Option(names = "--hard-cases", paramLabel = "N",
        description = "Hard cases in the hard scenario (default: ${DEFAULT-VALUE}).")
    int hardCases = 3;

    @Option(names = "--cases", paramLabel = "N", description = "Cases per study (default: ${DEFAULT-VALUE}).")
    int cases = 12;

    @Option(names = "--size", paramLabel = "X,Y,Z", split = ",",
        description = "Grid size in voxels (default: 64,64,32).")
    int[] size = {64, 64, 32};

    @Option(names = "--spacing", paramLabel = "X,Y,Z", split = ",",
        description = "Voxel spacing in millimetres (default: 1,1,2).")
    double[] spacing = {1.0, 1.0, 2.0};

    @Option(names = "--reader-bias-mm", paramLabel = "MM",
        description = "Spread of each reader's personal margin bias, uniform in +-this, mm (default: ${DEFAULT-VALUE}).")
    double readerBiasMm = DemoSpec.defaults().readerBiasMm();

    @Option(names = "--noise-mm", paramLabel = "MM",
        description = "Standard deviation of the smooth boundary noise, mm (default: ${DEFAULT-VALUE}).")
    double noiseMm = DemoSpec.defaults().noiseAmplitudeMm();

    @Option(names = "--consensus-region", paramLabel = "REGION",
        description = "Where STAPLE runs: grid or union_margin (protocol key consensus.region; default: the protocol"
            + " default, ${DEFAULT-VALUE}).")
    String region = Protocol.defaults().consensus().region().key();

    @Option(names = "--full-resampling",
        description = "Keep the variance-component bootstraps at their defaults (slower; they do not enter the findings).")
    boolean fullResampling;

    @Override
    public Integer call() throws Exception {
        if (size.length != 3 || spacing.length != 3) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--size and --spacing need three values X,Y,Z");
        }
        ThreadCount.check(spec.commandLine(), threads);
        if (runs < 0 || cases < 2 || hardCases < 0 || hardCases > cases) {
            throw new CommandLine.ParameterException(spec.commandLine(),
                "--runs must not be negative, --cases at least 2, --hard-cases in 0..cases");
        }
        Calibration.Settings settings;
        SimulatedStudies runner;
        try {
            if (!(shiftMm != 0 && Double.isFinite(shiftMm)) || !(inclusionMm > 0 && inclusionMm <= 20)) {
                throw new IllegalArgumentException("--shift-mm must be a non-zero number and --inclusion-mm lie in (0, 20]");
            }
            DemoSpec base = new DemoSpec(seed, cases, 3, 3, size[0], size[1], size[2], spacing[0], spacing[1], spacing[2],
                0, 0, 0, readerBiasMm, noiseMm);
            Protocol.ConsensusRegion cr = Arrays.stream(Protocol.ConsensusRegion.values())
                .filter(x -> x.key().equals(region)).findFirst()
                .orElseThrow(() -> new IllegalArgumentException("--consensus-region must be grid or union_margin"));
            List<Scenario> all = Scenario.all(shiftMm, inclusionMm, hardCases);
            List<Scenario> chosen = new ArrayList<>();
            for (String k : scenarios) {
                Scenario sc = all.stream().filter(x -> x.key().equals(k.trim())).findFirst()
                    .orElseThrow(() -> new IllegalArgumentException("unknown scenario '" + k + "' (known: "
                        + String.join(", ", Scenario.keys()) + ")"));
                if (!chosen.contains(sc)) {
                    chosen.add(sc);
                }
            }
            runner = new SimulatedStudies(!fullResampling, cr);
            settings = new Calibration.Settings(seed, threads, runner.alpha(), base, chosen.isEmpty() ? all : chosen,
                runs);
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
        PrintWriter w = spec.commandLine().getOut();
        w.printf(Locale.ROOT, "accordia calibrate, %s%n", Instant.now().truncatedTo(ChronoUnit.SECONDS));
        w.printf(Locale.ROOT, "machine: %s (at start)%n", Machine.now().describe());
        header(w, settings, runner);
        w.flush();
        long t0 = System.nanoTime();
        Calibration.Result r = Calibration.run(settings, runner, sr -> {
            scenario(w, sr, settings);
            w.flush();
        });
        double seconds = (System.nanoTime() - t0) / 1e9;
        summary(w, r, seconds);
        w.flush();
        return ExitCodes.OK;
    }

    static void header(PrintWriter w, Calibration.Settings s, SimulatedStudies runner) {
        DemoSpec b = s.base();
        w.printf(Locale.ROOT, "settings: master seed %d; every study %d cases, %dx%dx%d voxels at %sx%sx%s mm, reader bias"
                + " uniform +-%s mm, smooth boundary noise sd %s mm, no missed lesion; roster and plants per scenario%n",
            s.seed(), b.cases(), b.nx(), b.ny(), b.nz(), BenchNumbers.text(b.sxMm()), BenchNumbers.text(b.syMm()),
            BenchNumbers.text(b.szMm()), BenchNumbers.text(b.readerBiasMm()), BenchNumbers.text(b.noiseAmplitudeMm()));
        w.printf(Locale.ROOT, "analysis: %s%n", runner.describe());
        w.printf(Locale.ROOT, "alpha = %s; limits on flag rates are alpha + 2 SE for the scenario's runs (%.4f for 200,"
            + " %.4f for 100); intervals are exact 95%% Clopper-Pearson; a failed analysis counts against every"
            + " criterion%n", BenchNumbers.text(s.alpha()), s.nullLimit(200), s.nullLimit(100));
        w.printf(Locale.ROOT, "threads: %d%n", s.threads());
    }

    static void scenario(PrintWriter w, Calibration.ScenarioResult sr, Calibration.Settings s) {
        Scenario sc = sr.scenario();
        w.println();
        w.printf(Locale.ROOT, "scenario %s: %s (%d runs, %.1f s)%n", sc.key(), sc.title(), sr.runs().size(),
            sr.seconds());
        w.printf(Locale.ROOT, "  generator: %s%n", sc.parameters());
        w.printf(Locale.ROOT, "  design: %s distinct reader partitions, %s%s%n", sc.distinctPartitions(),
            sc.canReachAlpha(s.alpha()) ? "alpha is reachable" : "alpha cannot be reached",
            sc.hasOneReaderCentre() ? "; a centre with one reader" : "");
        w.printf(Locale.ROOT, "  %-72s %9s %7s %17s %-30s %s%n", "criterion", "count", "rate", "95% CI", "criterion",
            "result");
        for (Calibration.Criterion c : sr.criteria()) {
            row(w, c);
        }
        w.println("  diagnostics:");
        for (Calibration.Criterion c : sr.diagnostics()) {
            row(w, c);
        }
        effects(w, sr);
        List<Calibration.Run> failed = sr.failedRuns();
        w.printf(Locale.ROOT, "  failed analyses: %d%n", failed.size());
        for (Calibration.Run f : failed.subList(0, Math.min(10, failed.size()))) {
            w.printf(Locale.ROOT, "    run %d (generator seed %d, analysis seed %d): %s%n", f.index(),
                f.generatorSeed(), f.analysisSeed(), f.error());
        }
        w.printf(Locale.ROOT, "  scenario: %s%n", sr.passes() ? "PASS" : "FAIL");
    }

    static void summary(PrintWriter w, Calibration.Result r, double seconds) {
        w.println();
        w.printf(Locale.ROOT, "time: %.1f s in all (%d threads); per scenario: %s%n", seconds, r.settings().threads(),
            String.join(", ", r.scenarios().stream().map(x -> String.format(Locale.ROOT, "%s %.0f s", x.scenario().key(),
                x.seconds())).toList()));
        w.println();
        w.println("summary (markdown):");
        w.println();
        w.println("| scenario | criterion | count | rate | 95 % CI | criterion | result |");
        w.println("|---|---|---|---|---|---|---|");
        for (Calibration.ScenarioResult sr : r.scenarios()) {
            for (Calibration.Criterion c : sr.criteria()) {
                BinomialInterval ci = c.interval();
                w.printf(Locale.ROOT, "| %s | %s | %d / %d | %.3f | [%.3f, %.3f] | %s | %s |%n", sr.scenario().key(),
                    c.name(), c.count(), c.trials(), ci.rate(), ci.lower(), ci.upper(), c.criterionText(), c.result());
            }
        }
        w.printf(Locale.ROOT, "%noverall: %s%n", r.passes() ? "PASS" : "FAIL");
    }

    private static void row(PrintWriter w, Calibration.Criterion c) {
        BinomialInterval ci = c.interval();
        w.printf(Locale.ROOT, "  %-72s %4d/%-4d %7.4f [%.4f, %.4f] %-30s %s%n", c.name(), c.count(), c.trials(),
            ci.rate(), ci.lower(), ci.upper(), c.criterionText(), c.result());
    }

    /** The reference centre's reported effect against the planted one, and the verdict rules seen. */
    private static void effects(PrintWriter w, Calibration.ScenarioResult sr) {
        String c = sr.referenceCentre();
        List<Calibration.Run> ok = sr.runs().stream().filter(x -> !x.failed()).toList();
        double[] est = ok.stream().map(x -> x.outcome().effectOf(c)).filter(e -> e != null)
            .mapToDouble(ScenarioOutcome.CentreEstimate::estimateMm).toArray();
        double[] width = ok.stream().map(x -> x.outcome().effectOf(c)).filter(e -> e != null)
            .mapToDouble(e -> e.hiMm() - e.loMm()).toArray();
        double[] planted = ok.stream().map(x -> x.plantedDeltaMm().get(c)).filter(d -> d != null)
            .mapToDouble(Double::doubleValue).toArray();
        w.printf(Locale.ROOT, "  %s: reported effect median %+.3f mm, interval width median %.3f mm; planted effect"
            + " median %+.3f mm%n", c, Medians.of(est), Medians.of(width), Medians.of(planted));
        java.util.Map<String, Long> rules = new java.util.TreeMap<>();
        ok.forEach(x -> rules.merge(x.outcome().verdict() + " (" + x.outcome().rule() + ")", 1L, Long::sum));
        w.printf(Locale.ROOT, "  verdicts: %s%n", rules);
    }
}
