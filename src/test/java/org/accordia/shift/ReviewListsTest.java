package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.junit.jupiter.api.Test;

class ReviewListsTest {
    @Test
    void casesToAdjudicateWithReasons() {
        ShiftSettings s = ShiftSettings.defaults();
        List<CaseToAdjudicate> out = ReviewLists.casesToAdjudicate(List.of(
                new CaseSummary("k3", 0.85, 4.0, 0, 9),
                new CaseSummary("k1", 0.62, 14.2, 0, 9),
                new CaseSummary("k2", 0.90, 3.0, 2, 9),
                new CaseSummary("k4", Double.NaN, Double.NaN, 0, 9),
                new CaseSummary("k5", 0.70, 10.0, 0, 9)), s);
        assertEquals(List.of("k1", "k2"), out.stream().map(CaseToAdjudicate::caseId).toList());
        assertEquals(List.of("median pairwise Dice 0.62 is below 0.70", "largest pairwise HD95 14.2 mm is above 10.0 mm"),
                out.get(0).reasons());
        assertEquals(List.of("2 reader pairs where one mask is empty and the other is not"), out.get(1).reasons());
    }

    @Test
    void readersToRecalibrate() {
        ShiftSettings s = ShiftSettings.defaults();
        List<ReaderToRecalibrate> out = ReviewLists.readersToRecalibrate(List.of(
                new GroupEffect("r1", "north", 1, 12, 1.6, 1.2, 2.0, 1.0, 0.9, 1.1),
                new GroupEffect("r2", "north", 1, 12, 0.6, 0.2, 1.2, 1.0, 0.9, 1.1),
                new GroupEffect("r3", "south", 1, 12, -0.1, -0.4, 0.2, 0.7, 0.6, 0.78),
                new GroupEffect("r4", "south", 1, 12, -0.6, -0.9, -0.3, 0.7, 0.6, 0.78)), s);
        // r3: volume 30 % smaller but the boundary does not move inside with confidence (surface
        // interval [-0.4, 0.2] holds 0): volume alone does not name a reader, as for centres.
        // r4: the same volume with the surface interval entirely inside: named.
        assertEquals(List.of("r1", "r4"), out.stream().map(ReaderToRecalibrate::reader).toList());
        assertTrue(out.get(0).reasons().get(0).startsWith("draws 1.6 mm [1.2, 2.0] outside the other readers' consensus"),
                out.get(0).reasons().toString());
        assertTrue(out.get(1).reasons().get(0).startsWith("volumes 30% [22%, 40%] smaller"), out.get(1).reasons().toString());
        assertTrue(out.get(1).reasons().get(0).endsWith("with the boundary moving the same way"), out.get(1).reasons().toString());
        assertEquals("south", out.get(1).centre());
    }
}
