package org.accordia.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import org.accordia.study.LoadOptions;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;

/**
 * Entry point of the child JVM that measures peak memory: runs one end-to-end analysis of a study
 * folder (outputs into a temporary folder, removed afterwards) and prints
 * {@code ELAPSED_MS n}, {@code CASES n} and {@code VMHWM_KIB n} (peak resident set size from
 * /proc/self/status; -1 where unavailable). Arguments: study folder, threads.
 */
public final class AnalyzeProbe {
    private AnalyzeProbe() {
    }

    public static void main(String[] args) throws Exception {
        Path studyDir = Path.of(args[0]);
        int threads = Integer.parseInt(args[1]);
        Study study = StudyLoader.load(studyDir, LoadOptions.DEFAULT);
        Path out = Files.createTempDirectory("accordia-probe");
        try {
            long t0 = System.nanoTime();
            AnalyzeBench.analyzeOnce(study, BenchStudies.protocol(), threads, out);
            long t1 = System.nanoTime();
            System.out.println("ELAPSED_MS " + (t1 - t0) / 1_000_000);
            System.out.println("CASES " + study.cases().size());
            System.out.println("VMHWM_KIB " + ChildJvm.peakResidentKib());
        } finally {
            BenchStudies.deleteTree(out);
        }
    }
}
