package org.accordia.report;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.analysis.AnalysisSettings;
import org.accordia.analysis.FlaggedEvent;
import org.accordia.analysis.InputChecksums;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.MissedStructure;
import org.accordia.analysis.StudyResult;
import org.accordia.shift.CaseToAdjudicate;
import org.accordia.shift.LabelShiftSummary;
import org.accordia.shift.ReaderToRecalibrate;
import org.accordia.shift.ShiftSettings;
import org.accordia.shift.Verdict;
import org.accordia.study.Protocol;
import org.accordia.study.Structure;

/**
 * The content of {@code summary.json} (docs/outputs.md): fixed field order, numbers in the one
 * number format ({@link JsonOutput}), nothing that depends on the machine, the output folder, the
 * time or the number of threads.
 */
@JsonPropertyOrder({"tool", "version", "study", "settings", "protocol", "staple_region", "multi_label_undecided_value",
    "structures", "labels", "flagged_events", "inputs", "cautions"})
public record SummaryJson(
        @JsonProperty("tool") String tool,
        @JsonProperty("version") String version,
        @JsonProperty("study") StudyInfo study,
        @JsonProperty("settings") Map<String, Object> settings,
        @JsonProperty("protocol") ProtocolInfo protocol,
        @JsonProperty("staple_region") String stapleRegion,
        @JsonProperty("multi_label_undecided_value") Integer multiLabelUndecidedValue,
        @JsonProperty("structures") List<StructureInfo> structures,
        @JsonProperty("labels") List<Label> labels,
        @JsonProperty("flagged_events") Map<String, Integer> flaggedEvents,
        @JsonProperty("inputs") List<InputChecksums.InputFile> inputs,
        @JsonProperty("cautions") List<String> cautions) {

    /** What was analysed. */
    @JsonPropertyOrder({"name", "cases", "readers", "centres"})
    public record StudyInfo(@JsonProperty("name") String name, @JsonProperty("cases") int cases,
                            @JsonProperty("readers") int readers, @JsonProperty("centres") List<String> centres) {
    }

    /**
     * Where the run's protocol came from.
     *
     * @param source {@code given_file} (--protocol), {@code study_folder} (the study's
     *     protocol.yaml), {@code defaults}, or {@code supplied} (by a calling program)
     * @param file the file read, relative to the study root ('/'-separated), or its name alone
     *     when it lies outside the study; null without a file
     */
    @JsonPropertyOrder({"source", "file"})
    public record ProtocolInfo(@JsonProperty("source") String source, @JsonProperty("file") String file) {
    }

    /** One structure of the protocol. */
    @JsonPropertyOrder({"name", "labels", "tolerance_mm"})
    public record StructureInfo(@JsonProperty("name") String name, @JsonProperty("labels") List<Integer> labels,
                                @JsonProperty("tolerance_mm") double toleranceMm) {
    }

    /** A reader who overlooks whole parts of the structure. */
    @JsonPropertyOrder({"reader", "centre", "cases", "parts_ml", "sensitivity", "others_median_sensitivity"})
    public record Missed(@JsonProperty("reader") String reader, @JsonProperty("centre") String centre,
                         @JsonProperty("cases") List<String> cases, @JsonProperty("parts_ml") List<Double> partsMl,
                         @JsonProperty("sensitivity") List<Double> sensitivity,
                         @JsonProperty("others_median_sensitivity") List<Double> othersMedian) {
    }

    /** The per-label result: the shift summary's fields plus the notes of the analysis. */
    @JsonPropertyOrder({"label", "name", "labels", "shift", "variance_measure", "variance_components",
        "variance_interval_method", "centre_variance_test", "icc", "verdict", "rule", "reasons", "centre_notes",
        "cases_to_adjudicate", "readers_to_recalibrate", "readers_missing_parts", "design_limitations", "empty_groups",
        "masks_to_correct"})
    public record Label(
            @JsonProperty("label") int label,
            @JsonProperty("name") String name,
            @JsonProperty("labels") List<Integer> labels,
            @JsonProperty("shift") LabelShiftSummary.Shift shift,
            @JsonProperty("variance_measure") String varianceMeasure,
            @JsonProperty("variance_components") Map<String, LabelShiftSummary.Component> varianceComponents,
            @JsonProperty("variance_interval_method") String varianceIntervalMethod,
            @JsonProperty("centre_variance_test") LabelShiftSummary.CentreVarianceTest centreVarianceTest,
            @JsonProperty("icc") List<LabelShiftSummary.IccForm> icc,
            @JsonProperty("verdict") Verdict verdict,
            @JsonProperty("rule") String rule,
            @JsonProperty("reasons") List<String> reasons,
            @JsonProperty("centre_notes") List<String> centreNotes,
            @JsonProperty("cases_to_adjudicate") List<CaseToAdjudicate> casesToAdjudicate,
            @JsonProperty("readers_to_recalibrate") List<ReaderToRecalibrate> readersToRecalibrate,
            @JsonProperty("readers_missing_parts") List<Missed> readersMissingParts,
            @JsonProperty("design_limitations") List<org.accordia.shift.DesignLimit> designLimitations,
            @JsonProperty("empty_groups") List<org.accordia.shift.EmptyGroup> emptyGroups,
            @JsonProperty("masks_to_correct") List<org.accordia.shift.MaskToCorrect> masksToCorrect) {
    }

    /** The cautions every output carries. */
    public static final List<String> CAUTIONS = List.of(
        "Accordia is a research and quality tool, not a diagnostic device.",
        "The consensus is a statistical estimate, not ground truth.",
        "Decisions on pooling, adjudication and re-annotation rest with the study's clinical lead, under local "
            + "protocols and ethics approval.",
        "Masks derived from patients' images may be personal data; Accordia runs locally and sends nothing anywhere.");

    /** Builds the summary of a run whose protocol was supplied by the calling program. */
    public static SummaryJson of(StudyResult r, String version, List<InputChecksums.InputFile> inputs) {
        return of(r, version, new ProtocolInfo("supplied", null), inputs);
    }

    /** Builds the summary. */
    public static SummaryJson of(StudyResult r, String version, ProtocolInfo protocol,
            List<InputChecksums.InputFile> inputs) {
        List<StructureInfo> structures = new ArrayList<>();
        for (Structure s : r.structures()) {
            structures.add(new StructureInfo(s.name(), s.labels(), s.toleranceMm()));
        }
        List<Label> labels = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            LabelShiftSummary s = l.summary();
            List<Missed> missed = new ArrayList<>();
            for (MissedStructure m : l.missedStructure()) {
                missed.add(new Missed(m.reader(), m.centre(), m.cases(), m.partsMl(), m.sensitivities(),
                    m.othersMedian()));
            }
            labels.add(new Label(s.label(), s.name(), l.structure().labels(), s.shift(), s.varianceMeasure(),
                s.varianceComponents(), s.varianceIntervalMethod(), s.centreVarianceTest(), s.icc(), s.verdict(),
                s.rule(), s.reasons(), l.centreNotes(), s.casesToAdjudicate(), s.readersToRecalibrate(), missed,
                s.designLimitations(), s.emptyGroups(), s.masksToCorrect()));
        }
        Map<String, Integer> events = new TreeMap<>();
        for (String k : List.of(FlaggedEvent.MISSING_MASK, FlaggedEvent.EMPTY_MASK, FlaggedEvent.UNDEFINED_DISTANCES,
                FlaggedEvent.ABSENT)) {
            events.put(k, 0);
        }
        Absence.events(r).forEach(e -> events.merge(e.kind(), 1, Integer::sum));
        return new SummaryJson("Accordia", version,
            new StudyInfo(r.protocol().study(), r.cases().size(), r.readers().size(), r.centres()),
            settings(r.settings()), protocol, r.stapleRegion(),
            r.multiLabelUndecided() < 0 ? null : r.multiLabelUndecided(), structures, labels, events, inputs,
            CAUTIONS);
    }

    /** The settings used, by their protocol keys (docs/protocol.md), plus the shift resampling sizes. */
    static Map<String, Object> settings(AnalysisSettings a) {
        ShiftSettings s = a.shift().settings();
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("seed", s.seed());
        m.put("geometry_tolerance_mm", a.read().geometryToleranceMm());
        m.put("max_voxels", a.read().maxVoxels());
        m.put("agreement.hd95", a.agreement().hd95().key());
        m.put("consensus.region", a.consensus().region().key());
        m.put("consensus.bootstrap_resamples", a.consensus().bootstrapResamples());
        m.put("shift.distance", a.shift().distance().key());
        m.put("shift.alpha", s.alpha());
        m.put("shift.permutations", s.permutations());
        m.put("shift.exact_limit", s.exactLimit());
        m.put("shift.minimum_shift_mm", s.minimumShiftMm());
        m.put("shift.minimum_volume_shift_percent", s.minimumVolumeShiftPercent());
        m.put("shift.bootstrap_resamples", s.bootstrapResamples());
        m.put("shift.variance_resamples", s.varianceResamples());
        m.put("shift.centre_test_resamples", s.centreTestResamples());
        m.put("review.adjudication_dice", s.adjudicationDice());
        m.put("review.adjudication_hd95_mm", s.adjudicationHd95Mm());
        m.put("review.recalibration_tolerance_mm", s.recalibrationToleranceMm());
        m.put("review.recalibration_volume_percent", s.recalibrationVolumePercent());
        m.put("review.adjudication_share_for_review", s.adjudicationShare());
        return new TreeMap<>(m);
    }
}
