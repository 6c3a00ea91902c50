package org.risetrace.planning;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;

import java.util.Locale;

/** Where the supply's two leads go. */
public enum Topology {
    /** Positive on the shorted rail, negative on ground. */
    RAIL_TO_GROUND("rail-to-ground"),
    /**
     * Positive on a higher rail (a converter's input), negative on the converter's output rail: the current runs
     * through the shorted high-side switch (and the phase inductor) and not through the output rail's loads.
     */
    ACROSS_SWITCH("across-switch");

    private final String word;

    Topology(String word) {
        this.word = word;
    }

    @JsonValue
    public String word() {
        return word;
    }

    /** The topology for its word; IllegalArgumentException naming the accepted words otherwise. */
    @JsonCreator
    public static Topology of(String word) {
        String w = word == null ? "" : word.strip().toLowerCase(Locale.ROOT);
        for (Topology t : values()) if (t.word.equals(w)) return t;
        throw new IllegalArgumentException("topology must be rail-to-ground or across-switch, got '" + word + "'");
    }
}
