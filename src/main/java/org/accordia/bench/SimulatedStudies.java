package org.accordia.bench;

import java.util.List;
import java.util.Locale;
import org.accordia.analysis.AnalysisOptions;
import org.accordia.analysis.CaseSource;
import org.accordia.analysis.StudyAnalysis;
import org.accordia.analysis.StudyResult;
import org.accordia.demo.DemoGenerator;
import org.accordia.shift.ShiftSettings;
import org.accordia.study.Protocol;
import org.accordia.study.Structure;

/**
 * The calibration's {@link Calibration.StudyRunner}: generates a study in memory
 * ({@link DemoGenerator#inMemory}) and runs the full library pipeline on it
 * ({@link StudyAnalysis#run}: agreement → STAPLE references with signed surfaces → shift
 * analysis and verdict) with one structure, {@code lesion} = labels {1, 2}, and every other setting
 * at its protocol default. Only parts that do not enter the flag may be reduced: the per-reader
 * bootstrap summaries are skipped, and with {@code reducedResampling} the parametric bootstraps of
 * the variance components (intervals and the likelihood-ratio test of σ²_centre) are switched off.
 * The permutation test and the centre-effect bootstrap, which decide the flag, keep their defaults.
 */
public final class SimulatedStudies implements Calibration.StudyRunner {
    /** The structure calibrated. */
    public static final String STRUCTURE = "lesion";

    private final boolean reducedResampling;
    private final Protocol protocol;

    /** With the default consensus region (the whole grid). */
    public SimulatedStudies(boolean reducedResampling) {
        this(reducedResampling, Protocol.defaults().consensus().region());
    }

    /**
     * @param reducedResampling switch off the variance-component bootstraps (not part of the flag)
     * @param region where STAPLE runs (protocol key {@code consensus.region})
     */
    public SimulatedStudies(boolean reducedResampling, Protocol.ConsensusRegion region) {
        this.reducedResampling = reducedResampling;
        Protocol d = Protocol.defaults();
        this.protocol = new Protocol("calibration (simulated)", List.of(new Structure(STRUCTURE, List.of(1, 2),
            Structure.DEFAULT_TOLERANCE_MM)), d.geometryToleranceMm(), d.maxVoxels(), d.seed(), d.agreement(),
            new Protocol.Consensus(region, d.consensus().bootstrapResamples()), d.shift(), d.review());
    }

    public double alpha() {
        return protocol.shift().alpha();
    }

    public String structureName() {
        return STRUCTURE;
    }

    public Protocol protocol() {
        return protocol;
    }

    /** The shift settings of one run. */
    ShiftSettings settings(long seed) {
        ShiftSettings s = StudyAnalysis.shiftSettings(protocol.withSeed(seed));
        return reducedResampling ? s.withResampling(s.permutations(), s.bootstrapResamples(), 0, 0) : s;
    }

    /** What the runs use, in words. */
    public String describe() {
        ShiftSettings s = settings(0);
        return String.format(Locale.ROOT, "full library pipeline (StudyAnalysis on in-memory cases): structure %s ="
                + " labels {1, 2}, STAPLE region %s, distance %s, permutation test (exact when at most %d distinct"
                + " partitions, else %d permutations), centre-effect case bootstrap %d resamples, minimum shift %s mm"
                + " or %s%% volume; reduced (not part of the flag): per-reader bootstrap summaries off%s",
            STRUCTURE, protocol.consensus().region().key(), protocol.shift().distance().key(), s.exactLimit(),
            s.permutations(), s.bootstrapResamples(), BenchNumbers.text(s.minimumShiftMm()),
            BenchNumbers.text(s.minimumVolumeShiftPercent()), reducedResampling
                ? ", variance-component parametric bootstraps off (intervals and LRT resamples 0)" : "");
    }

    /** The full analysis of one generated study. */
    public StudyResult analyse(DemoGenerator.InMemory demo, long analysisSeed) throws Exception {
        CaseSource source = CaseSource.of(demo.caseIds(), demo::load, null);
        return StudyAnalysis.run(source, protocol.withSeed(analysisSeed),
            new AnalysisOptions(1, settings(analysisSeed), false));
    }

    @Override
    public ScenarioOutcome run(DemoGenerator.InMemory demo, long analysisSeed) throws Exception {
        return ScenarioOutcome.of(analyse(demo, analysisSeed), STRUCTURE);
    }
}
