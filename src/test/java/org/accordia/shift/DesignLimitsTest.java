package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Design limitations from the roster alone. Partition counts N!/(Π n_g! Π m_s!) worked by hand
 * (common practice for counting unlabelled set partitions with given block sizes): 2 × 3 readers:
 * 6!/(3!·3!·2!) = 10; 3 × 2: 6!/(2!³·3!) = 15; 3 × 3: 9!/(3!³·3!) = 280; sizes 1/3/3: 7!/(1!·3!·3!·2!) = 70.
 */
class DesignLimitsTest {
    private static Map<String, Integer> roster(int... sizes) {
        Map<String, Integer> m = new LinkedHashMap<>();
        String[] names = {"esterhaven", "norvale", "quillbay", "westmarch"};
        for (int i = 0; i < sizes.length; i++) {
            m.put(names[i], sizes[i]);
        }
        return m;
    }

    private static List<String> keys(List<DesignLimit> l) {
        return l.stream().map(d -> d.kind().key()).toList();
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = ';', value = {
        "3;            single-centre;                                   0",
        "3,3;          cannot-reach-alpha,two-centres;                  10",
        "2,2,2;        cannot-reach-alpha;                              15",
        "3,3,3;        '';                                              280",
        "1,3,3;        one-reader-centre;                               70",
        "5,5;          two-centres;                                     126",
        "1,1;          cannot-reach-alpha,two-centres,one-reader-centre; 1",
    })
    void table(String sizes, String expected, long partitions) {
        int[] s = java.util.Arrays.stream(sizes.split(",")).mapToInt(Integer::parseInt).toArray();
        List<DesignLimit> got = DesignLimits.of(roster(s), 0.05, 100_000, 9_999);
        assertEquals(expected.isEmpty() ? List.of() : List.of(expected.split(",")), keys(got));
        for (DesignLimit d : got) {
            assertEquals(partitions, d.partitions(), d.toString());
            if (d.kind() != DesignLimitation.SINGLE_CENTRE) {
                assertEquals(1.0 / partitions, d.minP(), 1e-15);
            }
        }
    }

    @Test
    void twoCentresOfThreeSmallestPIsOneTenthAndOneReaderCentresAreNamed() {
        List<DesignLimit> l = DesignLimits.of(roster(3, 3), 0.05, 100_000, 9_999);
        assertEquals(0.1, l.get(0).minP(), 1e-15);
        assertEquals(List.of("esterhaven", "norvale"), l.get(1).centres());
        List<DesignLimit> one = DesignLimits.of(roster(1, 3, 1), 0.05, 100_000, 9_999);
        assertEquals(List.of("esterhaven", "quillbay"), one.get(one.size() - 1).centres());
        // a roster above the enumeration limit uses the Monte Carlo minimum 1/(m + 1)
        assertEquals(List.of(), DesignLimits.of(roster(6, 6, 6), 0.05, 1000, 9_999));
        assertEquals(List.of("single-centre"), keys(DesignLimits.of(roster(4, 0), 0.05, 100_000, 9_999)));
        assertEquals(Map.of("a", 2, "b", 1), DesignLimits.roster(Map.of("r1", "a", "r2", "a", "r3", "b")));
    }
}
