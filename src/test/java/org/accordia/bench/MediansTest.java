package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** Median of a sample: the middle order statistic, or the mean of the two middle ones (common practice). */
class MediansTest {

    @ParameterizedTest
    @CsvSource({
        "'5', 5",
        "'3 1 2', 2",
        "'4 1 3 2', 2.5",
        "'10 10 10 1', 10",
        "'7 1', 4",
    })
    void medianOfLongs(String values, double expected) {
        long[] v = java.util.Arrays.stream(values.split(" ")).mapToLong(Long::parseLong).toArray();
        long[] copy = v.clone();
        assertEquals(expected, Medians.of(v), 0);
        assertTrue(java.util.Arrays.equals(copy, v), "input must not be reordered");
        double[] d = java.util.Arrays.stream(v).asDoubleStream().toArray();
        assertEquals(expected, Medians.of(d), 0);
    }

    @org.junit.jupiter.api.Test
    void emptyIsNaN() {
        assertTrue(Double.isNaN(Medians.of(new long[0])));
        assertTrue(Double.isNaN(Medians.of(new double[0])));
    }
}
