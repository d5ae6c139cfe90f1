package org.accordia.study;

import java.nio.file.Path;
import java.util.Comparator;
import java.util.Objects;

/**
 * Where one reader's mask of one case lives.
 *
 * @param caseId the case
 * @param reader the reader (with its centre)
 * @param path absolute, normalised path of the mask file
 */
public record MaskRef(String caseId, ReaderId reader, Path path) implements Comparable<MaskRef> {
    private static final Comparator<MaskRef> ORDER =
        Comparator.comparing(MaskRef::caseId).thenComparing(MaskRef::reader);

    public MaskRef {
        Objects.requireNonNull(caseId, "caseId");
        Objects.requireNonNull(reader, "reader");
        Objects.requireNonNull(path, "path");
    }

    @Override
    public int compareTo(MaskRef o) {
        return ORDER.compare(this, o);
    }
}
