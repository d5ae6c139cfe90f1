package org.accordia.shift;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * Centres and readers whose every mask is empty for a structure the others draw.
 *
 * <p>A centre is listed when each of its masks has no voxel of the structure while, on at least
 * {@value #MIN_CASES} of its cases (or on all of them when it read fewer), more than half of the
 * other centres' readers present draw it. A reader is listed on the same terms against the other
 * readers, unless the reader's whole centre is already listed. With the finding goes the list of
 * label values that occur in the group's masks and in no other mask — "labels 5 and 6 occur only
 * at centre X" points to a label convention.
 */
public final class EmptyGroups {
    /** Cases on which the others must draw the structure before an all-empty group is a finding. */
    public static final int MIN_CASES = 2;

    private EmptyGroups() {
    }

    /** The findings, centres first (by name), then readers (by key). */
    public static List<EmptyGroup> find(List<MaskLabels> masks) {
        List<EmptyGroup> out = new ArrayList<>();
        TreeMap<String, List<MaskLabels>> byCentre = new TreeMap<>();
        TreeMap<String, List<MaskLabels>> byReader = new TreeMap<>();
        for (MaskLabels m : masks) {
            byCentre.computeIfAbsent(m.centre(), k -> new ArrayList<>()).add(m);
            byReader.computeIfAbsent(m.reader(), k -> new ArrayList<>()).add(m);
        }
        Set<String> emptyCentres = new TreeSet<>();
        if (byCentre.size() >= 2) {
            for (var e : byCentre.entrySet()) {
                EmptyGroup g = check(EmptyGroup.Level.CENTRE, e.getKey(), e.getKey(), e.getValue(), masks,
                    m -> m.centre().equals(e.getKey()));
                if (g != null) {
                    out.add(g);
                    emptyCentres.add(e.getKey());
                }
            }
        }
        if (byReader.size() >= 2) {
            for (var e : byReader.entrySet()) {
                String centre = e.getValue().get(0).centre();
                if (emptyCentres.contains(centre)) {
                    continue;
                }
                EmptyGroup g = check(EmptyGroup.Level.READER, e.getKey(), centre, e.getValue(), masks,
                    m -> m.reader().equals(e.getKey()));
                if (g != null) {
                    out.add(g);
                }
            }
        }
        return out;
    }

    private static EmptyGroup check(EmptyGroup.Level level, String name, String centre, List<MaskLabels> group,
            List<MaskLabels> all, java.util.function.Predicate<MaskLabels> inGroup) {
        if (group.stream().anyMatch(m -> m.structureVoxels() > 0)) {
            return null;
        }
        Set<String> cases = new TreeSet<>();
        group.forEach(m -> cases.add(m.caseId()));
        Map<String, int[]> others = new HashMap<>();   // case -> {drawing, present}
        TreeSet<Integer> labelsHere = new TreeSet<>();
        TreeSet<Integer> labelsElsewhere = new TreeSet<>();
        for (MaskLabels m : all) {
            if (inGroup.test(m)) {
                m.labelCounts().forEach((k, n) -> {
                    if (k >= 1 && n > 0) {
                        labelsHere.add(k);
                    }
                });
                continue;
            }
            m.labelCounts().forEach((k, n) -> {
                if (k >= 1 && n > 0) {
                    labelsElsewhere.add(k);
                }
            });
            if (cases.contains(m.caseId())) {
                int[] c = others.computeIfAbsent(m.caseId(), k -> new int[2]);
                c[1]++;
                c[0] += m.structureVoxels() > 0 ? 1 : 0;
            }
        }
        int drawn = 0;
        for (int[] c : others.values()) {
            drawn += 2 * c[0] > c[1] ? 1 : 0;
        }
        if (drawn < Math.min(MIN_CASES, cases.size())) {
            return null;
        }
        labelsHere.removeAll(labelsElsewhere);
        return new EmptyGroup(level, name, centre, group.size(), drawn, List.copyOf(labelsHere));
    }
}
