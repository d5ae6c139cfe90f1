package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

class JsonOutputTest {

    record Verdict(String label, String level, double icc, double[] interval, Double missing, int cases) {
    }

    record Summary(String tool, Map<String, Object> counts, List<Verdict> verdicts) {
    }

    private static Summary sample(Map<String, Object> counts) {
        return new Summary("accordia", counts, List.of(
            new Verdict("liver", "review", 0.8765432109, new double[] {0.7, Double.NaN, Double.POSITIVE_INFINITY}, null, 12),
            new Verdict("<lesion>", "pool", -1.5, new double[] {-2.25e-9, 1e20}, Double.NaN, 3)));
    }

    @Test
    void writesTheDocumentedLayout() {
        Map<String, Object> counts = new HashMap<>();
        counts.put("zeta", 1);
        counts.put("alpha", 2.0f);
        counts.put("mid", Double.NaN);
        // Expected text written by hand from the documented configuration.
        String expected = """
            {
              "tool": "accordia",
              "counts": {
                "alpha": 2,
                "mid": null,
                "zeta": 1
              },
              "verdicts": [
                {
                  "label": "liver",
                  "level": "review",
                  "icc": 0.876543,
                  "interval": [
                    0.7,
                    null,
                    null
                  ],
                  "missing": null,
                  "cases": 12
                },
                {
                  "label": "<lesion>",
                  "level": "pool",
                  "icc": -1.5,
                  "interval": [
                    -2.25E-9,
                    1E+20
                  ],
                  "missing": null,
                  "cases": 3
                }
              ]
            }
            """;
        assertEquals(expected, JsonOutput.toJson(sample(counts)));
    }

    @Test
    void sameInputGivesIdenticalBytesWhateverTheMapOrder() throws Exception {
        Map<String, Object> a = new LinkedHashMap<>();
        Map<String, Object> b = new LinkedHashMap<>();
        for (int i = 0; i < 50; i++) {
            a.put("k" + i, i * 0.1);
            b.put("k" + (49 - i), (49 - i) * 0.1);
        }
        ByteArrayOutputStream x = new ByteArrayOutputStream();
        ByteArrayOutputStream y = new ByteArrayOutputStream();
        JsonOutput.write(sample(a), x);
        JsonOutput.write(sample(b), y);
        assertEquals(x.toString(StandardCharsets.UTF_8), y.toString(StandardCharsets.UTF_8));
        String s = x.toString(StandardCharsets.UTF_8);
        assertFalse(s.contains("\r"));
        assertFalse(s.contains("NaN"));
        assertFalse(s.contains("Infinity"));
        assertTrue(s.endsWith("}\n"));
    }

    @Test
    void outputParsesBackWithRoundedValues() throws Exception {
        JsonNode n = JsonOutput.mapper().readTree(JsonOutput.toJson(sample(Map.of("x", 0.1 + 0.2))));
        assertEquals(0.3, n.get("counts").get("x").doubleValue());
        assertEquals(Numbers.round(0.8765432109), n.get("verdicts").get(0).get("icc").doubleValue());
        assertTrue(n.get("verdicts").get(1).get("missing").isNull());
    }
}
