package org.accordia.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.accordia.io.Geometry;
import org.accordia.io.ImageVolume;
import org.accordia.io.InputException;
import org.accordia.study.Analysability;
import org.accordia.study.MaskRef;
import org.accordia.study.CaseLoader;
import org.accordia.study.CaseReader;
import org.accordia.study.LoadedCase;
import org.accordia.study.Protocol;
import org.accordia.study.Study;

/**
 * Where the cases of an analysis come from: a list of case identifiers and a way to load one
 * case's masks (and, optionally, its image). {@link #ofStudy} reads a study folder or manifest;
 * {@link #of} wraps any loader, e.g. cases generated in memory
 * ({@code org.accordia.demo.DemoGenerator.inMemory(spec)}), so the same pipeline runs on both.
 *
 * <p>Implementations must be safe to call from several threads at once ({@link #load} is called
 * concurrently for different cases).
 */
public interface CaseSource {

    /** Loads one case. */
    @FunctionalInterface
    interface Loader {
        LoadedCase load(String caseId) throws InputException;
    }

    /** Loads one case's image (null when it has none). */
    @FunctionalInterface
    interface ImageLoader {
        ImageVolume image(String caseId, Geometry maskGeometry) throws InputException;
    }

    /** Case identifiers, sorted; the order of every result. */
    List<String> caseIds();

    /** Every reader's mask of one case on one grid (readers sorted by centre then name). */
    LoadedCase load(String caseId) throws InputException;

    /** The case's image checked against the masks' grid, or {@code null} when it has none. */
    default ImageVolume image(String caseId, Geometry maskGeometry) throws InputException {
        return null;
    }

    /** (case, reader) pairs without a mask (flagged events in the report); empty by default. */
    default List<CaseReader> missing() {
        return List.of();
    }

    /** Every input file (for checksums), sorted; empty for generated cases. */
    default List<Path> inputFiles() {
        return List.of();
    }

    /** The file named by a study-level error (the manifest or the study folder); by default the first input. */
    default Path where() {
        return inputFiles().isEmpty() ? null : inputFiles().get(0);
    }

    /** A source over any loader; {@code images} may be null. */
    static CaseSource of(List<String> caseIds, Loader loader, ImageLoader images) {
        List<String> ids = List.copyOf(new java.util.TreeSet<>(caseIds));
        Objects.requireNonNull(loader, "loader");
        return new CaseSource() {
            @Override
            public List<String> caseIds() {
                return ids;
            }

            @Override
            public LoadedCase load(String caseId) throws InputException {
                return loader.load(caseId);
            }

            @Override
            public ImageVolume image(String caseId, Geometry g) throws InputException {
                return images == null ? null : images.image(caseId, g);
            }
        };
    }

    /**
     * A study on disk: masks read with the protocol's limits and grid tolerance.
     *
     * @param allowOutsideRoot accept mask or image paths that lead outside the study root
     */
    static CaseSource ofStudy(Study study, Protocol protocol, boolean allowOutsideRoot) {
        var limits = protocol.readLimits(allowOutsideRoot);
        double tol = protocol.geometryToleranceMm();
        List<Path> files = new ArrayList<>();
        if (study.manifest() != null) {
            files.add(study.manifest());
        }
        for (MaskRef m : study.masks()) {
            files.add(m.path());
        }
        files.addAll(study.images().values());
        List<Path> sorted = files.stream().distinct().sorted().toList();
        return new CaseSource() {
            @Override
            public List<String> caseIds() {
                return study.cases();
            }

            @Override
            public LoadedCase load(String caseId) throws InputException {
                return CaseLoader.load(study, caseId, limits, tol);
            }

            @Override
            public ImageVolume image(String caseId, Geometry g) throws InputException {
                return CaseLoader.loadImage(study, caseId, g, limits, tol);
            }

            @Override
            public List<CaseReader> missing() {
                return study.missing();
            }

            @Override
            public List<Path> inputFiles() {
                return sorted;
            }

            @Override
            public Path where() {
                return Analysability.where(study);
            }
        };
    }
}
