package org.accordia.cli;

import java.io.PrintWriter;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.accordia.bench.BinomialInterval;
import org.accordia.bench.Calibration;
import org.accordia.bench.Machine;
import org.accordia.bench.SimulatedStudies;
import org.accordia.demo.DemoSpec;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code accordia calibrate}: checks the annotation-shift flag by simulation (docs/calibration.md):
 * its false-positive rate on studies without a centre effect and how often it names the right
 * centre and direction when one centre draws a wider margin.
 */
@Command(
    name = "calibrate",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Measures how often the centre flag fires on simulated studies, with and without a shifted centre.",
        "Simulates seeded studies in memory (no file is written) and runs the full analysis on "
            + "each: null studies (reader noise only) and studies where one centre draws a wider margin. "
            + "Prints the flag's false-positive rate and its power (right centre, right direction) with "
            + "exact 95%% intervals, and PASS or FAIL against the two criteria."
    })
public final class CalibrateCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--runs", paramLabel = "N",
        description = "Null runs, and as many shifted runs (default: ${DEFAULT-VALUE}).")
    int runs = 200;

    @Option(names = "--seed", paramLabel = "N", description = "Master seed (default: ${DEFAULT-VALUE}).")
    long seed = 20261202L;

    @Option(names = "--threads", paramLabel = "N",
        description = "Studies analysed in parallel (default: the processors, ${DEFAULT-VALUE}).")
    int threads = Runtime.getRuntime().availableProcessors();

    @Option(names = "--shift-mm", paramLabel = "MM",
        description = "Margin shift of the shifted centre in the shifted runs, mm (default: ${DEFAULT-VALUE}).")
    double shiftMm = 1.5;

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
    String region = org.accordia.study.Protocol.defaults().consensus().region().key();

    @Option(names = "--full-resampling",
        description = "Keep the variance-component bootstraps at their defaults (slower; they do not enter the flag).")
    boolean fullResampling;

    @Override
    public Integer call() throws Exception {
        if (size.length != 3 || spacing.length != 3) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--size and --spacing need three values X,Y,Z");
        }
        if (runs < 1 || threads < 1 || cases < 2) {
            throw new CommandLine.ParameterException(spec.commandLine(),
                "--runs and --threads must be at least 1, --cases at least 2");
        }
        DemoSpec base;
        Calibration.Settings settings;
        SimulatedStudies runner;
        try {
            base = new DemoSpec(seed, cases, 3, 3, size[0], size[1], size[2], spacing[0], spacing[1], spacing[2], 0, 0,
                0, readerBiasMm, noiseMm);
            org.accordia.study.Protocol.ConsensusRegion cr = java.util.Arrays.stream(
                    org.accordia.study.Protocol.ConsensusRegion.values()).filter(x -> x.key().equals(region)).findFirst()
                .orElseThrow(() -> new IllegalArgumentException("--consensus-region must be grid or union_margin"));
            runner = new SimulatedStudies(!fullResampling, cr);
            settings = new Calibration.Settings(runs, seed, threads, shiftMm, runner.alpha(), base);
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
        PrintWriter w = spec.commandLine().getOut();
        w.printf(Locale.ROOT, "accordia calibrate, %s%n", Instant.now().truncatedTo(ChronoUnit.SECONDS));
        w.printf(Locale.ROOT, "machine: %s (at start)%n", Machine.now().describe());
        w.flush();
        long t0 = System.nanoTime();
        Calibration.Result r = Calibration.run(settings, runner.shiftedCentre(base), runner);
        double seconds = (System.nanoTime() - t0) / 1e9;
        print(w, r, runner, seconds);
        w.flush();
        return ExitCodes.OK;
    }

    static String largestEffect(Calibration.Run x) {
        if (x.failed()) {
            return null;
        }
        return x.outcome().centreEffects().stream().filter(e -> !Double.isNaN(e.signedSurfaceMm()))
            .max(java.util.Comparator.comparingDouble(e -> Math.abs(e.signedSurfaceMm())))
            .map(org.accordia.shift.GroupEffect::group).orElse(null);
    }

    static void print(PrintWriter w, Calibration.Result r, SimulatedStudies runner, double seconds) {
        Calibration.Settings s = r.settings();
        DemoSpec b = s.base();
        w.printf(Locale.ROOT, "settings: %d null + %d shifted studies, master seed %d; each study %d centres x %d readers"
                + " x %d cases, %dx%dx%d voxels at %sx%sx%s mm, reader bias uniform +-%s mm, smooth boundary noise sd %s mm,"
                + " no missed lesion, no hard case%n", s.runs(), s.runs(), s.seed(), b.centres(), b.readersPerCentre(),
            b.cases(), b.nx(), b.ny(), b.nz(), org.accordia.bench.BenchNumbers.text(b.sxMm()), org.accordia.bench.BenchNumbers.text(b.syMm()),
            org.accordia.bench.BenchNumbers.text(b.szMm()), org.accordia.bench.BenchNumbers.text(b.readerBiasMm()), org.accordia.bench.BenchNumbers.text(b.noiseAmplitudeMm()));
        w.printf(Locale.ROOT, "shifted runs: centre %s draws its margin %+.2f mm wider%n", r.shiftedCentre(), s.shiftMm());
        w.printf(Locale.ROOT, "analysis: %s%n", runner.describe());
        w.printf(Locale.ROOT, "flag: a centre flagged by the verdict rules (permutation test p <= alpha = %s AND a centre"
            + " effect interval entirely beyond the minimum effect) on structure '%s'%n", org.accordia.bench.BenchNumbers.text(s.alpha()),
            runner.structureName());
        w.printf(Locale.ROOT, "time: %.1f s (%d threads)%n%n", seconds, s.threads());
        BinomialInterval nr = r.nullRate();
        double se = Math.sqrt(s.alpha() * (1 - s.alpha()) / s.runs());
        w.printf(Locale.ROOT, "null false-positive rate: %d / %d = %.4f, 95%% CI [%.4f, %.4f] (Clopper-Pearson)%n",
            nr.successes(), nr.trials(), nr.rate(), nr.lower(), nr.upper());
        w.printf(Locale.ROOT, "  criterion: <= alpha + 2 SE = %.4f + 2 x %.4f = %.4f  -> %s%n", s.alpha(), se,
            s.nullLimit(), r.nullPasses() ? "PASS" : "FAIL");
        BinomialInterval pw = r.power();
        w.printf(Locale.ROOT, "power (right centre and direction): %d / %d = %.4f, 95%% CI [%.4f, %.4f] (Clopper-Pearson)%n",
            pw.successes(), pw.trials(), pw.rate(), pw.lower(), pw.upper());
        w.printf(Locale.ROOT, "  criterion: >= 0.90  -> %s%n", r.powerPasses() ? "PASS" : "FAIL");
        List<Calibration.Run> failed = r.failedRuns();
        w.printf(Locale.ROOT, "failed analyses: %d (counted as neither a flag nor a detection)%n", failed.size());
        for (Calibration.Run f : failed.subList(0, Math.min(10, failed.size()))) {
            w.printf(Locale.ROOT, "  %s run %d (generator seed %d): %s%n", f.shifted() ? "shifted" : "null", f.index(),
                f.generatorSeed(), f.error());
        }
        w.println();
        w.println("diagnostics:");
        long nullTest = r.nullRuns().stream().filter(x -> !x.failed() && x.outcome().pValue() <= s.alpha()).count();
        BinomialInterval nt = BinomialInterval.of95((int) nullTest, s.runs());
        w.printf(Locale.ROOT, "  null runs with permutation p <= alpha (test alone): %d / %d = %.4f, 95%% CI [%.4f, %.4f]%n",
            nullTest, s.runs(), nt.rate(), nt.lower(), nt.upper());
        long shiftTest = r.shiftedRuns().stream().filter(x -> !x.failed() && x.outcome().pValue() <= s.alpha()).count();
        w.printf(Locale.ROOT, "  shifted runs with permutation p <= alpha: %d / %d; flagged at all: %d / %d;"
            + " flagged but wrong centre or direction: %d%n", shiftTest, s.runs(), r.shiftedFlags(), s.runs(),
            r.shiftedFlags() - r.correctDetections());
        long among = r.shiftedRuns().stream().filter(x -> !x.failed() && x.outcome().flaggedCentres().contains(r.shiftedCentre()))
            .count();
        long largest = r.shiftedRuns().stream().filter(x -> r.shiftedCentre().equals(largestEffect(x))).count();
        long all = r.shiftedRuns().stream().filter(x -> !x.failed() && x.outcome().flaggedCentres().size() == x.outcome()
            .centreEffects().size()).count();
        w.printf(Locale.ROOT, "  shifted runs: shifted centre among the flagged centres %d / %d; shifted centre has the"
            + " largest |signed-surface effect| %d / %d; every centre flagged %d / %d%n", among, s.runs(), largest,
            s.runs(), all, s.runs());
        double[] eff = r.shiftedRuns().stream().filter(x -> !x.failed()).flatMap(x -> x.outcome().centreEffects().stream()
            .filter(e -> e.group().equals(r.shiftedCentre()))).mapToDouble(e -> e.signedSurfaceMm()).toArray();
        double[] others = r.shiftedRuns().stream().filter(x -> !x.failed()).flatMap(x -> x.outcome().centreEffects().stream()
            .filter(e -> !e.group().equals(r.shiftedCentre()))).mapToDouble(e -> e.signedSurfaceMm()).toArray();
        double[] lo = r.shiftedRuns().stream().filter(x -> !x.failed()).flatMap(x -> x.outcome().centreEffects().stream()
            .filter(e -> e.group().equals(r.shiftedCentre()))).mapToDouble(e -> e.signedSurfaceLoMm()).toArray();
        w.printf(Locale.ROOT, "  shifted centre's signed-surface effect: median %.3f mm (lower interval limit median %.3f mm)"
            + " against the planted %+.2f mm%n", org.accordia.bench.Medians.of(eff), org.accordia.bench.Medians.of(lo),
            s.shiftMm());
        w.printf(Locale.ROOT, "  the other centres' signed-surface effects in the shifted runs: median %.3f mm%n",
            org.accordia.bench.Medians.of(others));
        double[] nullMax = r.nullRuns().stream().filter(x -> !x.failed()).mapToDouble(x -> x.outcome().centreEffects().stream()
            .mapToDouble(e -> Math.abs(e.signedSurfaceMm())).max().orElse(Double.NaN)).toArray();
        w.printf(Locale.ROOT, "  null runs: median of the largest |centre effect| %.3f mm%n",
            org.accordia.bench.Medians.of(nullMax));
        double[] nullAll = r.nullRuns().stream().filter(x -> !x.failed()).flatMap(x -> x.outcome().centreEffects().stream())
            .mapToDouble(e -> e.signedSurfaceMm()).toArray();
        w.printf(Locale.ROOT, "  null runs: median centre effect %.3f mm (0 expected without a systematic bias of the"
            + " reference)%n", org.accordia.bench.Medians.of(nullAll));
        w.printf(Locale.ROOT, "%noverall: %s%n", r.nullPasses() && r.powerPasses() ? "PASS" : "FAIL");
    }
}
