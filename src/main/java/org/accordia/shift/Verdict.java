package org.accordia.shift;

import com.fasterxml.jackson.annotation.JsonValue;

/** The decision for one label. */
public enum Verdict {
    /** No evidence of a practically relevant shift: the masks can be pooled. */
    POOL("pool"),
    /** Something needs a human look before pooling (see the reasons). */
    REVIEW("review"),
    /** A centre draws systematically and relevantly differently: re-annotate or harmonise. */
    RE_ANNOTATE("re-annotate");

    private final String word;

    Verdict(String word) {
        this.word = word;
    }

    @JsonValue
    public String word() {
        return word;
    }

    @Override
    public String toString() {
        return word;
    }
}
