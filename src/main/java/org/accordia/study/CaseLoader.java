package org.accordia.study;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.accordia.io.Geometry;
import org.accordia.io.ImageVolume;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;

/**
 * Reads the masks of one case and checks that they share one grid: identical dimensions, and
 * spacing and affine entries within the protocol's {@code geometry_tolerance_mm}.
 */
public final class CaseLoader {
    private CaseLoader() {
    }

    /**
     * The largest label value a study may use. Label values index per-label tables in the
     * agreement and consensus steps and the consensus masks are written as uint16 NIfTI, so a
     * larger value is refused when the mask is read, by {@code inspect} and {@code analyze} alike
     * (docs/limits.md).
     */
    public static final int MAX_LABEL = 65_535;

    /** Reads one mask as labels and refuses a label above {@link #MAX_LABEL}. */
    public static LabelVolume readMask(Path file, ReadLimits limits) throws InputException {
        LabelVolume v = Volumes.readLabels(file, limits);
        if (v.maxLabel() > MAX_LABEL) {
            throw new InputException(file, "label value " + v.maxLabel() + " is above " + MAX_LABEL
                + ", the largest label value supported (renumber the labels to 1.." + MAX_LABEL + ")");
        }
        return v;
    }

    /** Reads every mask of a case with the protocol's limits. */
    public static LoadedCase load(Study study, String caseId, Protocol protocol, boolean allowPathEscape)
        throws InputException {
        return load(study, caseId, protocol.readLimits(allowPathEscape), protocol.geometryToleranceMm());
    }

    /**
     * Reads every mask of a case (readers sorted by centre then name).
     *
     * @throws InputException when a mask cannot be read, when the case is unknown or has no mask,
     *     or when two masks' grids differ (the message names both files and the difference)
     */
    public static LoadedCase load(Study study, String caseId, ReadLimits limits, double geometryToleranceMm)
        throws InputException {
        List<MaskRef> refs = study.masksOf(caseId);
        if (refs.isEmpty()) {
            throw new InputException(study.manifest() != null ? study.manifest() : study.root(),
                "case '" + caseId + "' has no mask in this study");
        }
        List<ReaderId> readers = new ArrayList<>();
        List<LabelVolume> masks = new ArrayList<>();
        Path firstPath = null;
        Geometry first = null;
        for (MaskRef ref : refs) {
            LabelVolume v = readMask(ref.path(), limits);
            if (first == null) {
                first = v.geometry();
                firstPath = ref.path();
            } else {
                InputException mismatch = mismatch(firstPath, first, ref.path(), v.geometry(), geometryToleranceMm);
                if (mismatch != null) {
                    throw mismatch;
                }
            }
            readers.add(ref.reader());
            masks.add(v);
        }
        return new LoadedCase(caseId, first, readers, masks);
    }

    /**
     * Reads the case's image, if it has one, and checks it against the masks' grid; {@code null}
     * when the case has no image.
     */
    public static ImageVolume loadImage(Study study, String caseId, Geometry maskGeometry, ReadLimits limits,
                                        double geometryToleranceMm) throws InputException {
        Path image = study.imageOf(caseId);
        if (image == null) {
            return null;
        }
        ImageVolume v = Volumes.readImage(image, limits);
        if (maskGeometry != null) {
            String diff = maskGeometry.differenceFrom(v.geometry(), geometryToleranceMm);
            if (diff != null) {
                throw new InputException(image, "image grid differs from the masks of case '" + caseId + "': " + diff);
            }
        }
        return v;
    }

    /**
     * The error for two grids of one case that disagree beyond the tolerance, naming both files
     * and the difference, or {@code null} when they agree.
     */
    public static InputException mismatch(Path firstFile, Geometry first, Path otherFile, Geometry other,
                                          double toleranceMm) {
        String diff = first.differenceFrom(other, toleranceMm);
        if (diff == null) {
            return null;
        }
        return new InputException(otherFile, "grid differs from " + firstFile + ": " + diff
            + " (tolerance " + toleranceMm + " mm)");
    }
}
