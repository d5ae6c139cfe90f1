package org.accordia.analysis;

import java.nio.file.Path;
import org.accordia.study.LoadOptions;
import org.accordia.study.Protocol;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;
import org.junit.jupiter.api.Test;

class ScratchDemoRun {
    @Test
    void run() throws Exception {
        Study study = StudyLoader.load(Path.of("demo-masks"), LoadOptions.DEFAULT);
        Protocol p0 = Protocol.load(Path.of("protocols/demo.yaml"));
        Protocol p = System.getenv("REGION") == null ? p0 : new Protocol(p0.study(), p0.structures(), p0.geometryToleranceMm(), p0.maxVoxels(), p0.seed(), p0.agreement(),
            new Protocol.Consensus(Protocol.ConsensusRegion.UNION_MARGIN, 2000), p0.shift(), p0.review());
        long t0 = System.nanoTime();
        StudyResult r = StudyAnalysis.run(CaseSource.ofStudy(study, p, false), p, AnalysisOptions.defaults());
        System.out.println("seconds " + (System.nanoTime() - t0) / 1e9);
        for (LabelResult l : r.labels()) {
            System.out.println(l.name() + " " + l.summary().verdict() + " " + l.summary().rule());
            l.summary().reasons().forEach(x -> System.out.println("  R " + x));
            l.centreNotes().forEach(x -> System.out.println("  N " + x));
            System.out.println("  flagged " + l.summary().shift().flaggedCentres() + " p=" + l.summary().shift().pValue()
                + " share=" + l.summary().shift().betweenShare());
            l.shift().centreEffects().forEach(e -> System.out.println("  C " + e));
            l.summary().casesToAdjudicate().forEach(c -> System.out.println("  A " + c));
            l.summary().readersToRecalibrate().forEach(c -> System.out.println("  RR " + c));
            l.missedStructure().forEach(c -> System.out.println("  M " + c));
            for (CaseRecord c : r.cases()) {
                StringBuilder sb = new StringBuilder("  S " + c.caseId());
                for (var rp : c.structures().get(l.index() - 1).rows("others")) {
                    sb.append(String.format(" %s=%.3f", rp.reader(), rp.sensitivity()));
                }
                System.out.println(sb);
            }
        }
        r.events().forEach(e -> System.out.println("E " + e));
    }
}
