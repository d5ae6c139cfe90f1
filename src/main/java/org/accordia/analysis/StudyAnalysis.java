package org.accordia.analysis;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SortedSet;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.Future;
import java.util.concurrent.Semaphore;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.IntStream;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.CaseAgreementEngine;
import org.accordia.agreement.PairMetrics;
import org.accordia.agreement.PatternHistogram;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.LabelTupleHistogram;
import org.accordia.consensus.MultiLabelStaple;
import org.accordia.consensus.MultiLabelStapleResult;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.consensus.ReaderSummary;
import org.accordia.consensus.StapleOptions;
import org.accordia.consensus.UndecidedLabel;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.shift.CaseDistances;
import org.accordia.shift.CaseSummary;
import org.accordia.shift.GroupEffect;
import org.accordia.shift.LabelShiftInput;
import org.accordia.shift.LabelShiftReport;
import org.accordia.shift.LabelShiftSummary;
import org.accordia.shift.MaskLabels;
import org.accordia.shift.MaskToCorrect;
import org.accordia.shift.ReaderCaseMeasure;
import org.accordia.shift.ReaderMeasure;
import org.accordia.shift.ShiftAnalysis;
import org.accordia.shift.ShiftSettings;
import org.accordia.study.CaseReader;
import org.accordia.study.LoadedCase;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

/**
 * One study from its cases to its decision: the library pipeline behind {@code accordia analyze},
 * usable on a study folder ({@link CaseSource#ofStudy}) and on cases generated in memory
 * ({@link CaseSource#of}).
 *
 * <pre>{@code
 * DemoGenerator.InMemory demo = DemoGenerator.inMemory(DemoSpec.defaults());
 * CaseSource source = CaseSource.of(demo.caseIds(), demo::load, null);
 * StudyResult r = StudyAnalysis.run(source, protocol, AnalysisOptions.defaults().withThreads(2));
 * r.labels().get(0).summary().verdict();   // pool, review or re-annotate
 * }</pre>
 *
 * <p>Per case (in parallel, at most {@code threads} cases in memory): agreement per structure
 * ({@link CaseAgreementEngine}); the STAPLE references all / others / other_centres with signed
 * surfaces ({@link CaseReferences#rowsWithSurfaces}); when the study has several label values, the
 * multi-label STAPLE; the sink; a {@link CaseRecord}. Per structure: the {@link LabelShiftInput}
 * (distance matrices from the pairs per the protocol's {@code shift.distance}; raw centre effects
 * from the signed surface distance against the other centres' consensus; the judged centre effects
 * Δ_c and the variance components from the same measure against the consensus of all readers;
 * reader effects against the other readers' consensus; case summaries; complete-case volumes for
 * the ICC), {@link ShiftAnalysis}, reader bootstrap summaries, readers who overlook part of the
 * structure, and notes on centre effects.
 *
 * <p>Deterministic: results are sorted by case, structure and reader and every random stream is
 * seeded from the protocol's seed, so the same inputs and seed give the same result whatever the
 * number of threads. Seeds: shift analysis {@code seed} (offsets per label inside
 * {@link ShiftAnalysis}); reader summaries {@code seed + 7919 × label index}.
 */
public final class StudyAnalysis {
    private StudyAnalysis() {
    }

    /**
     * The shift settings a protocol implies. Resampling sizes follow the protocol's
     * {@code consensus.bootstrap_resamples} (B, default 2000): B case-bootstrap resamples for the
     * centre and reader effects, and B/10 (at most the documented defaults 200 and 199) parametric
     * bootstrap resamples for the variance-component intervals and the test of σ²_centre = 0.
     */
    public static ShiftSettings shiftSettings(Protocol p) {
        Protocol.Shift s = p.shift();
        Protocol.Review r = p.review();
        return new ShiftSettings(s.alpha(), s.minimumShiftMm(), s.minimumVolumeShiftPercent(), r.adjudicationDice(),
            r.adjudicationHd95Mm(), r.adjudicationShareForReview(), r.recalibrationToleranceMm(),
            r.recalibrationVolumePercent(), s.permutations(), ShiftSettings.DEFAULT_EXACT_LIMIT,
            p.consensus().bootstrapResamples(),
            Math.min(ShiftSettings.DEFAULT_VARIANCE_RESAMPLES, p.consensus().bootstrapResamples() / 10),
            Math.min(ShiftSettings.DEFAULT_CENTRE_TEST_RESAMPLES, p.consensus().bootstrapResamples() / 10 - 1),
            p.seed());
    }

    /** As {@link #run(CaseSource, Protocol, AnalysisOptions, CaseSink, Runnable)} without a sink. */
    public static StudyResult run(CaseSource source, Protocol protocol, AnalysisOptions options) throws InputException {
        try {
            return run(source, protocol, options, CaseSink.NONE, () -> { });
        } catch (IOException e) {
            throw new UncheckedIOException(e); // the empty sink writes nothing
        }
    }

    /**
     * Runs the analysis.
     *
     * @param source the cases
     * @param protocol the settings (structures, thresholds, seed)
     * @param options threads and optional overrides
     * @param sink receives each case while its volumes are in memory (thread-safe)
     * @param caseDone called after each case (from worker threads), e.g. to show progress
     * @throws InputException a case cannot be read or its grids disagree
     * @throws IOException the sink failed
     */
    public static StudyResult run(CaseSource source, Protocol protocol, AnalysisOptions options, CaseSink sink,
            Runnable caseDone) throws InputException, IOException {
        List<String> caseIds = source.caseIds();
        if (caseIds.isEmpty()) {
            throw new IllegalArgumentException("the study has no case");
        }
        SortedSet<Integer> labelValues = protocol.hasExplicitStructures() ? allLabels(protocol.structures())
            : scanLabels(source, options.threads());
        List<Structure> structures = protocol.structuresFor(labelValues);
        if (structures.isEmpty()) {
            throw new InputException(source.inputFiles().isEmpty() ? null : source.inputFiles().get(0),
                "no mask holds any foreground label, so there is no structure to analyse");
        }
        boolean multiLabel = labelValues.size() > 1;
        int undecided = multiLabel ? UndecidedLabel.defaultFor(labelValues.stream().mapToInt(Integer::intValue).toArray())
            : -1;
        Protocol.ConsensusRegion region = protocol.consensus().region();
        StapleOptions staple = StapleOptions.defaults().withRegion(regionWords(region));
        CaseRecord[] records = new CaseRecord[caseIds.size()];
        forEachCase(caseIds, options.threads(), i -> {
            LoadedCase lc = source.load(caseIds.get(i));
            records[i] = analyseCase(lc, structures, multiLabel, undecided, staple, region, sink);
            caseDone.run();
        });
        ShiftSettings settings = options.shiftSettings() != null ? options.shiftSettings() : shiftSettings(protocol);
        List<CaseRecord> cases = List.of(records);
        TreeSet<ReaderId> readers = new TreeSet<>();
        cases.forEach(c -> readers.addAll(c.readers()));
        Map<ReaderId, String> keys = readerKeys(readers);
        // structures are independent at the study level: one task each, results in protocol order
        LabelResult[] labels = new LabelResult[structures.size()];
        inStudyPool(options.threads(), structures.size(), s -> labels[s] = studyLevel(s, structures.get(s), cases,
            readers, keys, protocol, settings, options.readerSummaries()));
        TreeSet<String> centres = new TreeSet<>();
        readers.forEach(r -> centres.add(r.centre()));
        return new StudyResult(protocol.withSeed(settings.seed()), settings, structures, List.copyOf(readers),
            List.copyOf(centres), cases, List.of(labels), events(cases, source.missing()),
            staple.region(), undecided);
    }

    // ------------------------------------------------------------------ per case

    @FunctionalInterface
    private interface CaseTask {
        void run(int index) throws InputException, IOException;
    }

    /**
     * Runs {@code task} for every case (or structure) over a pool of {@code threads} workers; a case is only
     * started when fewer than {@code threads} cases are in flight (semaphore), so at most that
     * many cases are in memory. The first failure stops new cases and is rethrown.
     */
    private static void forEachCase(List<String> caseIds, int threads, CaseTask task) throws InputException, IOException {
        int workers = Math.max(1, Math.min(threads, caseIds.size()));
        ExecutorService pool = Executors.newFixedThreadPool(workers, r -> {
            Thread t = new Thread(r, "accordia-analyze");
            t.setDaemon(true);
            return t;
        });
        Semaphore inFlight = new Semaphore(workers);
        AtomicReference<Throwable> failure = new AtomicReference<>();
        List<Future<?>> futures = new ArrayList<>();
        try {
            for (int i = 0; i < caseIds.size() && failure.get() == null; i++) {
                inFlight.acquire();
                int index = i;
                futures.add(pool.submit(() -> {
                    try {
                        if (failure.get() == null) {
                            task.run(index);
                        }
                    } catch (Throwable t) {
                        failure.compareAndSet(null, t);
                    } finally {
                        inFlight.release();
                    }
                }));
            }
            for (Future<?> f : futures) {
                f.get();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("analysis interrupted", e);
        } catch (ExecutionException e) {
            failure.compareAndSet(null, e.getCause());
        } finally {
            pool.shutdownNow();
        }
        Failures.rethrow(failure.get());
    }

    /**
     * Runs {@code task} for 0 ≤ s &lt; count as a parallel stream inside a fork-join pool of
     * {@code threads} workers. The parallel resampling inside a structure's shift analysis (the
     * variance components' parametric bootstrap) runs in the same pool, so a structure that finishes
     * early leaves its worker to the others' resamples, and no more than {@code threads} workers
     * run in all. Unchecked failures are rethrown as they are.
     */
    private static void inStudyPool(int threads, int count, java.util.function.IntConsumer task) {
        ForkJoinPool pool = new ForkJoinPool(Math.max(1, threads));
        try {
            pool.submit(() -> IntStream.range(0, count).parallel().forEach(task)).get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("analysis interrupted", e);
        } catch (ExecutionException e) {
            Failures.rethrowUnchecked(e.getCause());
        } finally {
            pool.shutdownNow();
        }
    }

    private static SortedSet<Integer> allLabels(List<Structure> structures) {
        TreeSet<Integer> out = new TreeSet<>();
        structures.forEach(s -> out.addAll(s.labels()));
        return out;
    }

    /** Label values (≥ 1) present in any mask; one extra read of every case. */
    private static SortedSet<Integer> scanLabels(CaseSource source, int threads) throws InputException, IOException {
        List<String> ids = source.caseIds();
        @SuppressWarnings("unchecked")
        java.util.Set<Integer>[] seen = new java.util.Set[ids.size()];
        forEachCase(ids, threads, i -> {
            TreeSet<Integer> s = new TreeSet<>();
            for (LabelVolume v : source.load(ids.get(i)).masks()) {
                v.labelCounts().forEach((k, n) -> {
                    if (k >= 1 && n > 0) {
                        s.add(k);
                    }
                });
            }
            seen[i] = s;
        });
        TreeSet<Integer> out = new TreeSet<>();
        for (var s : seen) {
            out.addAll(s);
        }
        return out;
    }

    /** One case: agreement, consensus, sink, record. Package-private for tests. */
    static CaseRecord analyseCase(LoadedCase lc, List<Structure> structures, boolean multiLabel, int undecided,
            StapleOptions staple, Protocol.ConsensusRegion region, CaseSink sink) throws IOException {
        List<ReaderId> readers = lc.readers();
        List<LabelVolume> masks = lc.masks();
        List<String> names = readers.stream().map(ReaderId::reader).toList();
        List<String> centres = readers.stream().map(ReaderId::centre).toList();
        double tolerance = structures.stream().mapToDouble(Structure::toleranceMm).min().orElse(Structure.DEFAULT_TOLERANCE_MM);
        List<CaseAgreement> agreements = new ArrayList<>();
        // one engine pass per distinct tolerance (usually one or two)
        Map<Double, List<Integer>> byTolerance = new TreeMap<>();
        for (int s = 0; s < structures.size(); s++) {
            byTolerance.computeIfAbsent(structures.get(s).toleranceMm(), k -> new ArrayList<>()).add(s);
        }
        CaseAgreement[] bySlot = new CaseAgreement[structures.size()];
        for (var e : byTolerance.entrySet()) {
            List<Structure> group = e.getValue().stream().map(structures::get).toList();
            List<CaseAgreement> got = new CaseAgreementEngine(e.getKey(), e.getKey(), null)
                .evaluate(lc.caseId(), readers, masks, group);
            for (int k = 0; k < got.size(); k++) {
                bySlot[e.getValue().get(k)] = got.get(k);
            }
        }
        agreements.addAll(Arrays.asList(bySlot));
        List<StructureCase> out = new ArrayList<>();
        List<CaseReferences> refs = new ArrayList<>();
        double worstMedian = Double.POSITIVE_INFINITY;
        for (int s = 0; s < structures.size(); s++) {
            Structure st = structures.get(s);
            CaseAgreement ca = agreements.get(s);
            PatternHistogram h = region == Protocol.ConsensusRegion.UNION_MARGIN ? unionMargin(ca) : ca.histogram();
            CaseReferences r = CaseReferences.compute(lc.caseId(), st.name(), names, centres, h,
                ca.voxelVolumeMl(), staple);
            List<ReaderPerformance> rows = r.rowsWithSurfaces(masks, st.labels().stream().mapToInt(Integer::intValue).toArray(),
                ca.unionBox(), st.toleranceMm());
            double maxHd95 = Double.NaN;
            for (PairMetrics p : ca.pairs()) {
                if (p.hasDistances() && !(p.hd95Mm() <= maxHd95)) {
                    maxHd95 = p.hd95Mm();
                }
            }
            double voxelMm3 = ca.voxelVolumeMl() * 1000;
            int minVoxels = (int) Math.max(1, Math.ceil(4.0 / 3 * Math.PI * Math.pow(st.toleranceMm(), 3) / voxelMm3));
            long[][] missed = MissedComponents.find(masks, st, ca.unionBox(), minVoxels);
            List<Integer> parts = new ArrayList<>();
            List<Double> partsMl = new ArrayList<>();
            for (long[] m : missed) {
                parts.add((int) m[0]);
                partsMl.add(m[1] * ca.voxelVolumeMl());
            }
            out.add(new StructureCase(st, ca, rows, maxHd95, parts, partsMl));
            refs.add(r);
            if (!Double.isNaN(ca.medianDice())) {
                worstMedian = Math.min(worstMedian, ca.medianDice());
            }
        }
        List<ReaderId> empty = new ArrayList<>();
        for (int j = 0; j < masks.size(); j++) {
            if (masks.get(j).maxLabel() == 0) {
                empty.add(readers.get(j));
            }
        }
        MultiLabelStapleResult ml = null;
        long undecidedVoxels = -1;
        if (multiLabel) {
            ml = MultiLabelStaple.run(LabelTupleHistogram.build(masks), staple, undecided);
            undecidedVoxels = ml.consensusCounts().getOrDefault(undecided, 0L);
        }
        double score = worstMedian == Double.POSITIVE_INFINITY ? Double.NaN : 1 - worstMedian;
        List<java.util.SortedMap<Integer, Long>> labelCounts = new ArrayList<>();
        for (LabelVolume v : masks) {
            TreeMap<Integer, Long> counts = new TreeMap<>();
            v.labelCounts().forEach((k, n) -> {
                if (k >= 1 && n > 0) {
                    counts.put(k, n);
                }
            });
            labelCounts.add(counts);
        }
        CaseRecord record = new CaseRecord(lc.caseId(), readers, empty, out, score, undecidedVoxels, labelCounts);
        sink.accept(new CaseSink.CaseWork(lc, refs, ml, undecided, record));
        return record;
    }

    /** The STAPLE region in words (reported with every specificity). */
    static String regionWords(Protocol.ConsensusRegion region) {
        return region == Protocol.ConsensusRegion.UNION_MARGIN
            ? "union of all readers' structure grown by the structure's tolerance"
            : StapleOptions.WHOLE_GRID;
    }

    /**
     * The histogram restricted to the union of all readers' structure grown by the structure's
     * tolerance (the kappa region of the agreement step): every voxel outside the union has
     * pattern 0, so only the count of pattern 0 changes, to the region's voxels outside the union.
     */
    static PatternHistogram unionMargin(CaseAgreement ca) {
        PatternHistogram h = ca.histogram();
        long union = 0;
        for (int i = 0; i < h.size(); i++) {
            if (h.pattern(i) != 0) {
                union += h.count(i);
            }
        }
        long background = Math.max(0, ca.kappaRegionVoxels() - union);
        List<Long> p = new ArrayList<>();
        List<Long> c = new ArrayList<>();
        if (background > 0) {
            p.add(0L);
            c.add(background);
        }
        for (int i = 0; i < h.size(); i++) {
            if (h.pattern(i) != 0) {
                p.add(h.pattern(i));
                c.add(h.count(i));
            }
        }
        if (p.isEmpty()) {
            return h; // every mask empty: keep the whole grid
        }
        return new PatternHistogram(h.readers(), p.stream().mapToLong(Long::longValue).toArray(),
            c.stream().mapToLong(Long::longValue).toArray());
    }

    // ------------------------------------------------------------------ study level

    /**
     * The key of each reader in the shift analysis: the reader's name when it is unique across
     * centres, else "centre/reader".
     */
    static Map<ReaderId, String> readerKeys(java.util.Collection<ReaderId> readers) {
        Map<String, Integer> count = new HashMap<>();
        readers.forEach(r -> count.merge(r.reader(), 1, Integer::sum));
        Map<ReaderId, String> out = new LinkedHashMap<>();
        for (ReaderId r : readers) {
            out.put(r, count.get(r.reader()) == 1 ? r.reader() : r.label());
        }
        return out;
    }

    private static LabelResult studyLevel(int s, Structure st, List<CaseRecord> cases, TreeSet<ReaderId> readers,
            Map<ReaderId, String> keys, Protocol protocol, ShiftSettings settings, boolean summaries) {
        Map<String, String> readerCentre = new TreeMap<>();
        keys.forEach((r, k) -> readerCentre.put(k, r.centre()));
        List<CaseDistances> distances = new ArrayList<>();
        List<ReaderCaseMeasure> centreMeasures = new ArrayList<>();
        List<ReaderCaseMeasure> readerMeasures = new ArrayList<>();
        List<ReaderCaseMeasure> commonMeasures = new ArrayList<>();
        List<ReaderMeasure> variance = new ArrayList<>();
        List<CaseSummary> summaries2 = new ArrayList<>();
        List<double[]> volumeRows = new ArrayList<>();
        List<ReaderPerformance> allRows = new ArrayList<>();
        List<MaskLabels> maskLabels = new ArrayList<>();
        for (CaseRecord c : cases) {
            StructureCase sc = c.structures().get(s);
            CaseAgreement ca = sc.agreement();
            List<String> caseKeys = c.readers().stream().map(keys::get).toList();
            distances.add(new CaseDistances(c.caseId(), caseKeys, distanceMatrix(ca, protocol.shift().distance())));
            for (int j = 0; j < c.readers().size(); j++) {
                ReaderId r = c.readers().get(j);
                for (ReaderPerformance p : sc.performance()) {
                    if (!p.reader().equals(r.reader()) || !p.centre().equals(r.centre())) {
                        continue;
                    }
                    ReaderCaseMeasure m = new ReaderCaseMeasure(keys.get(r), r.centre(), c.caseId(),
                        p.signedSurfaceMm(), p.volumeRatio(), p.border());
                    if (p.reference().equals(ReaderPerformance.REFERENCE_OTHER_CENTRES)) {
                        centreMeasures.add(m);
                    } else if (p.reference().equals(ReaderPerformance.REFERENCE_ALL)) {
                        // one common reference per case: the measure the centre effects and the model share
                        commonMeasures.add(m);
                        variance.add(new ReaderMeasure(c.caseId(), r.centre(), keys.get(r), p.signedSurfaceMm()));
                    } else if (p.reference().equals(ReaderPerformance.REFERENCE_OTHERS)) {
                        readerMeasures.add(m);
                    }
                }
            }
            summaries2.add(caseSummary(c, sc, caseKeys));
            for (int j = 0; j < c.readers().size(); j++) {
                maskLabels.add(new MaskLabels(caseKeys.get(j), c.readers().get(j).centre(), c.caseId(),
                    ca.voxelCounts().get(j), j < c.labelCounts().size() ? c.labelCounts().get(j) : new TreeMap<>()));
            }
            if (c.readers().size() == readers.size()) {
                volumeRows.add(ca.volumesMl().stream().mapToDouble(Double::doubleValue).toArray());
            }
            allRows.addAll(sc.performance());
        }
        double[][] volumes = volumeRows.size() >= 2 && readers.size() >= 2 ? volumeRows.toArray(new double[0][]) : null;
        LabelShiftInput input = new LabelShiftInput(s + 1, st.name(), distanceName(protocol.shift().distance()),
            readerCentre, distances, centreMeasures, readerMeasures, commonMeasures,
            "signed surface distance against the consensus of all readers (mm)", variance, summaries2, volumes,
            maskLabels);
        LabelShiftReport report = ShiftAnalysis.analyse(input, settings);
        List<String> notes = new ArrayList<>();
        LabelShiftSummary summary = orderFlagged(report, notes, settings);
        List<ReaderSummary> rs = summaries
            ? ReaderSummary.summarise(allRows, protocol.consensus().bootstrapResamples(), settings.seed() + 7919L * (s + 1))
            : List.of();
        return new LabelResult(s + 1, st, input, report, summary, notes, rs, missedStructure(cases, s));
    }

    /**
     * The adjudication summary of one case and structure, with its pairs and the masks a reader
     * should correct: a whole majority part left out ({@link MissedComponents}), or an empty mask
     * while every other reader draws the structure.
     */
    static CaseSummary caseSummary(CaseRecord c, StructureCase sc, List<String> caseKeys) {
        CaseAgreement ca = sc.agreement();
        int n = ca.readers().size();
        double[] dice = new double[ca.pairs().size()];
        double[] hd95 = new double[ca.pairs().size()];
        for (int k = 0; k < dice.length; k++) {
            PairMetrics p = ca.pairs().get(k);
            dice[k] = p.dice();
            hd95[k] = p.hasDistances() ? p.hd95Mm() : Double.NaN;
        }
        boolean[] emptyMask = new boolean[n];
        int drawing = 0;
        for (int j = 0; j < n; j++) {
            emptyMask[j] = ca.voxelCounts().get(j) == 0;
            drawing += emptyMask[j] ? 0 : 1;
        }
        List<MaskToCorrect> fix = new ArrayList<>();
        for (int j = 0; j < n; j++) {
            String centre = c.readers().get(j).centre();
            if (emptyMask[j] && n >= 3 && drawing == n - 1) {
                fix.add(new MaskToCorrect(c.caseId(), caseKeys.get(j), centre, MaskToCorrect.Kind.EMPTY_WHILE_OTHERS_DRAW,
                    0, 0));
            } else if (!emptyMask[j] && sc.missedParts().get(j) > 0) {
                fix.add(new MaskToCorrect(c.caseId(), caseKeys.get(j), centre, MaskToCorrect.Kind.LEAVES_OUT_PART,
                    sc.missedParts().get(j), sc.missedPartsMl().get(j)));
            }
        }
        return new CaseSummary(c.caseId(), ca.medianDice(), sc.maxHd95Mm(), ca.oneEmptyPairs(), c.readers().size(),
            caseKeys, dice, hd95, emptyMask, fix);
    }

    /** The pairwise distance matrix of one case per the protocol's distance (NaN = undefined). */
    static double[][] distanceMatrix(CaseAgreement ca, Protocol.ShiftDistance kind) {
        int r = ca.readers().size();
        double[][] d = new double[r][r];
        int k = 0;
        for (int a = 0; a < r; a++) {
            for (int b = a + 1; b < r; b++) {
                PairMetrics p = ca.pairs().get(k++);
                double v = switch (kind) {
                    case ONE_MINUS_JACCARD -> 1 - p.jaccard();
                    case HD95 -> p.hd95Mm();
                    case ONE_MINUS_NSD -> 1 - p.nsd();
                };
                d[a][b] = v;
                d[b][a] = v;
            }
        }
        return d;
    }

    static String distanceName(Protocol.ShiftDistance kind) {
        return switch (kind) {
            case ONE_MINUS_JACCARD -> "1 - Jaccard";
            case HD95 -> "HD95 (mm)";
            case ONE_MINUS_NSD -> "1 - NSD";
        };
    }

    /**
     * The summary with {@code shift.flagged_centres} ordered by the size of the centre's effect,
     * largest first, and notes on the mirror effect: each centre is compared with the consensus of
     * the other centres, which includes a shifted one, so when one of G centres draws Δ outside,
     * the others appear about Δ/(G−1) inside.
     */
    static LabelShiftSummary orderFlagged(LabelShiftReport report, List<String> notes, ShiftSettings settings) {
        LabelShiftSummary sum = report.summary();
        List<GroupEffect> effects = new ArrayList<>(report.centreEffects());
        effects.removeIf(e -> Double.isNaN(e.signedSurfaceMm()));
        effects.sort(Comparator.comparingDouble((GroupEffect e) -> -Math.abs(e.signedSurfaceMm()))
            .thenComparing(GroupEffect::group));
        List<String> flagged = new ArrayList<>(sum.shift().flaggedCentres());
        Map<String, Integer> rank = new HashMap<>();
        for (int i = 0; i < effects.size(); i++) {
            rank.put(effects.get(i).group(), i);
        }
        flagged.sort(Comparator.comparingInt((String c) -> rank.getOrDefault(c, Integer.MAX_VALUE))
            .thenComparing(Comparator.naturalOrder()));
        int g = effects.size();
        if (g >= 3) {
            GroupEffect top = effects.get(0);
            boolean topMatters = !flagged.isEmpty() && flagged.get(0).equals(top.group())
                || Math.abs(top.signedSurfaceMm()) > settings.minimumShiftMm();
            if (topMatters) {
                double expected = Math.abs(top.signedSurfaceMm()) / (g - 1);
                List<String> mirrored = new ArrayList<>();
                for (GroupEffect e : effects.subList(1, g)) {
                    if (Math.signum(e.signedSurfaceMm()) == -Math.signum(top.signedSurfaceMm())
                        && Math.abs(e.signedSurfaceMm()) < Math.abs(top.signedSurfaceMm())) {
                        mirrored.add(String.format(Locale.ROOT, "%s (%.1f mm %s)", e.group(),
                            Math.abs(e.signedSurfaceMm()), e.signedSurfaceMm() < 0 ? "inside" : "outside"));
                    }
                }
                if (!mirrored.isEmpty()) {
                    String side = top.signedSurfaceMm() >= 0 ? "outside" : "inside";
                    String other = top.signedSurfaceMm() >= 0 ? "inside" : "outside";
                    notes.add(String.format(Locale.ROOT,
                        "The primary finding is centre %s, which draws %.1f mm %s the other centres. %s the other "
                            + "way by a smaller amount. That is expected: each centre is compared with the consensus "
                            + "of the OTHER centres, which includes %s, so when one of %d centres draws Δ mm %s, the "
                            + "others appear shifted %s by up to about Δ/(G−1) = %.1f mm. Read these smaller opposite "
                            + "effects as a mirror of %s's shift, not as findings of their own.",
                        top.group(), Math.abs(top.signedSurfaceMm()), side,
                        mirrored.size() == 1 ? "Centre " + mirrored.get(0) + " appears shifted"
                            : "Centres " + String.join(", ", mirrored) + " appear shifted",
                        top.group(), g, side, other, expected, top.group()));
                }
            }
        }
        LabelShiftSummary.Shift sh = sum.shift();
        LabelShiftSummary.Shift reordered = new LabelShiftSummary.Shift(sh.distance(), sh.betweenShare(),
            sh.betweenVariance(), sh.withinVariance(), sh.n0(), sh.pseudoF(), sh.dfBetween(), sh.dfWithin(),
            sh.pValue(), sh.permutations(), sh.exact(), sh.minP(), sh.canReachAlpha(), sh.designStatement(), flagged,
            sh.notes());
        return sum.withShift(reordered);
    }

    /**
     * Readers who overlook a whole part of the structure (a majority-consensus component they do not
     * touch) in at least one case, with their sensitivity against the other readers' consensus in
     * those cases and the median of the other readers' sensitivities there.
     */
    static List<MissedStructure> missedStructure(List<CaseRecord> cases, int s) {
        Map<ReaderId, List<Object[]>> low = new TreeMap<>();
        for (CaseRecord c : cases) {
            StructureCase sc = c.structures().get(s);
            List<ReaderPerformance> rows = sc.rows(ReaderPerformance.REFERENCE_OTHERS);
            for (int j = 0; j < c.readers().size(); j++) {
                if (sc.missedParts().get(j) == 0) {
                    continue;
                }
                double sens = Double.NaN;
                double[] others = new double[Math.max(0, rows.size() - 1)];
                int k = 0;
                for (ReaderPerformance p : rows) {
                    if (p.reader().equals(c.readers().get(j).reader()) && p.centre().equals(c.readers().get(j).centre())) {
                        sens = p.sensitivity();
                    } else if (k < others.length) {
                        others[k++] = p.sensitivity();
                    }
                }
                low.computeIfAbsent(c.readers().get(j), x -> new ArrayList<>())
                    .add(new Object[] {c.caseId(), sc.missedParts().get(j), sc.missedPartsMl().get(j), sens,
                        median(others)});
            }
        }
        List<MissedStructure> out = new ArrayList<>();
        for (var e : low.entrySet()) {
            List<Object[]> v = e.getValue();
            out.add(new MissedStructure(e.getKey().reader(), e.getKey().centre(),
                v.stream().map(o -> (String) o[0]).toList(), v.stream().map(o -> (Integer) o[1]).toList(),
                v.stream().map(o -> (Double) o[2]).toList(), v.stream().map(o -> (Double) o[3]).toList(),
                v.stream().map(o -> (Double) o[4]).toList()));
        }
        // most cases first, then by reader order
        out.sort(Comparator.comparingInt((MissedStructure m) -> -m.cases().size()));
        return out;
    }

    private static double median(double[] v) {
        double[] x = Arrays.stream(v).filter(d -> !Double.isNaN(d)).sorted().toArray();
        if (x.length == 0) {
            return Double.NaN;
        }
        return x.length % 2 == 1 ? x[x.length / 2] : (x[x.length / 2 - 1] + x[x.length / 2]) / 2;
    }

    private static List<FlaggedEvent> events(List<CaseRecord> cases, List<CaseReader> missing) {
        List<FlaggedEvent> out = new ArrayList<>();
        for (CaseReader m : missing) {
            out.add(new FlaggedEvent(m.caseId(), "", m.reader().label(), FlaggedEvent.MISSING_MASK,
                "no mask from reader " + m.reader().label()));
        }
        for (CaseRecord c : cases) {
            for (StructureCase sc : c.structures()) {
                CaseAgreement ca = sc.agreement();
                for (int j = 0; j < ca.readers().size(); j++) {
                    if (ca.voxelCounts().get(j) == 0) {
                        out.add(new FlaggedEvent(c.caseId(), sc.structure().name(),
                            ca.centres().get(j) + "/" + ca.readers().get(j), FlaggedEvent.EMPTY_MASK,
                            "the mask has no voxel of " + sc.structure().name()));
                    }
                }
                int undefined = ca.oneEmptyPairs() + ca.bothEmptyPairs();
                if (undefined > 0) {
                    out.add(new FlaggedEvent(c.caseId(), sc.structure().name(), "", FlaggedEvent.UNDEFINED_DISTANCES,
                        undefined + " reader pair" + (undefined == 1 ? "" : "s") + " without surface distances ("
                            + ca.oneEmptyPairs() + " with one empty mask, " + ca.bothEmptyPairs() + " with both empty)"));
                }
            }
        }
        out.sort(null);
        return out;
    }
}
