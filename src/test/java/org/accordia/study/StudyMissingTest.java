package org.accordia.study;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link Study#masksOf}, {@link Study#missing(int)} and {@link Study#missingCount()} (which avoid
 * walking cases x readers) against the obvious brute force, on random unbalanced designs.
 */
class StudyMissingTest {
    @Test
    void fastListsAgreeWithBruteForce() {
        Random rnd = new Random(20261202);
        for (int trial = 0; trial < 200; trial++) {
            int nCases = 1 + rnd.nextInt(6);
            int nReaders = 1 + rnd.nextInt(5);
            List<String> cases = new ArrayList<>();
            List<ReaderId> readers = new ArrayList<>();
            for (int c = 0; c < nCases; c++) {
                cases.add("case" + c);
            }
            for (int r = 0; r < nReaders; r++) {
                readers.add(new ReaderId("r" + r, "centre" + (r % 2)));
            }
            List<MaskRef> masks = new ArrayList<>();
            for (String c : cases) {
                for (ReaderId r : readers) {
                    if (rnd.nextDouble() < 0.6) {
                        masks.add(new MaskRef(c, r, Path.of("/s", c + r.reader() + ".nii")));
                    }
                }
            }
            Study s = new Study(Path.of("/s"), null, List.of("centre0", "centre1"), readers, cases, masks, Map.of(), List.of());
            List<CaseReader> brute = new ArrayList<>();
            for (String c : s.cases()) {
                List<MaskRef> mine = new ArrayList<>();
                for (MaskRef m : s.masks()) {
                    if (m.caseId().equals(c)) {
                        mine.add(m);
                    }
                }
                assertEquals(mine, s.masksOf(c));
                for (ReaderId r : s.readers()) {
                    if (mine.stream().noneMatch(m -> m.reader().equals(r))) {
                        brute.add(new CaseReader(c, r));
                    }
                }
            }
            assertEquals(brute, s.missing());
            assertEquals(brute.size(), s.missingCount());
            int limit = rnd.nextInt(4);
            assertEquals(brute.subList(0, Math.min(limit, brute.size())), s.missing(limit));
            assertEquals(List.of(), s.masksOf("no such case"));
        }
    }
}
