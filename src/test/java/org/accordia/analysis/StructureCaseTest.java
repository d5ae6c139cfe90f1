package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.accordia.grid.Box;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.PairMetrics;
import org.accordia.agreement.SurfaceMetrics;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;
import org.junit.jupiter.api.Test;

/** Absent, partly drawn and drawn: a structure's state in one case, from the readers' voxel counts. */
class StructureCaseTest {

    static StructureCase caseWith(long... counts) {
        List<String> readers = new ArrayList<>();
        List<String> centres = new ArrayList<>();
        List<Long> voxels = new ArrayList<>();
        List<Double> volumes = new ArrayList<>();
        for (int j = 0; j < counts.length; j++) {
            readers.add("r" + j);
            centres.add("c");
            voxels.add(counts[j]);
            volumes.add(counts[j] * 0.001);
        }
        List<PairMetrics> pairs = new ArrayList<>();
        for (int a = 0; a < counts.length; a++) {
            for (int b = a + 1; b < counts.length; b++) {
                // overlap: the smaller mask inside the larger one
                pairs.add(PairMetrics.of("case", "core", new ReaderId("r" + a, "c"), new ReaderId("r" + b, "c"),
                    counts[a], counts[b], Math.min(counts[a], counts[b]), 0.001,
                    counts[a] > 0 && counts[b] > 0 ? new SurfaceMetrics(1, 1, 1, 1, 1, 1) : null, 2.0));
            }
        }
        CaseAgreement ca = new CaseAgreement("case", "core", readers, centres, pairs, Double.NaN, 0, 2.0, Double.NaN,
            Double.NaN, 0, 0, 0, Double.NaN, Double.NaN, volumes, voxels, Box.EMPTY, 2.0, 0.001, null);
        return new StructureCase(new Structure("core", List.of(2), 2.0), ca, List.of(), Double.NaN, List.of(),
            List.of());
    }

    @Test
    void noReaderDrewItIsAbsentWithNoWorstPair() {
        StructureCase sc = caseWith(0, 0, 0);
        assertTrue(sc.absent());
        assertEquals(StructureCase.ABSENT, sc.state());
        assertEquals(0, sc.readersDrawing());
        // every pair has Dice 1 by the empty-mask convention; no pair is "worst" among them
        sc.agreement().pairs().forEach(p -> assertEquals(1.0, p.dice()));
        assertNull(sc.worstPair());
    }

    @Test
    void someReadersDrewItIsPartlyDrawn() {
        StructureCase sc = caseWith(5, 0, 3);
        assertFalse(sc.absent());
        assertEquals(StructureCase.PARTLY_DRAWN, sc.state());
        assertEquals(2, sc.readersDrawing());
        assertEquals(0.0, sc.worstPair().dice(), "a drawn mask against an empty one");
    }

    @Test
    void everyReaderDrewItIsDrawn() {
        StructureCase sc = caseWith(5, 2, 3);
        assertEquals(StructureCase.DRAWN, sc.state());
        assertEquals(3, sc.readersDrawing());
        // Dice(2, 5) = 2*2/(2+5) = 4/7, the lowest of the three (hand-computed)
        assertEquals(4.0 / 7, sc.worstPair().dice(), 1e-12);
    }
}
