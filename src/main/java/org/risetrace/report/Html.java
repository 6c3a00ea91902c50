package org.risetrace.report;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/** Text helpers for the HTML outputs (report, batch index, customer report): output encoding and number formatting. */
public final class Html {
    private Html() { }

    /**
     * HTML-encodes text for element content and quoted attribute values: &amp; &lt; &gt; &quot; and &#39; (OWASP
     * Cross Site Scripting Prevention Cheat Sheet, output encoding rule for HTML contexts). Null becomes "".
     */
    public static String esc(String s) {
        if (s == null) return "";
        StringBuilder sb = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> sb.append("&amp;");
                case '<' -> sb.append("&lt;");
                case '>' -> sb.append("&gt;");
                case '"' -> sb.append("&quot;");
                case '\'' -> sb.append("&#39;");
                default -> {
                    // control characters other than tab and line breaks carry no text: drop them
                    if (c < 0x20 && c != '\t' && c != '\n' && c != '\r') continue;
                    sb.append(c);
                }
            }
        }
        return sb.toString();
    }

    /** A value with {@code sig} significant figures, plain notation; a dash when absent or not finite. */
    static String sig(Double v, int sig) {
        if (v == null || !Double.isFinite(v)) return "\u2013";
        if (v == 0) return "0";
        BigDecimal d = new BigDecimal(v).round(new MathContext(sig, RoundingMode.HALF_EVEN));
        String s = d.toPlainString();
        return s.startsWith("-") ? "\u2212" + s.substring(1) : s;
    }

    /** A value a user typed (a supply's volts), as short as it was: 0.4 stays 0.4; a dash when absent. */
    static String asGiven(Double v) {
        if (v == null || !Double.isFinite(v)) return "\u2013";
        String s = BigDecimal.valueOf(v).stripTrailingZeros().toPlainString();
        return s.startsWith("-") ? "\u2212" + s.substring(1) : s;
    }

    /** A value with a fixed number of decimals; a dash when absent or not finite. */
    static String fixed(Double v, int decimals) {
        if (v == null || !Double.isFinite(v)) return "\u2013";
        String s = new BigDecimal(v).setScale(decimals, RoundingMode.HALF_EVEN).toPlainString();
        if (s.matches("-0(\\.0*)?")) s = s.substring(1);
        return s.startsWith("-") ? "\u2212" + s.substring(1) : s;
    }

    /** "value ± se" with the same decimals for both, chosen from the standard error's size. */
    static String withError(Double v, Double se) {
        if (v == null || !Double.isFinite(v)) return "\u2013";
        if (se == null || !Double.isFinite(se) || se <= 0) return sig(v, 3);
        int decimals = Math.max(0, 1 - (int) Math.floor(Math.log10(se)));
        decimals = Math.min(decimals, 8);
        return fixed(v, decimals) + " \u00b1 " + fixed(se, decimals);
    }
}
