package org.accordia.shift;

import java.util.List;
import java.util.Map;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/**
 * The per-label summary for the JSON report (Jackson-friendly records, fixed field order, snake_case
 * names, NaN written as null).
 */
@JsonPropertyOrder({"label", "name", "shift", "variance_measure", "variance_components", "variance_interval_method",
    "centre_variance_test", "icc", "verdict", "rule", "reasons", "cases_to_adjudicate", "readers_to_recalibrate", "design_limitations", "empty_groups",
    "masks_to_correct"})
public record LabelShiftSummary(
        @JsonProperty("label") int label,
        @JsonProperty("name") String name,
        @JsonProperty("shift") Shift shift,
        @JsonProperty("variance_measure") String varianceMeasure,
        @JsonProperty("variance_components") Map<String, Component> varianceComponents,
        @JsonProperty("variance_interval_method") String varianceIntervalMethod,
        @JsonProperty("centre_variance_test") CentreVarianceTest centreVarianceTest,
        @JsonProperty("icc") List<IccForm> icc,
        @JsonProperty("verdict") Verdict verdict,
        @JsonProperty("rule") String rule,
        @JsonProperty("reasons") List<String> reasons,
        @JsonProperty("cases_to_adjudicate") List<CaseToAdjudicate> casesToAdjudicate,
        @JsonProperty("readers_to_recalibrate") List<ReaderToRecalibrate> readersToRecalibrate,
        @JsonProperty("design_limitations") List<DesignLimit> designLimitations,
        @JsonProperty("empty_groups") List<EmptyGroup> emptyGroups,
        @JsonProperty("masks_to_correct") List<MaskToCorrect> masksToCorrect) {

    public LabelShiftSummary {
        varianceComponents = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(varianceComponents));
        icc = List.copyOf(icc);
        reasons = List.copyOf(reasons);
        casesToAdjudicate = List.copyOf(casesToAdjudicate);
        readersToRecalibrate = List.copyOf(readersToRecalibrate);
        designLimitations = List.copyOf(designLimitations);
        emptyGroups = List.copyOf(emptyGroups);
        masksToCorrect = List.copyOf(masksToCorrect);
    }

    /** A summary without design limitations, empty groups or masks to correct. */
    public LabelShiftSummary(int label, String name, Shift shift, String varianceMeasure,
            Map<String, Component> varianceComponents, String varianceIntervalMethod,
            CentreVarianceTest centreVarianceTest, List<IccForm> icc, Verdict verdict, String rule, List<String> reasons,
            List<CaseToAdjudicate> casesToAdjudicate, List<ReaderToRecalibrate> readersToRecalibrate) {
        this(label, name, shift, varianceMeasure, varianceComponents, varianceIntervalMethod, centreVarianceTest, icc,
                verdict, rule, reasons, casesToAdjudicate, readersToRecalibrate, List.of(), List.of(), List.of());
    }

    /** The same summary with another partition-and-test block (e.g. flagged centres reordered). */
    public LabelShiftSummary withShift(Shift newShift) {
        return new LabelShiftSummary(label, name, newShift, varianceMeasure, varianceComponents, varianceIntervalMethod,
                centreVarianceTest, icc, verdict, rule, reasons, casesToAdjudicate, readersToRecalibrate,
                designLimitations, emptyGroups, masksToCorrect);
    }

    /** The distance-based partition and its permutation test. */
    @JsonPropertyOrder({"distance", "between_share", "between_variance", "within_variance", "n0", "pseudo_f",
        "df_between", "df_within", "p_value", "permutations", "exact", "min_p", "can_reach_alpha", "design_statement",
        "flagged_centres", "notes"})
    public record Shift(
            @JsonProperty("distance") String distance,
            @JsonProperty("between_share") Double betweenShare,
            @JsonProperty("between_variance") Double betweenVariance,
            @JsonProperty("within_variance") Double withinVariance,
            @JsonProperty("n0") Double n0,
            @JsonProperty("pseudo_f") Double pseudoF,
            @JsonProperty("df_between") int dfBetween,
            @JsonProperty("df_within") int dfWithin,
            @JsonProperty("p_value") Double pValue,
            @JsonProperty("permutations") long permutations,
            @JsonProperty("exact") boolean exact,
            @JsonProperty("min_p") Double minP,
            @JsonProperty("can_reach_alpha") boolean canReachAlpha,
            @JsonProperty("design_statement") String designStatement,
            @JsonProperty("flagged_centres") List<String> flaggedCentres,
            @JsonProperty("notes") List<String> notes) {
        public Shift {
            flaggedCentres = List.copyOf(flaggedCentres);
            notes = List.copyOf(notes);
        }
    }

    /** One variance component (σ², in the squared unit of the measure) with its interval. */
    @JsonPropertyOrder({"estimate", "lower", "upper"})
    public record Component(@JsonProperty("estimate") Double estimate, @JsonProperty("lower") Double lower,
            @JsonProperty("upper") Double upper) {
    }

    /** The test of σ²_centre = 0. */
    @JsonPropertyOrder({"statistic", "p_value", "method"})
    public record CentreVarianceTest(@JsonProperty("statistic") Double statistic,
            @JsonProperty("p_value") Double pValue, @JsonProperty("method") String method) {
    }

    /** One Shrout–Fleiss ICC form with its interval. */
    @JsonPropertyOrder({"form", "value", "lower", "upper"})
    public record IccForm(@JsonProperty("form") String form, @JsonProperty("value") Double value,
            @JsonProperty("lower") Double lower, @JsonProperty("upper") Double upper) {
    }
}
