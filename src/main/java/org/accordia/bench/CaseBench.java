package org.accordia.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.CaseAgreementEngine;
import org.accordia.agreement.PatternHistogram;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.ConsensusOutputs;
import org.accordia.consensus.LabelTupleHistogram;
import org.accordia.consensus.MultiLabelStaple;
import org.accordia.consensus.MultiLabelStapleResult;
import org.accordia.consensus.StapleOptions;
import org.accordia.io.Geometry;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;
import org.accordia.study.CaseLoader;
import org.accordia.study.MaskRef;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;
import org.accordia.study.Study;

/**
 * Per-case timing of the agreement and consensus steps against the time to read and inflate the
 * case's masks, all in one JVM.
 *
 * <p>For every round and case, in this order:
 * <ol>
 *   <li><b>read</b>: every mask of the case read through the real readers ({@link Volumes#readLabels},
 *       gzip inflation included), spread over {@code threads} workers; the grids are checked as
 *       {@link CaseLoader} does. The files come from the operating system's page cache after the
 *       first round, so this is parse-and-inflate time, not disk time. The same masks read on one
 *       thread are timed too ({@code read1}).</li>
 *   <li><b>agreement</b>: {@link CaseAgreementEngine#evaluate} for every structure (one histogram
 *       pass, every pair's overlap, surface distances and HD95, Fleiss' kappa), with
 *       {@code threads - 1} helper threads besides the caller.</li>
 *   <li><b>consensus, histogram parts</b>: per structure {@link CaseReferences#compute} (STAPLE of
 *       all readers, every leave-one-reader-out and leave-one-centre-out STAPLE) and its
 *       {@link CaseReferences#rows()}; then the multi-label STAPLE on the label-tuple histogram.
 *       No voxel is visited (the histograms come from the agreement step and the tuple pass
 *       below).</li>
 *   <li><b>consensus, voxel parts</b>: per structure the signed surface distances of every reader
 *       to every reference ({@link CaseReferences#rowsWithSurfaces}), the STAPLE probability map
 *       and the thresholded consensus mask; for the case the label-tuple histogram pass and the
 *       multi-label consensus mask. These run on the caller's thread.</li>
 * </ol>
 * The first {@code warmups} rounds are discarded (class loading, JIT); each reported time is the
 * median over the remaining rounds. Totals are the median over rounds of the per-round sums.
 */
public final class CaseBench {

    /** Median times of one case, nanoseconds. */
    public record CaseTimes(String caseId, double readNs, double read1Ns, double agreementNs,
                            double consensusHistogramNs, double consensusVoxelNs, int readers, double lesionExtentMm) {
    }

    /**
     * @param cases per case medians, in case order
     * @param total medians over rounds of the per-round sums (caseId "total")
     * @param structures the structures measured (names)
     * @param rounds rounds measured (after warm-up)
     * @param warmups rounds discarded
     * @param threads threads used for reading and agreement
     */
    public record Result(List<CaseTimes> cases, CaseTimes total, List<String> structures, int rounds, int warmups,
                         int threads) {
        public Result {
            cases = List.copyOf(cases);
            structures = List.copyOf(structures);
        }
    }

    private CaseBench() {
    }

    /** Runs the measurement on every case of {@code study}. */
    public static Result run(Study study, int threads, int warmups, int rounds) throws InputException {
        return run(study, threads, warmups, rounds, true);
    }

    /**
     * Runs the measurement on every case of {@code study}; with {@code consensus} false the
     * consensus steps are skipped (their times are then 0).
     */
    public static Result run(Study study, int threads, int warmups, int rounds, boolean consensus)
        throws InputException {
        if (threads < 1 || warmups < 0 || rounds < 1) {
            throw new IllegalArgumentException("threads >= 1, warmups >= 0 and rounds >= 1 expected");
        }
        List<String> caseIds = study.cases();
        int nc = caseIds.size();
        ExecutorService readPool = threads > 1 ? Executors.newFixedThreadPool(threads, daemon("accordia-bench-read"))
            : null;
        ExecutorService enginePool = threads > 1 ? Executors.newFixedThreadPool(threads - 1,
            daemon("accordia-bench-agreement")) : null;
        try {
            CaseAgreementEngine engine = new CaseAgreementEngine(Structure.DEFAULT_TOLERANCE_MM,
                Structure.DEFAULT_TOLERANCE_MM, enginePool);
            // the structures of protocols/demo.yaml: lesion = {1, 2}, core = {2}
            List<Structure> structures = BenchStudies.protocol().structures();
            long check = 0;
            long[][][] t = new long[5][nc][rounds];
            int[] readers = new int[nc];
            double[] extent = new double[nc];
            for (int round = 0; round < warmups + rounds; round++) {
                int k = round - warmups;
                for (int c = 0; c < nc; c++) {
                    String caseId = caseIds.get(c);
                    List<MaskRef> refs = study.masksOf(caseId);
                    long t0 = System.nanoTime();
                    List<LabelVolume> masks = readParallel(refs, readPool);
                    long t1 = System.nanoTime();
                    check += CaseLoader.load(study, caseId, ReadLimits.DEFAULT,
                        Protocol.DEFAULT_GEOMETRY_TOLERANCE_MM).masks().size();
                    long t2 = System.nanoTime();
                    List<ReaderId> ids = new ArrayList<>();
                    List<String> names = new ArrayList<>();
                    List<String> centres = new ArrayList<>();
                    for (MaskRef r : refs) {
                        ids.add(r.reader());
                        names.add(r.reader().reader());
                        centres.add(r.reader().centre());
                    }
                    long t3 = System.nanoTime();
                    List<CaseAgreement> agreements = engine.evaluate(caseId, ids, masks, structures);
                    long t4 = System.nanoTime();
                    Geometry g = masks.get(0).geometry();
                    List<CaseReferences> references = new ArrayList<>();
                    for (int s = 0; consensus && s < structures.size(); s++) {
                        PatternHistogram h = agreements.get(s).histogram();
                        CaseReferences refsS = CaseReferences.compute(caseId, structures.get(s).name(), names, centres,
                            h, g.voxelVolumeMl(), StapleOptions.defaults());
                        check += refsS.rows().size();
                        references.add(refsS);
                    }
                    long t5 = System.nanoTime();
                    LabelTupleHistogram tuples = consensus ? LabelTupleHistogram.build(masks) : null;
                    long t6 = System.nanoTime();
                    MultiLabelStapleResult multi = consensus ? MultiLabelStaple.run(tuples) : null;
                    long t7 = System.nanoTime();
                    for (int s = 0; consensus && s < structures.size(); s++) {
                        CaseReferences r = references.get(s);
                        int[] labels = structures.get(s).labelArray();
                        // as the analysis does it: the agreement's union box, the map kept on its box
                        var union = agreements.get(s).unionBox();
                        check += r.rowsWithSurfaces(masks, labels, union).size();
                        check += ConsensusOutputs.probabilityInBox(masks, labels, r.all(), union).values().length;
                        LabelVolume cons = ConsensusOutputs.binaryConsensus(masks, labels, r.all(),
                            r.keepMask(org.accordia.consensus.ReaderPerformance.REFERENCE_ALL, 0), 1, union);
                        check += cons.voxelCount();
                    }
                    if (consensus) {
                        check += ConsensusOutputs.labelConsensus(masks, multi).voxelCount();
                    }
                    long t8 = System.nanoTime();
                    readers[c] = masks.size();
                    extent[c] = extentMm(agreements.get(0), g);
                    if (k >= 0) {
                        t[0][c][k] = t1 - t0;
                        t[1][c][k] = t2 - t1;
                        t[2][c][k] = t4 - t3;
                        t[3][c][k] = (t5 - t4) + (t7 - t6);
                        t[4][c][k] = (t6 - t5) + (t8 - t7);
                    }
                }
            }
            List<CaseTimes> out = new ArrayList<>();
            long[][] sums = new long[5][rounds];
            for (int c = 0; c < nc; c++) {
                for (int m = 0; m < 5; m++) {
                    for (int k = 0; k < rounds; k++) {
                        sums[m][k] += t[m][c][k];
                    }
                }
                out.add(new CaseTimes(caseIds.get(c), Medians.of(t[0][c]), Medians.of(t[1][c]), Medians.of(t[2][c]),
                    Medians.of(t[3][c]), Medians.of(t[4][c]), readers[c], extent[c]));
            }
            CaseTimes total = new CaseTimes("total", Medians.of(sums[0]), Medians.of(sums[1]), Medians.of(sums[2]),
                Medians.of(sums[3]), Medians.of(sums[4]), nc == 0 ? 0 : readers[0],
                Medians.of(extent));
            if (check == Long.MIN_VALUE) {
                throw new IllegalStateException("unreachable checksum");
            }
            return new Result(out, total, structures.stream().map(Structure::name).toList(), rounds, warmups, threads);
        } finally {
            if (readPool != null) {
                readPool.shutdownNow();
            }
            if (enginePool != null) {
                enginePool.shutdownNow();
            }
        }
    }

    /** Largest extent (mm) of the union box of the first structure: a measure of lesion size. */
    static double extentMm(CaseAgreement a, Geometry g) {
        if (a.unionBox().equals(org.accordia.grid.Box.EMPTY)) {
            return 0;
        }
        double[] sp = g.spacingMm();
        var b = a.unionBox();
        return Math.max((b.x1() - b.x0()) * sp[0], Math.max((b.y1() - b.y0()) * sp[1], (b.z1() - b.z0()) * sp[2]));
    }

    private static List<LabelVolume> readParallel(List<MaskRef> refs, ExecutorService pool) throws InputException {
        List<LabelVolume> out = new ArrayList<>();
        if (pool == null) {
            for (MaskRef r : refs) {
                out.add(Volumes.readLabels(r.path(), ReadLimits.DEFAULT));
            }
        } else {
            List<Future<LabelVolume>> fs = new ArrayList<>();
            for (MaskRef r : refs) {
                fs.add(pool.submit(() -> Volumes.readLabels(r.path(), ReadLimits.DEFAULT)));
            }
            for (Future<LabelVolume> f : fs) {
                try {
                    out.add(f.get());
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
        }
        for (int j = 1; j < out.size(); j++) {
            InputException bad = CaseLoader.mismatch(refs.get(0).path(), out.get(0).geometry(), refs.get(j).path(),
                out.get(j).geometry(), Protocol.DEFAULT_GEOMETRY_TOLERANCE_MM);
            if (bad != null) {
                throw bad;
            }
        }
        return out;
    }

    static java.util.concurrent.ThreadFactory daemon(String name) {
        return r -> {
            Thread th = new Thread(r, name);
            th.setDaemon(true);
            return th;
        };
    }
}
