package org.accordia.agreement;

/**
 * Who drew a mask: the reader's identifier and the centre the reader belongs to.
 *
 * @param reader reader identifier, non-blank
 * @param centre centre identifier, non-blank
 */
public record ReaderId(String reader, String centre) {
    public ReaderId {
        if (reader == null || reader.isBlank() || centre == null || centre.isBlank()) {
            throw new IllegalArgumentException("reader and centre must be non-blank");
        }
    }
}
