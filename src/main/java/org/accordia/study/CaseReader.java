package org.accordia.study;

import java.util.Comparator;

/** A (case, reader) pair, e.g. one that has no mask in an unbalanced design. */
public record CaseReader(String caseId, ReaderId reader) implements Comparable<CaseReader> {
    private static final Comparator<CaseReader> ORDER =
        Comparator.comparing(CaseReader::caseId).thenComparing(CaseReader::reader);

    @Override
    public int compareTo(CaseReader o) {
        return ORDER.compare(this, o);
    }
}
