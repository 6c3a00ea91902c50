package org.risetrace.planning;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/** Number formatting for the planner's sentences. */
final class Numbers {
    private Numbers() {
    }

    /** Three significant digits, plain notation, trailing zeros dropped ("0.138", "45", "0.0005"). */
    static String sig(double v) {
        return sig(v, 3);
    }

    static String sig(double v, int digits) {
        if (!Double.isFinite(v)) return "-";
        if (v == 0) return "0";
        BigDecimal b = new BigDecimal(v).round(new MathContext(digits, RoundingMode.HALF_EVEN)).stripTrailingZeros();
        return b.scale() < 0 ? b.setScale(0, RoundingMode.UNNECESSARY).toPlainString() : b.toPlainString();
    }
}
