package org.accordia.consensus;

import java.util.List;
import java.util.Locale;

/**
 * One reader's performance on one case and structure against one reference consensus; one row of
 * {@code readers.csv}.
 *
 * @param caseId case identifier
 * @param label structure name
 * @param reader reader identifier
 * @param centre the reader's centre
 * @param sensitivity fraction of the reference consensus the reader marks, in [0, 1] (for
 *     {@code all}: STAPLE's own p_j); NaN when the reference is empty
 * @param specificity fraction of the reference background (within the STAPLE region) the reader
 *     leaves out (for {@code all}: STAPLE's q_j); NaN when undefined
 * @param diceVsConsensus Dice of the reader vs the thresholded reference (W ≥ 0.5); NaN when both
 *     are empty
 * @param volumeMl the reader's volume in millilitres
 * @param volumeRatio reader volume / thresholded reference volume; +∞ when the reference is
 *     empty and the reader is not, NaN when both are empty
 * @param signedSurfaceMm mean signed distance of the reader's border voxels to the reference
 *     boundary in mm (positive = outside the reference); NaN when not computed or undefined
 * @param reference {@code all}, {@code others} or {@code other_centres} (see docs/consensus.md)
 */
public record ReaderPerformance(String caseId, String label, String reader, String centre, double sensitivity,
        double specificity, double diceVsConsensus, double volumeMl, double volumeRatio, double signedSurfaceMm,
        String reference) {

    public static final String REFERENCE_ALL = "all";
    public static final String REFERENCE_OTHERS = "others";
    public static final String REFERENCE_OTHER_CENTRES = "other_centres";

    /** Header of readers.csv. */
    public static final String CSV_HEADER =
        "case,label,reader,centre,sensitivity,specificity,dice_vs_consensus,volume_ml,volume_ratio,signed_surface_mm,reference";

    public ReaderPerformance {
        if (!List.of(REFERENCE_ALL, REFERENCE_OTHERS, REFERENCE_OTHER_CENTRES).contains(reference)) {
            throw new IllegalArgumentException("unknown reference " + reference);
        }
    }

    /** The same row with a signed surface distance filled in. */
    public ReaderPerformance withSignedSurfaceMm(double mm) {
        return new ReaderPerformance(caseId, label, reader, centre, sensitivity, specificity, diceVsConsensus,
            volumeMl, volumeRatio, mm, reference);
    }

    /**
     * The row as CSV cells in {@link #CSV_HEADER} order: numbers with {@link #format(double)},
     * text as is (quoting is the CSV writer's job).
     */
    public List<String> csvCells() {
        return List.of(caseId, label, reader, centre, format(sensitivity), format(specificity),
            format(diceVsConsensus), format(volumeMl), format(volumeRatio), format(signedSurfaceMm), reference);
    }

    /**
     * Deterministic number formatting (Locale.ROOT): empty cell for NaN, {@code inf}/{@code -inf}
     * for infinities, otherwise up to 10 significant digits with trailing zeros removed
     * (e.g. {@code 0.8}, {@code 12.5}, {@code 1.234567891e-05}).
     */
    public static String format(double v) {
        if (Double.isNaN(v)) {
            return "";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "inf" : "-inf";
        }
        if (v == 0) {
            return "0";
        }
        String s = String.format(Locale.ROOT, "%.10g", v);
        String mantissa = s;
        String exp = "";
        int e = s.indexOf('e');
        if (e >= 0) {
            mantissa = s.substring(0, e);
            exp = s.substring(e);
        }
        if (mantissa.indexOf('.') >= 0) {
            mantissa = mantissa.replaceAll("0+$", "");
            if (mantissa.endsWith(".")) {
                mantissa = mantissa.substring(0, mantissa.length() - 1);
            }
        }
        return mantissa + exp;
    }
}
