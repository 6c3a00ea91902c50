package org.risetrace.registration;

import com.fasterxml.jackson.annotation.JsonValue;

/** Outcome of mapping one frame onto the board. */
public enum RegistrationStatus {
    /** trusted mapping */
    OK("ok"),
    /** usable, but quality figures are marginal: downstream verdicts should say so */
    WEAK("weak"),
    /** no trustworthy mapping: the frame is left out of the analysis */
    FAILED("failed"),
    /** corners the user marked in the board file */
    MARKED("marked");

    private final String word;

    RegistrationStatus(String word) { this.word = word; }

    @JsonValue
    public String word() { return word; }

    public boolean usable() { return this != FAILED; }
}
