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
import org.accordia.analysis.AnalysisOptions;
import org.accordia.analysis.CaseSink;
import org.accordia.analysis.CaseSource;
import org.accordia.analysis.StudyAnalysis;
import org.accordia.analysis.StudyResult;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.ConsensusOutputs;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;
import org.accordia.report.CsvWriter;
import org.accordia.report.OutputFolder;
import org.accordia.report.Tables;
import org.accordia.study.MaskRef;
import org.accordia.study.Protocol;
import org.accordia.study.Study;

/**
 * End-to-end timing of the library pipeline on a study folder against the time the same JVM
 * needs only to read and inflate every mask of the study.
 *
 * <p>End-to-end = {@link StudyAnalysis#run} over {@link CaseSource#ofStudy} with {@code threads}
 * cases in parallel, writing real outputs into a fresh temporary folder: per case and structure
 * the STAPLE consensus mask and probability map (NIfTI, gzip), the multi-label consensus mask when
 * the study has several labels, and after the study the CSV tables of {@link Tables} (pairs,
 * readers, centres, cases, events). Read-only = every mask of every case read through
 * {@link Volumes#readLabels} with the same number of threads (cases in parallel). Rounds alternate
 * the two (read first) after {@code warmups} discarded rounds; medians are reported.
 */
public final class AnalyzeBench {

    /** Medians in nanoseconds. */
    public record Result(int cases, int masks, double analyzeNs, double readNs, int rounds, int warmups, int threads,
                         String outputs) {
        public double ratio() {
            return analyzeNs / readNs;
        }
    }

    /** What the end-to-end run writes, in words. */
    public static final String OUTPUTS = "per case and structure the STAPLE consensus mask and probability map"
        + " (.nii.gz), the multi-label consensus mask, and the CSV tables pairs, readers, centres, cases, events";

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
            long t0 = System.nanoTime();
            long voxels = readAll(study, threads);
            long t1 = System.nanoTime();
            if (voxels < 0) {
                throw new IllegalStateException("unreachable");
            }
            Path out = Files.createTempDirectory("accordia-bench-analyze");
            try {
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
            OUTPUTS);
    }

    /** One end-to-end analysis of the study with its outputs written into {@code outDir}. */
    public static StudyResult analyzeOnce(Study study, Protocol protocol, int threads, Path outDir)
        throws InputException, IOException {
        OutputFolder folder = OutputFolder.prepare(outDir, true);
        Files.createDirectories(outDir.resolve("consensus"));
        CaseSink sink = work -> {
            List<LabelVolume> masks = work.loaded().masks();
            String caseId = OutputFolder.safeFileName(work.loaded().caseId());
            for (CaseReferences refs : work.references()) {
                int[] labels = labelsOf(protocol, refs.label());
                String stem = "consensus/" + caseId + "_" + OutputFolder.safeFileName(refs.label());
                LabelVolume cons = ConsensusOutputs.binaryConsensus(masks, labels, refs.all(),
                    refs.keepMask(ReaderPerformance.REFERENCE_ALL, 0), 1);
                folder.writeAtomically(stem + "_staple.nii.gz", os -> NiftiWriter.writeLabels(os, cons, true));
                float[] map = ConsensusOutputs.probabilityMap(masks, labels, refs.all());
                folder.writeAtomically(stem + "_probability.nii.gz",
                    os -> NiftiWriter.writeProbability(os, work.loaded().geometry(), map, true));
            }
            if (work.multiLabel() != null) {
                LabelVolume ml = ConsensusOutputs.labelConsensus(masks, work.multiLabel());
                folder.writeAtomically("consensus/" + caseId + "_labels.nii.gz",
                    os -> NiftiWriter.writeLabels(os, ml, true));
            }
        };
        StudyResult r = StudyAnalysis.run(CaseSource.ofStudy(study, protocol, false), protocol,
            AnalysisOptions.defaults().withThreads(threads), sink, () -> { });
        folder.writeAtomically("pairs.csv", os -> CsvWriter.write(Tables.pairs(r), os));
        folder.writeAtomically("readers.csv", os -> CsvWriter.write(Tables.readers(r), os));
        folder.writeAtomically("centres.csv", os -> CsvWriter.write(Tables.centres(r), os));
        folder.writeAtomically("cases.csv", os -> CsvWriter.write(Tables.cases(r), os));
        folder.writeAtomically("events.csv", os -> CsvWriter.write(Tables.events(r), os));
        return r;
    }

    private static int[] labelsOf(Protocol protocol, String structure) {
        return protocol.structures().stream().filter(s -> s.name().equals(structure)).findFirst()
            .orElseThrow(() -> new IllegalStateException("unknown structure " + structure)).labelArray();
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
