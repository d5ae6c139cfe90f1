package org.accordia.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.accordia.analysis.StudyAnalysis;
import org.accordia.analysis.StudyResult;
import org.accordia.io.InputException;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;
import org.accordia.report.AnalysisReport;
import org.accordia.report.ConsensusFiles;
import org.accordia.run.StudyRun;
import org.accordia.study.MaskRef;
import org.accordia.study.Protocol;
import org.accordia.study.Study;

/**
 * End-to-end timing of the library pipeline on a study folder against the time the same JVM
 * needs only to read and inflate every mask of the study.
 *
 * <p>End-to-end = what {@code accordia analyze} does, through the same run entry point
 * ({@link StudyRun#analyze}): input checksums, {@link StudyAnalysis#run} over the study's cases
 * with {@code threads} cases in parallel and {@link ConsensusFiles} writing each case's consensus
 * files, then {@link AnalysisReport#write} (report, summary, tables), all into a fresh temporary
 * folder. Read-only = every mask of every case read through
 * {@link Volumes#readLabels} with the same number of threads (cases in parallel). Rounds alternate
 * the two (read first) after {@code warmups} discarded rounds, each timed part after a full
 * collection ({@code System.gc()}); medians are reported.
 */
public final class AnalyzeBench {

    /** Medians in nanoseconds. */
    public record Result(int cases, int masks, double analyzeNs, double readNs, int rounds, int warmups, int threads,
                         String outputs, long[] analyzePerRoundNs, long[] readPerRoundNs) {
        public double ratio() {
            return analyzeNs / readNs;
        }

        /** Each measured round's read and analyze times and their ratio, in words. */
        public String perRound() {
            StringBuilder sb = new StringBuilder();
            for (int k = 0; k < analyzePerRoundNs.length; k++) {
                sb.append(String.format(java.util.Locale.ROOT, "%sread %.1f s, analyze %.1f s (%.2fx)",
                    k == 0 ? "" : "; ", readPerRoundNs[k] / 1e9, analyzePerRoundNs[k] / 1e9,
                    (double) analyzePerRoundNs[k] / readPerRoundNs[k]));
            }
            return sb.toString();
        }
    }

    /** What the end-to-end run writes, in words. */
    public static final String OUTPUTS = "what accordia analyze writes (input checksums, consensus masks and"
        + " probability maps per case, report.html with charts and pictures, summary.json, the CSV tables)";

    private AnalyzeBench() {
    }

    /** Measures the study. */
    public static Result run(Study study, Protocol protocol, int threads, int warmups, int rounds)
        throws InputException, IOException {
        long[] analyze = new long[rounds];
        long[] read = new long[rounds];
        int masks = study.masks().size();
        for (int round = 0; round < warmups + rounds; round++) {
            int k = round - warmups;
            // each timed part starts from a collected heap: neither pays for the other's garbage
            System.gc();
            long t0 = System.nanoTime();
            long voxels = readAll(study, threads);
            long t1 = System.nanoTime();
            if (voxels < 0) {
                throw new IllegalStateException("unreachable");
            }
            Path out = Files.createTempDirectory("accordia-bench-analyze");
            try {
                System.gc();
                long t2 = System.nanoTime();
                analyzeOnce(study, protocol, threads, out);
                long t3 = System.nanoTime();
                if (k >= 0) {
                    read[k] = t1 - t0;
                    analyze[k] = t3 - t2;
                }
            } finally {
                BenchStudies.deleteTree(out);
            }
        }
        return new Result(study.cases().size(), masks, Medians.of(analyze), Medians.of(read), rounds, warmups, threads,
            OUTPUTS, analyze, read);
    }

    /**
     * One end-to-end analysis of the study with its outputs written into {@code outDir}, through
     * the run entry point of {@code accordia analyze} ({@link StudyRun#analyze}): input checksums,
     * the pipeline with the consensus files written per case, then the report.
     */
    public static StudyResult analyzeOnce(Study study, Protocol protocol, int threads, Path outDir)
        throws InputException, IOException {
        return StudyRun.analyze(StudyRun.prepare(study, protocol, false), outDir, true, threads, "benchmark",
            StudyRun.Listener.NONE).result();
    }

    /** Reads every mask of the study, cases spread over {@code threads} workers; returns the voxel total. */
    public static long readAll(Study study, int threads) throws InputException {
        ExecutorService pool = Executors.newFixedThreadPool(threads, CaseBench.daemon("accordia-bench-readall"));
        try {
            List<Future<Long>> fs = new ArrayList<>();
            for (String caseId : study.cases()) {
                fs.add(pool.submit(() -> {
                    long n = 0;
                    for (MaskRef m : study.masksOf(caseId)) {
                        n += Volumes.readLabels(m.path(), ReadLimits.DEFAULT).voxelCount();
                    }
                    return n;
                }));
            }
            long total = 0;
            for (Future<Long> f : fs) {
                try {
                    total += f.get();
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    throw new IllegalStateException("interrupted", e);
                } catch (ExecutionException e) {
                    if (e.getCause() instanceof InputException ie) {
                        throw ie;
                    }
                    throw new IllegalStateException(e.getCause());
                }
            }
            return total;
        } finally {
            pool.shutdownNow();
        }
    }
}
