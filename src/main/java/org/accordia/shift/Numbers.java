package org.accordia.shift;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/** Deterministic, locale-free number formatting for the result tables; NaN becomes an empty cell. */
final class Numbers {
    private Numbers() {
    }

    /** Up to 6 significant digits, plain notation, trailing zeros removed; "" for NaN or infinity. */
    static String cell(double v) {
        if (!Double.isFinite(v)) {
            return "";
        }
        if (v == 0) {
            return "0";
        }
        BigDecimal d = new BigDecimal(v).round(new MathContext(6, RoundingMode.HALF_EVEN)).stripTrailingZeros();
        return d.toPlainString();
    }

    /** NaN and infinities as null (JSON null). */
    static Double orNull(double v) {
        return Double.isFinite(v) ? v : null;
    }
}
