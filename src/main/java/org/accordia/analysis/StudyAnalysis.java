package org.accordia.analysis;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
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
import java.util.concurrent.ForkJoinPool;
import java.util.stream.IntStream;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.CaseAgreementEngine;
import org.accordia.agreement.PairMetrics;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.consensus.ReaderSummary;
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
import org.accordia.stats.Quantiles;
import org.accordia.study.Analysability;
import org.accordia.study.CaseReader;
import org.accordia.study.LoadedCase;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;
import org.accordia.study.StudyProblem;

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
 * <p>The flow: {@link #plan} (once) → {@link CaseAnalysis#analyse} per case over a
 * {@link CaseExecutor} (the bounded local pool) → {@link #studyLevel} over the records.
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

    /** The shift settings a protocol implies ({@link AnalysisSettings#shiftSettings}). */
    public static ShiftSettings shiftSettings(Protocol p) {
        return AnalysisSettings.shiftSettings(p);
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
        CaseExecutor executor = CaseExecutor.local(options.threads());
        CasePlan plan = plan(source, protocol, options, executor);
        List<String> caseIds = source.caseIds();
        CaseRecord[] records = new CaseRecord[caseIds.size()];
        executor.forEachCase(caseIds.size(), i -> {
            String id = caseIds.get(i);
            LoadedCase lc = source.load(id);
            records[i] = CaseAnalysis.analyse(lc, plan, sink, () -> source.image(id, lc.geometry()));
            caseDone.run();
        });
        return studyLevel(plan, protocol, List.of(records), source.missing(), options, source.where());
    }

    /**
     * The case plan of a study, computed once: the structures (the protocol's, or one per label
     * value present, which costs one read of every case), whether a multi-label consensus is made
     * and its undecided value, and every step's settings.
     *
     * @throws InputException a case cannot be read, or no mask holds any foreground label
     */
    public static CasePlan plan(CaseSource source, Protocol protocol, AnalysisOptions options, CaseExecutor executor)
            throws InputException, IOException {
        if (source.caseIds().isEmpty()) {
            throw new IllegalArgumentException("the study has no case");
        }
        SortedSet<Integer> labelValues = protocol.hasExplicitStructures() ? allLabels(protocol.structures())
            : scanLabels(source, executor);
        List<Structure> structures = protocol.structuresFor(labelValues);
        if (structures.isEmpty()) {
            refuse(Analysability.noStructureVoxels(structures, s -> false, source.where()));
        }
        boolean multiLabel = labelValues.size() > 1;
        int undecided = multiLabel ? UndecidedLabel.defaultFor(labelValues.stream().mapToInt(Integer::intValue).toArray())
            : -1;
        AnalysisSettings all = options.shiftSettings() != null
            ? AnalysisSettings.from(protocol).withShiftSettings(options.shiftSettings()) : AnalysisSettings.from(protocol);
        return new CasePlan(structures, multiLabel, undecided, all);
    }

    /**
     * The study level as a function of the per-case records: the analysability rule on what the
     * cases hold, then per structure the shift analysis, reader summaries and missed parts, and
     * the flagged events.
     *
     * @param plan the plan the records were made with
     * @param protocol the protocol (its study name is carried into the result)
     * @param records one record per case, in case order
     * @param missing (case, reader) pairs without a mask
     * @param where the file named when no mask holds a voxel of any structure
     * @throws InputException no mask holds a voxel of any structure analysed
     */
    public static StudyResult studyLevel(CasePlan plan, Protocol protocol, List<CaseRecord> records,
            List<CaseReader> missing, AnalysisOptions options, java.nio.file.Path where) throws InputException {
        List<Structure> structures = plan.structures();
        AnalysisSettings all = plan.settings();
        List<CaseRecord> cases = List.copyOf(records);
        // the analysability rule on what the cases hold: no voxel of any structure in any mask stops the run
        refuse(Analysability.noStructureVoxels(structures, st -> cases.stream().anyMatch(c -> c.structures().stream()
            .anyMatch(sc -> sc.structure().equals(st) && sc.agreement().voxelCounts().stream().anyMatch(n -> n > 0))),
            where));
        ShiftSettings settings = all.shift().settings();
        TreeSet<ReaderId> readers = new TreeSet<>();
        cases.forEach(c -> readers.addAll(c.readers()));
        Map<ReaderId, String> keys = readerKeys(readers);
        // structures are independent at the study level: one task each, results in protocol order
        LabelResult[] labels = new LabelResult[structures.size()];
        inStudyPool(options.threads(), structures.size(), s -> labels[s] = studyLevel(s, structures.get(s), cases,
            readers, keys, all, options.readerSummaries()));
        TreeSet<String> centres = new TreeSet<>();
        readers.forEach(r -> centres.add(r.centre()));
        return new StudyResult(protocol.withSeed(settings.seed()), all, structures, List.copyOf(readers),
            List.copyOf(centres), cases, List.of(labels), events(cases, missing),
            all.consensus().staple().region(), plan.undecidedValue());
    }

    private static void refuse(StudyProblem p) throws InputException {
        if (p != null) {
            throw new InputException(p.file(), p.message());
        }
    }

    // ------------------------------------------------------------------ per case

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
    private static SortedSet<Integer> scanLabels(CaseSource source, CaseExecutor executor)
            throws InputException, IOException {
        List<String> ids = source.caseIds();
        @SuppressWarnings("unchecked")
        java.util.Set<Integer>[] seen = new java.util.Set[ids.size()];
        executor.forEachCase(ids.size(), i -> {
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
            Map<ReaderId, String> keys, AnalysisSettings all, boolean summaries) {
        ShiftSettings settings = all.shift().settings();
        Protocol.ShiftDistance distance = all.shift().distance();
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
            distances.add(new CaseDistances(c.caseId(), caseKeys, distanceMatrix(ca, distance)));
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
                        // one common reference per case, antisymmetric border offset: the measure the centre
                        // effects and the variance-component model share
                        commonMeasures.add(new ReaderCaseMeasure(keys.get(r), r.centre(), c.caseId(),
                            p.borderOffsetMm(), p.volumeRatio()));
                        variance.add(new ReaderMeasure(c.caseId(), r.centre(), keys.get(r), p.borderOffsetMm()));
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
            if (!sc.absent()) { // a case where no reader drew the structure says nothing about a reader
                allRows.addAll(sc.performance());
            }
        }
        double[][] volumes = volumeRows.size() >= 2 && readers.size() >= 2 ? volumeRows.toArray(new double[0][]) : null;
        LabelShiftInput input = new LabelShiftInput(s + 1, st.name(), distanceName(distance),
            readerCentre, distances, centreMeasures, readerMeasures, commonMeasures,
            "border offset against the consensus of all readers (mm)", variance, summaries2, volumes,
            maskLabels);
        LabelShiftReport report = ShiftAnalysis.analyse(input, settings);
        List<String> notes = new ArrayList<>();
        LabelShiftSummary summary = orderFlagged(report, notes, settings);
        List<ReaderSummary> rs = summaries
            ? ReaderSummary.summarise(allRows, all.consensus().bootstrapResamples(), settings.seed() + 7919L * (s + 1))
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
        /** One case in which a reader leaves out a part. */
        record Miss(String caseId, int parts, double partsMl, double sensitivity, double othersMedian) {
        }
        Map<ReaderId, List<Miss>> low = new TreeMap<>();
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
                    .add(new Miss(c.caseId(), sc.missedParts().get(j), sc.missedPartsMl().get(j), sens, Quantiles.median(others)));
            }
        }
        List<MissedStructure> out = new ArrayList<>();
        for (var e : low.entrySet()) {
            List<Miss> v = e.getValue();
            out.add(new MissedStructure(e.getKey().reader(), e.getKey().centre(),
                v.stream().map(Miss::caseId).toList(), v.stream().map(Miss::parts).toList(),
                v.stream().map(Miss::partsMl).toList(), v.stream().map(Miss::sensitivity).toList(),
                v.stream().map(Miss::othersMedian).toList()));
        }
        // most cases first, then by reader order
        out.sort(Comparator.comparingInt((MissedStructure m) -> -m.cases().size()));
        return out;
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
