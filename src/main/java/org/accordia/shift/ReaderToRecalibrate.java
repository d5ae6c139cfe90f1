package org.accordia.shift;

import java.util.List;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/** A reader whose systematic deviation calls for recalibration, with reasons in words. */
@JsonPropertyOrder({"reader", "centre", "reasons"})
public record ReaderToRecalibrate(@JsonProperty("reader") String reader, @JsonProperty("centre") String centre,
        @JsonProperty("reasons") List<String> reasons) {
    public ReaderToRecalibrate {
        reasons = List.copyOf(reasons);
    }
}
