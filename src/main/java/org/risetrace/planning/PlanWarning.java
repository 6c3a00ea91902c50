package org.risetrace.planning;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import com.fasterxml.jackson.annotation.JsonValue;

import java.util.Locale;

/**
 * One warning of a plan: a code word for machines, a severity and a sentence for people.
 *
 * @param code     what it is about
 * @param severity {@code stop} (do not inject as things are), {@code changed} (the plan differs from what was
 *                 asked) or {@code check} / {@code note} (read before injecting)
 * @param message  the sentence
 */
@JsonPropertyOrder({"code", "severity", "message"})
public record PlanWarning(@JsonProperty("code") Code code, @JsonProperty("severity") String severity,
                          @JsonProperty("message") String message) {

    public PlanWarning {
        if (code == null || message == null) throw new IllegalArgumentException("a warning needs a code and a message");
        if (severity == null) severity = code.severity;
    }

    static PlanWarning of(Code code, String message) {
        return new PlanWarning(code, code.severity, message);
    }

    /** The warnings a plan can carry, each with its code word. */
    public enum Code {
        /** A voltage above the nominal voltage against ground was asked for: the plan sets the nominal instead. */
        ABOVE_NOMINAL("above-nominal", "changed"),
        /** A lithium cell or other battery is still connected. */
        CELL_CONNECTED("cell-connected", "stop"),
        /** The mains input is still connected. */
        MAINS_CONNECTED("mains-connected", "stop"),
        /** The short's power will not heat anything measurably within a minute for the camera's NETD. */
        TOO_LITTLE_HEAT("too-little-heat", "check"),
        /** The supply's own current limit, not the plan, sets the current. */
        SUPPLY_CAPS_CURRENT("supply-caps-current", "check"),
        /** Across-switch injection: the output rail's voltage to ground stays where it was. */
        OUTPUT_RAIL_STAYS("output-rail-stays", "note");

        private final String word;
        private final String severity;

        Code(String word, String severity) {
            this.word = word;
            this.severity = severity;
        }

        @JsonValue
        public String word() {
            return word;
        }

        public String severity() {
            return severity;
        }

        @JsonCreator
        public static Code of(String word) {
            String w = word == null ? "" : word.strip().toLowerCase(Locale.ROOT);
            for (Code c : values()) if (c.word.equals(w)) return c;
            throw new IllegalArgumentException("unknown warning code '" + word + "'");
        }
    }
}
