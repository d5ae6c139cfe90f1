package org.accordia.shift;

import java.util.List;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/** A case that needs adjudication, with its reasons in words. */
@JsonPropertyOrder({"case", "reasons"})
public record CaseToAdjudicate(@JsonProperty("case") String caseId, @JsonProperty("reasons") List<String> reasons) {
    public CaseToAdjudicate {
        reasons = List.copyOf(reasons);
    }
}
