package org.accordia.study;

import java.util.Comparator;
import java.util.Objects;

/**
 * One reader of a study. A reader belongs to exactly one centre; the pair is the reader's
 * identity everywhere. Ordered by centre, then reader name (the order of every table).
 *
 * @param reader the reader's name as given in the folder layout or manifest
 * @param centre the centre the reader belongs to
 */
public record ReaderId(String reader, String centre) implements Comparable<ReaderId> {
    private static final Comparator<ReaderId> ORDER =
        Comparator.comparing(ReaderId::centre).thenComparing(ReaderId::reader);

    public ReaderId {
        Objects.requireNonNull(reader, "reader");
        Objects.requireNonNull(centre, "centre");
        if (reader.isBlank() || centre.isBlank()) {
            throw new IllegalArgumentException("reader and centre must be non-blank");
        }
    }

    @Override
    public int compareTo(ReaderId o) {
        return ORDER.compare(this, o);
    }

    /** "centre/reader", the form used in messages and tables. */
    public String label() {
        return centre + "/" + reader;
    }

    @Override
    public String toString() {
        return label();
    }
}
