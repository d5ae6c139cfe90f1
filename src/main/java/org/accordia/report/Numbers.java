package org.accordia.report;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * The one number format of every output (CSV cells, JSON numbers, table cells in the HTML report).
 *
 * <p>Scheme: the exact binary value of the double is rounded to {@value #SIGNIFICANT_DIGITS}
 * significant digits (round half to even), trailing zeros are stripped, and the result is written
 * in plain decimal notation ({@code 0.987654}, {@code -1.5}, {@code 1234.57}, {@code 0.0001}) when its
 * decimal exponent lies in [{@value #MIN_PLAIN_EXPONENT}, {@value #MAX_PLAIN_EXPONENT}], otherwise in
 * scientific notation with an upper-case {@code E} ({@code 1.23457E-7}, {@code 6.02214E+23}). Negative
 * zero is written {@code 0}. NaN and the infinities are "undefined": {@link #format(double)} returns
 * the empty string (an empty CSV cell), JSON writes {@code null}.
 *
 * <p>The output never depends on the default locale or on the JDK's shortest-representation
 * algorithm for {@code Double.toString} (which changed in JDK 19): it depends only on the binary
 * value. Every output is also a valid JSON number.
 *
 * <p>Counts (voxels, cases) are integers and should be written as {@code long}, never through this
 * class: six significant digits would round a count of 12 345 678 voxels to 12 345 700.
 */
public final class Numbers {
    /** Significant digits kept by {@link #format(double)} and {@link #round(double)}. */
    public static final int SIGNIFICANT_DIGITS = 6;
    /** Smallest decimal exponent written in plain notation (1e-6 is written 0.000001). */
    public static final int MIN_PLAIN_EXPONENT = -6;
    /** Largest decimal exponent written in plain notation (999999000000000 is still plain). */
    public static final int MAX_PLAIN_EXPONENT = 14;

    private static final MathContext CONTEXT = new MathContext(SIGNIFICANT_DIGITS, RoundingMode.HALF_EVEN);

    private Numbers() {
    }

    /** True when {@code x} is a finite number (neither NaN nor infinite). */
    public static boolean isDefined(double x) {
        return !Double.isNaN(x) && !Double.isInfinite(x);
    }

    /**
     * Formats {@code x} by the scheme above; the empty string for NaN and the infinities.
     */
    public static String format(double x) {
        BigDecimal r = rounded(x);
        if (r == null) {
            return "";
        }
        if (r.signum() == 0) {
            return "0";
        }
        int exponent = r.precision() - r.scale() - 1;
        if (exponent >= MIN_PLAIN_EXPONENT && exponent <= MAX_PLAIN_EXPONENT) {
            return r.toPlainString();
        }
        // Outside the plain range a stripped value of at most six digits has a negative scale or an
        // adjusted exponent below -6, so BigDecimal.toString writes it as d.dddddE±n.
        return r.toString();
    }

    /**
     * The double nearest to what {@link #format(double)} writes (NaN for NaN and the infinities):
     * use it where a rounded value must be kept as a number.
     */
    public static double round(double x) {
        BigDecimal r = rounded(x);
        return r == null ? Double.NaN : r.doubleValue();
    }

    private static BigDecimal rounded(double x) {
        if (!isDefined(x)) {
            return null;
        }
        if (x == 0.0) {
            return BigDecimal.ZERO;
        }
        return new BigDecimal(x).round(CONTEXT).stripTrailingZeros();
    }
}
