package org.accordia.shift;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import com.fasterxml.jackson.annotation.JsonValue;

/**
 * A mask one reader should correct, kept apart from cases the readers genuinely disagree on: the
 * reader leaves out a whole part of the structure that most readers mark (e.g. a small second
 * lesion), or leaves the mask empty while every other reader draws the structure.
 *
 * @param caseId  case id
 * @param reader  reader key
 * @param centre  the reader's centre
 * @param kind    what is wrong
 * @param parts   parts left out (0 for an empty mask)
 * @param partsMl their volume in ml (0 for an empty mask)
 */
@JsonPropertyOrder({"case", "reader", "centre", "kind", "parts", "parts_ml"})
public record MaskToCorrect(@JsonProperty("case") String caseId, @JsonProperty("reader") String reader,
        @JsonProperty("centre") String centre, @JsonProperty("kind") Kind kind, @JsonProperty("parts") int parts,
        @JsonProperty("parts_ml") double partsMl) {

    /** What the reader should correct. */
    public enum Kind {
        /** A whole part that most readers mark is not touched. */
        LEAVES_OUT_PART("leaves-out-part"),
        /** The mask is empty while every other reader draws the structure. */
        EMPTY_WHILE_OTHERS_DRAW("empty-while-others-draw");

        private final String key;

        Kind(String key) {
            this.key = key;
        }

        @JsonValue
        public String key() {
            return key;
        }
    }
}
