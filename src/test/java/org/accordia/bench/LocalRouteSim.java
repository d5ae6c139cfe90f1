package org.accordia.bench;

import java.util.Locale;
import org.accordia.analysis.StudyResult;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.shift.CentreFindings;
import org.accordia.shift.LocalEffect;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

/**
 * Which route flags the centre in the calibration's "inclusion" scenario, and how the local measure
 * behaves under the null: off by default (a simulation, not a unit test);
 * {@code mvn -o -q test -Dtest=LocalRouteSim -Daccordia.sim.runs=40}. Prints counts only.
 */
class LocalRouteSim {
    @Test
    void routes() throws Exception {
        int runs = Integer.getInteger("accordia.sim.runs", 0);
        Assumptions.assumeTrue(runs > 0, "simulation off (set -Daccordia.sim.runs)");
        long seed = 20261202L;
        DemoSpec base = new DemoSpec(seed, 12, 3, 3, 64, 64, 32, 1, 1, 2, 0, 0, 0, 0.3, 0.5);
        SimulatedStudies runner = new SimulatedStudies(true);
        for (String key : new String[] {"inclusion", "null", "wide-reader", "hard"}) {
            Scenario sc = Scenario.all(1.5, 6, 3).stream().filter(s -> s.key().equals(key)).findFirst().orElseThrow();
            int flagged = 0;
            int localBeyond = 0;
            int surfaceOrVolume = 0;
            int localOnly = 0;
            int anyLocalBeyondNull = 0;
            double maxExcessLo = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < runs; i++) {
                DemoGenerator.InMemory study = DemoGenerator.inMemory(sc.spec(base, seed, i), sc.extras());
                StudyResult r = runner.analyse(study, seed + i);
                var l = r.labels().get(0).shift();
                CentreFindings.Finding f = l.centreFindings().of("norvale");
                if (f.kind().flagged()) {
                    flagged++;
                    boolean sv = f.surfaceBeyond() || f.volumeSupported();
                    surfaceOrVolume += sv ? 1 : 0;
                    localOnly += f.localBeyond() && !sv ? 1 : 0;
                }
                localBeyond += f.localBeyond() ? 1 : 0;
                for (LocalEffect e : l.localEffects()) {
                    anyLocalBeyondNull += e.beyond(org.accordia.shift.LocalEffects.MINIMUM_EXCESS) && !e.centre().equals("norvale") ? 1 : 0;
                    if (!key.equals("inclusion") || !e.centre().equals("norvale")) {
                        maxExcessLo = Math.max(maxExcessLo, Math.max(e.outsideExcessLo(), e.insideExcessLo()));
                    }
                }
                if (i < 3) {
                    LocalEffect n = l.localEffects().stream().filter(e -> e.centre().equals("norvale")).findFirst()
                        .orElseThrow();
                    System.out.printf(Locale.ROOT, "%s run %d: norvale outside share %.3f excess %.3f [%.3f, %.3f]%n",
                        key, i, n.outsideShare(), n.outsideExcess(), n.outsideExcessLo(), n.outsideExcessHi());
                }
            }
            System.out.printf(Locale.ROOT, "%s: %d runs; norvale flagged %d (surface or volume route %d, local route "
                    + "only %d); norvale local excess beyond the minimum %d; other centres beyond %d; largest excess "
                    + "lower bound of an unplanted centre %.3f%n", key, runs, flagged, surfaceOrVolume, localOnly, localBeyond,
                anyLocalBeyondNull, maxExcessLo);
        }
    }
}
