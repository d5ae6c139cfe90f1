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
        int from = firstMaskOf(caseId);
        int to = from;
        while (to < masks.size() && masks.get(to).caseId().equals(caseId)) {
            to++;
        }
        return masks.subList(from, to);
    }

    /** Index of the first mask whose case is not before {@code caseId} (masks are sorted by case first). */
    private int firstMaskOf(String caseId) {
        int lo = 0;
        int hi = masks.size();
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (masks.get(mid).caseId().compareTo(caseId) < 0) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
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
        return missing(Integer.MAX_VALUE);
    }

    /**
     * The first {@code limit} (case, reader) pairs without a mask, sorted by case then reader. Costs
     * time in proportion to the masks, the cases and {@code limit}, not to cases x readers.
     */
    public List<CaseReader> missing(int limit) {
        List<CaseReader> out = new ArrayList<>();
        int i = 0;
        for (String c : cases) {
            if (out.size() >= limit) {
                break;
            }
            while (i < masks.size() && masks.get(i).caseId().compareTo(c) < 0) {
                i++;
            }
            int from = i;
            while (i < masks.size() && masks.get(i).caseId().equals(c)) {
                i++;
            }
            if (distinctReaders(from, i) == readers.size()) {
                continue; // every reader read this case
            }
            int k = from;
            for (ReaderId r : readers) {
                while (k < i && masks.get(k).reader().compareTo(r) < 0) {
                    k++;
                }
                if (k < i && masks.get(k).reader().equals(r)) {
                    continue;
                }
                out.add(new CaseReader(c, r));
                if (out.size() >= limit) {
                    break;
                }
            }
        }
        return out;
    }

    /** How many (case, reader) pairs have no mask. */
    public long missingCount() {
        return (long) cases.size() * readers.size() - distinctReaders(0, masks.size());
    }

    /** Distinct (case, reader) pairs among masks[from, to) (sorted, so equal pairs are adjacent). */
    private long distinctReaders(int from, int to) {
        long n = 0;
        for (int j = from; j < to; j++) {
            MaskRef m = masks.get(j);
            if (j == from || !m.caseId().equals(masks.get(j - 1).caseId()) || !m.reader().equals(masks.get(j - 1).reader())) {
                n++;
            }
        }
        return n;
    }

    /** A copy with more problems. */
    public Study withProblems(List<StudyProblem> more) {
        List<StudyProblem> all = new ArrayList<>(problems);
        all.addAll(more);
        return new Study(root, manifest, centres, readers, cases, masks, images, all);
    }
}
