package org.risetrace.planning;

import java.util.Map;

/**
 * Meter units with an SI prefix: "mohm", "m\u03a9", "kohm", "uH", "\u00b5H", "mV", "A". Readings are compared in
 * the base unit; a unit not listed here is compared only with the same unit as written.
 */
final class Units {
    private static final Map<String, String> BASES = Map.ofEntries(
            Map.entry("ohm", "ohm"), Map.entry("ohms", "ohm"), Map.entry("\u03a9", "ohm"), Map.entry("\u2126", "ohm"),
            Map.entry("v", "V"), Map.entry("a", "A"), Map.entry("h", "H"), Map.entry("f", "F"), Map.entry("w", "W"),
            Map.entry("hz", "Hz"));
    private static final Map<Character, Double> PREFIXES = Map.of('p', 1e-12, 'n', 1e-9, 'u', 1e-6, '\u00b5', 1e-6,
            '\u03bc', 1e-6, 'm', 1e-3, 'k', 1e3, 'M', 1e6);

    private Units() {
    }

    /** A unit as base name and factor to it. */
    record Unit(String base, double factor) {
    }

    /** The unit, or the written text with factor 1 when it is not a prefixed base unit we know. */
    static Unit of(String written) {
        String u = written.strip();
        Unit bare = base(u);
        if (bare != null) return bare;
        if (u.length() > 1 && PREFIXES.containsKey(u.charAt(0))) {
            Unit rest = base(u.substring(1));
            if (rest != null) return new Unit(rest.base(), PREFIXES.get(u.charAt(0)));
        }
        return new Unit(u, 1.0);
    }

    private static Unit base(String s) {
        String b = BASES.containsKey(s) ? BASES.get(s) : BASES.get(s.toLowerCase(java.util.Locale.ROOT));
        // bases are matched as written, then without case ("Ohm", "v"; the capital omega is looked up as written,
        // its lower case is another letter); prefixes always with case ("m" milli, "M" mega)
        return b == null ? null : new Unit(b, 1.0);
    }
}
