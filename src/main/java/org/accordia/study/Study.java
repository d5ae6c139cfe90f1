package org.accordia.study;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * What a study holds: centres, readers (each in exactly one centre), cases, the mask of each
 * (case, reader) pair that exists, and each case's optional image. Pure description: no volume
 * is opened. Everything is sorted (centres, readers by centre then name, cases, masks by case then
 * reader), so two loads of the same study compare equal.
 *
 * <p>Unbalanced designs are normal: a reader need not have read every case; {@link #missing()}
 * lists the holes.
 *
 * @param root the study root (absolute, normalised): the layout folder, or the manifest's folder
 * @param manifest the manifest file, or {@code null} for the folder layout
 * @param centres sorted centre names
 * @param readers sorted readers
 * @param cases sorted case identifiers
 * @param masks sorted masks
 * @param images case identifier to image path, for the cases that have one
 * @param problems what discovery found (ignored files, symlink loops, ...), sorted
 */
public record Study(Path root, Path manifest, List<String> centres, List<ReaderId> readers, List<String> cases,
                   List<MaskRef> masks, Map<String, Path> images, List<StudyProblem> problems) {

    public Study {
        centres = List.copyOf(new TreeSet<>(centres));
        readers = List.copyOf(new TreeSet<>(readers));
        cases = List.copyOf(new TreeSet<>(cases));
        List<MaskRef> m = new ArrayList<>(masks);
        Collections.sort(m);
        masks = List.copyOf(m);
        images = Collections.unmodifiableMap(new TreeMap<>(images));
        List<StudyProblem> p = new ArrayList<>(problems);
        Collections.sort(p);
        problems = List.copyOf(p);
    }

    /** The masks of one case, sorted by centre then reader; empty for an unknown case. */
    public List<MaskRef> masksOf(String caseId) {
        List<MaskRef> out = new ArrayList<>();
        for (MaskRef m : masks) {
            if (m.caseId().equals(caseId)) {
                out.add(m);
            }
        }
        return out;
    }

    /** The image of a case, or {@code null} when it has none. */
    public Path imageOf(String caseId) {
        return images.get(caseId);
    }

    /** The readers of one centre, sorted. */
    public List<ReaderId> readersOf(String centre) {
        return readers.stream().filter(r -> r.centre().equals(centre)).toList();
    }

    /** Every (case, reader) pair without a mask, sorted by case then reader. */
    public List<CaseReader> missing() {
        Set<CaseReader> present = new TreeSet<>();
        for (MaskRef m : masks) {
            present.add(new CaseReader(m.caseId(), m.reader()));
        }
        List<CaseReader> out = new ArrayList<>();
        for (String c : cases) {
            for (ReaderId r : readers) {
                CaseReader cr = new CaseReader(c, r);
                if (!present.contains(cr)) {
                    out.add(cr);
                }
            }
        }
        return out;
    }

    /** A copy with more problems. */
    public Study withProblems(List<StudyProblem> more) {
        List<StudyProblem> all = new ArrayList<>(problems);
        all.addAll(more);
        return new Study(root, manifest, centres, readers, cases, masks, images, all);
    }
}
