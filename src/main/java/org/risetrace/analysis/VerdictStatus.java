package org.risetrace.analysis;

import com.fasterxml.jackson.annotation.JsonValue;

/** What the analysis can say about the source of heat. */
public enum VerdictStatus {
    IDENTIFIED("identified"), INCONCLUSIVE("inconclusive"), NO_HEATING("no-heating");

    private final String word;

    VerdictStatus(String word) { this.word = word; }

    @JsonValue
    public String word() { return word; }
}
