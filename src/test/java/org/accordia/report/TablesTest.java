package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.accordia.agreement.PairMetrics;
import org.accordia.agreement.SurfaceMetrics;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.shift.CentreRow;
import org.accordia.study.ReaderId;
import org.junit.jupiter.api.Test;

/** The CSV rows of the result records: one number format, names neutralised, undefined = empty. */
class TablesTest {

    private static List<String> rendered(List<CsvTable.Cell> cells) {
        return cells.stream().map(CsvWriter::cellText).toList();
    }

    @Test
    void pairRowFollowsTheContract() {
        PairMetrics p = PairMetrics.of("case1", "whole", new ReaderId("r1", "north"), new ReaderId("r2", "south"),
            3, 1, 1, 0.5, new SurfaceMetrics(1.5, 1.25, 1.0, 2.0 / 3.0, 0.75, 1.0), 1.0);
        assertEquals("case,label,reader_a,centre_a,reader_b,centre_b,dice,jaccard,volume_a_ml,volume_b_ml,hd_mm,"
            + "hd95_mm,assd_mm,nsd,flag", String.join(",", Tables.PAIRS));
        // dice 2*1/(3+1), jaccard 1/3, volumes 3 and 1 voxels of 0.5 ml (hand-computed)
        assertEquals(List.of("case1", "whole", "r1", "north", "r2", "south", "0.5", "0.333333", "1.5", "0.5", "1.5",
            "1.25", "0.666667", "0.75", ""), rendered(Tables.pairRow(p)));
    }

    @Test
    void undefinedDistancesAreEmptyCells() {
        PairMetrics both = PairMetrics.of("c", "s", new ReaderId("a", "x"), new ReaderId("b", "x"), 0, 0, 0, 0.001,
            null, 1.0);
        List<String> row = rendered(Tables.pairRow(both));
        assertEquals("1", row.get(6)); // both empty: Dice 1 by convention (docs/metrics.md)
        assertEquals("", row.get(10));
        assertEquals("both_empty", row.get(14));
    }

    @Test
    void readerRowFollowsTheContract() {
        ReaderPerformance r = new ReaderPerformance("case1", "liver", "r2", "north", 0.8, 1.0, 2.0 / 3,
            12.5, Double.POSITIVE_INFINITY, Double.NaN, "others");
        assertEquals("case,label,reader,centre,sensitivity,specificity,dice_vs_consensus,volume_ml,volume_ratio,"
            + "signed_surface_mm,reference,border_outside_share,border_inside_share", String.join(",", Tables.READERS));
        // an infinite ratio (empty reference) is undefined: empty like NaN; no border profile: empty
        assertEquals(List.of("case1", "liver", "r2", "north", "0.8", "1", "0.666667", "12.5", "", "", "others", "", ""),
            rendered(Tables.readerRow(r)));
        long[] six = {10, 0, 0, 0, 0, 0};
        ReaderPerformance withBorder = r.withSurface(0.4, new org.accordia.consensus.BorderProfile(2.0, 40, 10, 2,
            new long[] {40, 0, 0, 0, 0, 0}, six));
        List<String> cells = rendered(Tables.readerRow(withBorder));
        assertEquals(List.of("0.4", "others", "0.25", "0.05"), cells.subList(9, 13));
    }

    @Test
    void centreRowFollowsTheContract() {
        assertEquals(List.of("label", "centre", "readers", "cases", "signed_surface_mm", "signed_surface_lo",
            "signed_surface_hi", "volume_ratio", "volume_ratio_lo", "volume_ratio_hi", "flag", "effect_mm",
            "effect_lo_mm", "effect_hi_mm", "effect_volume_ratio", "effect_volume_ratio_lo", "effect_volume_ratio_hi",
            "test_p", "test_p_holm", "test_min_p", "test_splits", "finding", "border_outside_share",
            "border_outside_excess", "border_outside_excess_lo", "border_outside_excess_hi", "border_inside_share",
            "border_inside_excess", "border_inside_excess_lo", "border_inside_excess_hi"), Tables.CENTRES);
        CentreRow row = new CentreRow("lesion", "hill", 3, 12, -0.25, Double.NaN, 0.125, 1.0, 0.9876543219, 1.1, "none",
            -0.5, -0.875, -0.125, 0.8, 0.7, 0.9, 0.25, 0.75, 1.0 / 84, 84, "none");
        assertEquals(List.of("lesion", "hill", "3", "12", "-0.25", "", "0.125", "1", "0.987654", "1.1", "none",
            "-0.5", "-0.875", "-0.125", "0.8", "0.7", "0.9", "0.25", "0.75", "0.0119048", "84", "none",
            "", "", "", "", "", "", "", ""), rendered(Tables.centreRow(row)));
    }

    @Test
    void namesFromInputAreNeutralisedNumbersAreNot() {
        ReaderPerformance r = new ReaderPerformance("=cmd|' /C calc'!A0", "-lesion", "@r", "+c", -0.5, 1, 1, 1, 1,
            -1.5, "all");
        List<String> row = rendered(Tables.readerRow(r));
        assertEquals("'=cmd|' /C calc'!A0", row.get(0)); // OWASP "CSV Injection": prefix a quote
        assertEquals("'-lesion", row.get(1));
        assertEquals("'@r", row.get(2));
        assertEquals("'+c", row.get(3));
        assertEquals("-0.5", row.get(4));
        assertEquals("-1.5", row.get(9));
    }
}
