package org.accordia.study;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.function.Predicate;
import java.util.stream.Collectors;

/**
 * The one rule that says whether a study can be analysed, shared by {@code inspect} (which lists
 * every problem) and {@code analyze} (which stops at the first). A study can be analysed when
 * <ol>
 *   <li>its protocol (the file given, else the study's {@code protocol.yaml}, else the defaults)
 *       is valid;</li>
 *   <li>discovery found no error (a folder link leaving the study root, two masks of one case for
 *       one reader, an unlistable folder, ...);</li>
 *   <li>it has at least one case and at least two readers;</li>
 *   <li>every mask is readable and the masks (and image) of each case share one grid;</li>
 *   <li>at least one mask holds a voxel of a structure analysed.</li>
 * </ol>
 * Items 1–3 are decided before any mask is read ({@link #beforeReading}); 4 while the masks are
 * read; 5 from the label values seen ({@link #noStructureVoxels}).
 */
public final class Analysability {
    private Analysability() {
    }

    /** Where study-level problems are reported: the manifest, else the study root. */
    public static Path where(Study study) {
        return study.manifest() != null ? study.manifest() : study.root();
    }

    /**
     * The errors decidable before any mask is read, in the order {@code analyze} reports them:
     * no case, then discovery errors (sorted), then fewer than two readers. Empty when none.
     */
    public static List<StudyProblem> beforeReading(Study study) {
        List<StudyProblem> out = new ArrayList<>();
        if (study.cases().isEmpty()) {
            out.add(noCase(study));
        }
        study.problems().stream().filter(p -> p.severity() == StudyProblem.Severity.ERROR).sorted().forEach(out::add);
        StudyProblem readers = tooFewReaders(study);
        if (readers != null) {
            out.add(readers);
        }
        return out;
    }

    /** The error of a study without a case. */
    public static StudyProblem noCase(Study study) {
        return StudyProblem.error(where(study),
            "the study has no case (expected <centre>/<reader>/<case>.<ext> or a manifest)");
    }

    /** The error of a study with fewer than two readers, or null. */
    public static StudyProblem tooFewReaders(Study study) {
        if (study.readers().size() >= 2) {
            return null;
        }
        return StudyProblem.error(where(study), "the study has " + study.readers().size()
            + " reader(s); agreement needs at least 2");
    }

    /**
     * The error when no mask holds a voxel of any structure analysed, or null.
     *
     * @param structures the structures analysed (the protocol's, or one per label value seen)
     * @param labelVoxels voxels per label value (≥ 1) summed over every readable mask
     * @param where the file named in the error
     */
    public static StudyProblem noStructureVoxels(List<Structure> structures, Map<Integer, Long> labelVoxels, Path where) {
        return noStructureVoxels(structures,
            s -> s.labels().stream().anyMatch(v -> labelVoxels.getOrDefault(v, 0L) > 0), where);
    }

    /**
     * As {@link #noStructureVoxels(List, Map, Path)} with a test of whether a structure has a
     * voxel in any mask.
     */
    public static StudyProblem noStructureVoxels(List<Structure> structures, Predicate<Structure> hasVoxels,
            Path where) {
        if (structures.isEmpty()) {
            return StudyProblem.error(where, "no mask holds any foreground label, so there is no structure to analyse");
        }
        if (structures.stream().anyMatch(hasVoxels)) {
            return null;
        }
        return StudyProblem.error(where, "no mask holds a voxel of any structure of the protocol ("
            + structures.stream().map(Structure::name).collect(Collectors.joining(", ")) + ")");
    }
}
