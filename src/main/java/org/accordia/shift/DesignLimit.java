package org.accordia.shift;

import java.util.List;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/**
 * One limitation of a study's design with the facts a sentence about it needs.
 *
 * @param kind       the limitation
 * @param centres    the centres concerned (sorted): the single centre, the two centres, the
 *                   one-reader centres; every centre for {@link DesignLimitation#CANNOT_REACH_ALPHA}
 * @param partitions distinct reader partitions of the permutation test (0 when no test is possible)
 * @param minP       the smallest reachable p-value, 1/partitions (NaN when no test is possible)
 */
@JsonPropertyOrder({"kind", "centres", "partitions", "min_p"})
public record DesignLimit(@JsonProperty("kind") DesignLimitation kind, @JsonProperty("centres") List<String> centres,
        @JsonProperty("partitions") long partitions, @JsonProperty("min_p") Double minP) {
    public DesignLimit {
        centres = List.copyOf(centres);
    }
}
