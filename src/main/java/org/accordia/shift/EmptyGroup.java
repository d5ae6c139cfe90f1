package org.accordia.shift;

import java.util.List;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import com.fasterxml.jackson.annotation.JsonValue;

/**
 * A centre (or a reader) whose every mask is empty for a structure that the others draw: the
 * headline finding of a study, usually a label convention or an export that went wrong, never a
 * drawing style. See {@link EmptyGroups}.
 *
 * @param level          centre or reader
 * @param group          the centre name or the reader key
 * @param centre         the centre (equal to {@code group} for a centre)
 * @param masks          masks of the group (all empty for the structure)
 * @param othersDraw     of the group's cases, those where most other readers draw the structure
 * @param labelsOnlyHere label values (≥ 1) that occur in this group's masks and in no other mask
 */
@JsonPropertyOrder({"level", "group", "centre", "masks", "others_draw", "labels_only_here"})
public record EmptyGroup(@JsonProperty("level") Level level, @JsonProperty("group") String group,
        @JsonProperty("centre") String centre, @JsonProperty("masks") int masks,
        @JsonProperty("others_draw") int othersDraw, @JsonProperty("labels_only_here") List<Integer> labelsOnlyHere) {
    public EmptyGroup {
        labelsOnlyHere = List.copyOf(labelsOnlyHere);
    }

    /** Centre or reader. */
    public enum Level {
        CENTRE("centre"), READER("reader");

        private final String key;

        Level(String key) {
            this.key = key;
        }

        @JsonValue
        public String key() {
            return key;
        }
    }
}
