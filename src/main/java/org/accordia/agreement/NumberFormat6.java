package org.accordia.agreement;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * The one number format of the agreement tables: at most 6 significant digits, rounded half-even
 * from the exact binary value, trailing zeros removed, plain decimal notation (never an exponent),
 * {@code '.'} as decimal separator whatever the locale; NaN is the empty string, infinities are
 * {@code inf} / {@code -inf}, negative zero is {@code 0}. Examples: 0.8 → {@code 0.8},
 * 2/3 → {@code 0.666667}, 1234567 → {@code 1234570}, 1e-7 → {@code 0.0000001}.
 */
public final class NumberFormat6 {
    private static final MathContext SIX = new MathContext(6, RoundingMode.HALF_EVEN);

    private NumberFormat6() {
    }

    public static String format(double v) {
        if (Double.isNaN(v)) {
            return "";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "inf" : "-inf";
        }
        if (v == 0) {
            return "0";
        }
        BigDecimal d = new BigDecimal(v).round(SIX).stripTrailingZeros();
        return d.toPlainString();
    }
}
