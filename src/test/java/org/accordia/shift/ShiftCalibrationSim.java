package org.accordia.shift;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import org.accordia.analysis.AnalysisOptions;
import org.accordia.analysis.CaseSource;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.StudyAnalysis;
import org.accordia.analysis.StudyResult;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.study.Protocol;
import org.accordia.study.Structure;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledIfSystemProperty;

/**
 * Simulation of the centre flag at the calibration's settings (docs/calibration.md on the bench
 * branch): 3 centres x 3 readers x 12 cases, 64 x 64 x 32 voxels at 1 x 1 x 2 mm, reader bias
 * +-0.3 mm, noise 0.5 mm, one structure lesion = {1, 2}, the shifted centre's readers 1.5 mm wider,
 * the same seeds as {@code accordia calibrate} (SplitMix64 mix, analysis seed = seed + i), and the
 * same reduced resampling (variance-component bootstraps off). Not part of the normal test run (it
 * takes minutes): {@code mvn -o -q test -Dtest=ShiftCalibrationSim -Daccordia.sim.runs=100}.
 * Prints, per run, the flags of the old rule (raw effects against the other centres) and of the
 * current rule, and writes the variance-measure rows of {@code accordia.sim.dump} (a generator
 * seed) as a CSV fixture.
 */
@EnabledIfSystemProperty(named = "accordia.sim.runs", matches = "\\d+")
class ShiftCalibrationSim {

    record Outcome(boolean shifted, int index, long genSeed, List<String> oldFlags, List<String> newFlags,
            double p, String error, List<String> uncertain, String verdict) {
    }

    static Protocol protocol() {
        Protocol d = Protocol.defaults();
        return new Protocol("calibration (simulated)", List.of(new Structure("lesion", List.of(1, 2),
                Structure.DEFAULT_TOLERANCE_MM)), d.geometryToleranceMm(), d.maxVoxels(), d.seed(), d.agreement(),
                d.consensus(), d.shift(), d.review());
    }

    static LabelResult analyse(DemoSpec spec, long analysisSeed) throws Exception {
        Protocol protocol = protocol().withSeed(analysisSeed);
        ShiftSettings s = StudyAnalysis.shiftSettings(protocol);
        s = s.withResampling(s.permutations(), s.bootstrapResamples(), 0, 0);
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(spec);
        CaseSource source = CaseSource.of(demo.caseIds(), demo::load, null);
        StudyResult r = StudyAnalysis.run(source, protocol, new AnalysisOptions(1, s, false));
        return r.labels().get(0);
    }

    static List<String> oldRule(LabelResult l, ShiftSettings s) {
        PermutationResult t = l.shift().permutation();
        boolean significant = t.canReachAlpha() && t.pValue() <= s.alpha();
        List<String> out = new ArrayList<>();
        for (GroupEffect e : l.shift().centreEffects()) {
            if (significant && (e.surfaceBeyond(s.minimumShiftMm()) || e.volumeBeyond(s.minimumVolumeShiftPercent()))) {
                out.add(e.group());
            }
        }
        return out;
    }

    @Test
    void simulate() throws Exception {
        int runs = Integer.getInteger("accordia.sim.runs");
        long seed = Long.getLong("accordia.sim.seed", 20261202L);
        int threads = Integer.getInteger("accordia.sim.threads", 2);
        double shiftMm = 1.5;
        DemoSpec base = new DemoSpec(seed, 12, 3, 3, 64, 64, 32, 1, 1, 2, 0, 0, 0, 0.3, 0.5);
        String shiftedCentre = DemoGenerator.inMemory(base.withPlants(1.0, 0, 0)).truth().shiftedCentre();
        String dump = System.getProperty("accordia.sim.dump");
        if (dump != null) {
            long genSeed = Long.parseLong(dump);
            long analysisSeed = Long.getLong("accordia.sim.analysisSeed");
            LabelResult l = analyse(base.withSeed(genSeed).withPlants(0, 0, 0), analysisSeed);
            Path out = Path.of(System.getProperty("accordia.sim.out", "target/reml_dump.csv"));
            try (PrintWriter w = new PrintWriter(Files.newBufferedWriter(out))) {
                w.println("case,centre,reader,y");
                for (ReaderMeasure m : l.input().varianceMeasures()) {
                    w.printf(Locale.ROOT, "%s,%s,%s,%.17g%n", m.caseId(), m.centre(), m.reader(), m.value());
                }
            }
            System.out.println("notes: " + l.summary().shift().notes());
            System.out.println("components: " + l.summary().varianceComponents());
            return;
        }
        ShiftSettings settings = StudyAnalysis.shiftSettings(protocol());
        ExecutorService pool = Executors.newFixedThreadPool(threads);
        List<Future<Outcome>> futures = new ArrayList<>();
        for (int i = 0; i < runs; i++) {
            for (boolean shifted : new boolean[] {false, true}) {
                final int k = i;
                futures.add(pool.submit(() -> {
                    long genSeed = DemoGenerator.mix(seed, shifted ? 2 : 1, k);
                    DemoSpec spec = base.withSeed(genSeed).withPlants(shifted ? shiftMm : 0, 0, 0);
                    try {
                        LabelResult l = analyse(spec, seed + k);
                        List<String> uncertain = l.shift().centreRows().stream()
                                .filter(c -> c.flag().equals(VerdictRules.FLAG_UNCERTAIN)).map(CentreRow::centre).toList();
                        return new Outcome(shifted, k, genSeed, oldRule(l, settings), l.summary().shift().flaggedCentres(),
                                l.shift().permutation().pValue(), null, uncertain, l.summary().verdict().word());
                    } catch (Exception | Error e) {
                        return new Outcome(shifted, k, genSeed, List.of(), List.of(), Double.NaN, e.toString(), List.of(),
                                "error");
                    }
                }));
            }
        }
        List<Outcome> all = new ArrayList<>();
        for (Future<Outcome> f : futures) {
            all.add(f.get());
        }
        pool.shutdown();
        report(all, runs, shiftedCentre, settings.alpha());
    }

    private static void report(List<Outcome> all, int runs, String shiftedCentre, double alpha) throws IOException {
        StringBuilder b = new StringBuilder();
        for (Outcome o : all) {
            b.append(String.format(Locale.ROOT, "%s %3d seed %d p %.4f old %s new %s uncertain %s verdict %s%s%n",
                    o.shifted() ? "shift" : "null ", o.index(), o.genSeed(), o.p(), o.oldFlags(), o.newFlags(),
                    o.uncertain(), o.verdict(), o.error() == null ? "" : " ERROR " + o.error()));
        }
        for (int rule = 0; rule < 2; rule++) {
            int nullFlag = 0;
            int onlyShifted = 0;
            int shiftedFlagged = 0;
            int innocentRuns = 0;
            int innocentCentres = 0;
            int errors = 0;
            for (Outcome o : all) {
                List<String> f = rule == 0 ? o.oldFlags() : o.newFlags();
                errors += o.error() == null ? 0 : 1;
                if (!o.shifted()) {
                    nullFlag += f.isEmpty() ? 0 : 1;
                } else {
                    shiftedFlagged += f.contains(shiftedCentre) ? 1 : 0;
                    onlyShifted += f.equals(List.of(shiftedCentre)) ? 1 : 0;
                    long innocent = f.stream().filter(c -> !c.equals(shiftedCentre)).count();
                    innocentRuns += innocent > 0 ? 1 : 0;
                    innocentCentres += (int) innocent;
                }
            }
            double se = Math.sqrt(alpha * (1 - alpha) / runs);
            b.append(String.format(Locale.ROOT,
                    "%s rule: null runs flagged %d/%d (criterion <= %.4f); shifted runs: shifted centre flagged %d/%d, "
                            + "only the shifted centre flagged %d/%d, runs with a non-shifted centre flagged %d/%d "
                            + "(%d of %d non-shifted centre-runs); errors %d%n",
                    rule == 0 ? "old" : "new", nullFlag, runs, alpha + 2 * se, shiftedFlagged, runs, onlyShifted, runs,
                    innocentRuns, runs, innocentCentres, 2 * runs, errors));
        }
        System.out.print(b.substring(Math.max(0, b.length() - 2000)));
        Files.writeString(Path.of("target/shift_calibration_sim.txt"), b.toString());
    }
}
