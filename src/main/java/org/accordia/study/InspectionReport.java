package org.accordia.study;

import java.nio.file.Path;
import java.util.Collections;
import java.util.List;
import java.util.SortedMap;
import java.util.TreeMap;
import org.accordia.io.Geometry;

/**
 * What {@link Inspector} found in a study: the roster, each case's grid, the labels seen, the
 * missing masks and every problem. Built by the library, printed by the command line.
 *
 * @param root study root
 * @param manifest manifest file, or {@code null} for the folder layout
 * @param studyName display name from the protocol, or {@code null}
 * @param centres sorted centres
 * @param readers sorted readers
 * @param cases per-case summaries, sorted by case
 * @param labelVoxels voxel count per label value (background excluded) summed over every readable mask
 * @param structures the structures analysis would use (the protocol's, or one per label seen)
 * @param missing (case, reader) pairs without a mask: the first {@link #LIST_CAP} of them
 * @param problems every problem found, sorted by severity, file, message
 * @param missingCount how many (case, reader) pairs have no mask in all
 */
public record InspectionReport(Path root, Path manifest, String studyName, List<String> centres,
                               List<ReaderId> readers, List<CaseSummary> cases, SortedMap<Integer, Long> labelVoxels,
                               List<Structure> structures, List<CaseReader> missing, List<StudyProblem> problems,
                               long missingCount) {
    /** Entries of each list printed in full (cases, missing masks, problems); the rest are counted. */
    public static final int LIST_CAP = 50;

    /**
     * One case.
     *
     * @param caseId the case
     * @param readers readers with a mask for the case
     * @param geometry grid of the first readable mask, or {@code null} when none could be read
     * @param labelVoxels voxel count per label value (background excluded) over the case's readable masks
     * @param image the case's image file, or {@code null}
     */
    public record CaseSummary(String caseId, List<ReaderId> readers, Geometry geometry,
                              SortedMap<Integer, Long> labelVoxels, Path image) {
        public CaseSummary {
            readers = List.copyOf(readers);
            labelVoxels = Collections.unmodifiableSortedMap(new TreeMap<>(labelVoxels));
        }
    }

    public InspectionReport {
        centres = List.copyOf(centres);
        readers = List.copyOf(readers);
        cases = List.copyOf(cases);
        labelVoxels = Collections.unmodifiableSortedMap(new TreeMap<>(labelVoxels));
        structures = List.copyOf(structures);
        missing = List.copyOf(missing);
        problems = problems.stream().sorted().toList();
        missingCount = Math.max(missingCount, missing.size());
    }

    /** True when no problem is an {@link StudyProblem.Severity#ERROR}. */
    public boolean analysable() {
        return count(StudyProblem.Severity.ERROR) == 0;
    }

    public long count(StudyProblem.Severity severity) {
        return problems.stream().filter(p -> p.severity() == severity).count();
    }
}
