package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/** Centres and readers whose masks are all empty for a structure the others draw. */
class EmptyGroupsTest {
    private static MaskLabels mask(String reader, String centre, String c, long voxels, int... labels) {
        TreeMap<Integer, Long> counts = new TreeMap<>();
        for (int l : labels) {
            counts.put(l, 100L);
        }
        return new MaskLabels(reader, centre, c, voxels, counts);
    }

    @Test
    void aCentreCodingOtherLabelsIsTheFindingWithItsLabels() {
        // norvale codes lesion as 5 and core as 6; the others use 1 and 2
        List<MaskLabels> m = new ArrayList<>();
        for (String c : List.of("k1", "k2", "k3")) {
            for (String r : List.of("est1", "est2")) {
                m.add(mask(r, "esterhaven", c, 500, 1, 2));
            }
            for (String r : List.of("nor1", "nor2")) {
                m.add(mask(r, "norvale", c, 0, 5, 6));
            }
            for (String r : List.of("qui1", "qui2")) {
                m.add(mask(r, "quillbay", c, 480, 1, 2));
            }
        }
        List<EmptyGroup> g = EmptyGroups.find(m);
        assertEquals(1, g.size(), g.toString());
        assertEquals(new EmptyGroup(EmptyGroup.Level.CENTRE, "norvale", "norvale", 6, 3, List.of(5, 6)), g.get(0));
        String words = VerdictRules.emptyWords(g.get(0));
        assertEquals("Centre norvale: all 6 masks are empty for this structure, which most other readers draw on 3 of "
            + "its cases; labels 5 and 6 occur only at centre norvale — a label convention?", words);
    }

    @Test
    void aReaderWhoNeverDrawsIsNamedUnlessTheCaseIsRare() {
        List<MaskLabels> m = new ArrayList<>();
        for (String c : List.of("k1", "k2", "k3")) {
            m.add(mask("a1", "A", c, 300, 1));
            m.add(mask("a2", "A", c, 0));
            m.add(mask("b1", "B", c, 320, 1));
        }
        assertEquals(List.of(new EmptyGroup(EmptyGroup.Level.READER, "a2", "A", 3, 3, List.of())), EmptyGroups.find(m));
        // a structure the others draw on one case only is not a finding (a slip, listed as a mask to correct)
        List<MaskLabels> rare = new ArrayList<>();
        for (String c : List.of("k1", "k2", "k3")) {
            rare.add(mask("a1", "A", c, c.equals("k1") ? 300 : 0));
            rare.add(mask("a2", "A", c, 0));
            rare.add(mask("b1", "B", c, c.equals("k1") ? 320 : 0));
        }
        assertEquals(List.of(), EmptyGroups.find(rare));
        // nobody draws it: not a finding either (an absent structure)
        List<MaskLabels> absent = m.stream().map(x -> new MaskLabels(x.reader(), x.centre(), x.caseId(), 0,
            x.labelCounts())).toList();
        assertEquals(List.of(), EmptyGroups.find(absent));
    }
}
