package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class NumbersTest {

    // Expected strings worked out by hand from the documented scheme (6 significant digits, round
    // half to even on the exact binary value, trailing zeros stripped, plain for exponents -6..14).
    @ParameterizedTest
    @CsvSource(delimiter = '|', quoteCharacter = '"', value = {
        "0.0                | 0",
        "-0.0               | 0",
        "1.0                | 1",
        "-1.5               | -1.5",
        "0.987654321        | 0.987654",
        "0.1                | 0.1",
        "2.5                | 2.5",
        "1234567.0          | 1234570",
        // exact binary values printed with python3 -c "from decimal import Decimal; print(Decimal(x))":
        "123.4565           | 123.457",     // 123.456500000000005456... is above the tie
        "0.1234565          | 0.123456",    // 0.123456499999999996797... is below the tie
        "0.000123456789     | 0.000123457",
        "0.000001           | 0.000001",
        "1.234567E-7        | 1.23457E-7",
        "1.0E-7             | 1E-7",
        "999999000000000.0  | 999999000000000",
        "1.0E15             | 1E+15",
        "6.02214076E23      | 6.02214E+23",
        "-2.0E-300          | -2E-300",
        // rows kept from the former per-package formatters (agreement, consensus, shift), now this one
        "0.8                | 0.8",
        "0.6666666666666666 | 0.666667",
        "-0.125             | -0.125",
        "-0.25              | -0.25",
        "0.9876543219       | 0.987654",
        "1.2345678912E-5    | 0.0000123457",
        "NaN                | \"\"",
        "Infinity           | \"\"",
        "-Infinity          | \"\"",
    })
    void formatsByTheDocumentedScheme(double x, String expected) {
        assertEquals(expected, Numbers.format(x));
    }

    @ParameterizedTest
    @CsvSource({"0.987654321, 0.987654", "-1.5, -1.5", "1234567.0, 1234570.0", "NaN, NaN", "Infinity, NaN"})
    void roundKeepsSixSignificantDigits(double x, double expected) {
        assertEquals(expected, Numbers.round(x));
    }

    @ParameterizedTest
    @CsvSource({"0.987654321", "-1.5", "1.234567E-7", "6.02214076E23", "42"})
    void formatIsAValidNumberThatParsesBackToRound(double x) {
        assertEquals(Numbers.round(x), Double.parseDouble(Numbers.format(x)));
    }
}
