package org.accordia.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import org.accordia.study.LoadOptions;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;

/**
 * Entry point of the child JVM that measures peak memory: runs one end-to-end analysis of a study
 * folder (outputs into a temporary folder, removed afterwards) and prints
 * {@code ELAPSED_MS n}, {@code CASES n}, {@code VMHWM_KIB n} (peak resident set size from
 * /proc/self/status; -1 where unavailable), the heap pools' peak used and committed sizes
 * ({@code HEAP_PEAK_USED_KIB}, {@code HEAP_PEAK_COMMITTED_KIB}; a pool's peaks may come from
 * different moments, so their sum is an upper bound) and the heap still in use after a full
 * collection with the study result reachable ({@code LIVE_HEAP_AFTER_KIB}: what the study-level
 * records retain). Arguments: study folder, threads.
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
            org.accordia.analysis.StudyResult r = AnalyzeBench.analyzeOnce(study, BenchStudies.protocol(), threads, out);
            long t1 = System.nanoTime();
            System.out.println("ELAPSED_MS " + (t1 - t0) / 1_000_000);
            System.out.println("CASES " + study.cases().size());
            System.out.println("VMHWM_KIB " + ChildJvm.peakResidentKib());
            long peakUsed = 0;
            long peakCommitted = 0;
            for (java.lang.management.MemoryPoolMXBean pool : java.lang.management.ManagementFactory.getMemoryPoolMXBeans()) {
                if (pool.getType() == java.lang.management.MemoryType.HEAP) {
                    peakUsed += pool.getPeakUsage().getUsed();
                    peakCommitted += pool.getPeakUsage().getCommitted();
                }
            }
            System.out.println("HEAP_PEAK_USED_KIB " + (peakUsed >> 10));
            System.out.println("HEAP_PEAK_COMMITTED_KIB " + (peakCommitted >> 10));
            System.gc();
            long live = java.lang.management.ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed();
            System.out.println("LIVE_HEAP_AFTER_KIB " + (live >> 10) + " " + r.cases().size());
        } finally {
            BenchStudies.deleteTree(out);
        }
    }
}
