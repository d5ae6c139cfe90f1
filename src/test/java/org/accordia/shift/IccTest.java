package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;

import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class IccTest {
    /** Shrout & Fleiss (1979), Table 2: 6 targets x 4 judges. */
    static final double[][] SHROUT_FLEISS = {
        {9, 2, 5, 8},
        {6, 1, 3, 2},
        {8, 4, 6, 8},
        {7, 1, 2, 6},
        {10, 5, 6, 9},
        {6, 2, 4, 7},
    };

    @ParameterizedTest(name = "{0} = {1}")
    @CsvSource({
        // Shrout & Fleiss (1979), Table 4 (to the 4 decimals given in the task; paper prints .17/.29/.71/.44/.62/.91)
        "'ICC(1,1)', 0.1657",
        "'ICC(2,1)', 0.2898",
        "'ICC(3,1)', 0.7148",
        "'ICC(1,k)', 0.4428",
        "'ICC(2,k)', 0.6201",
        "'ICC(3,k)', 0.9093",
    })
    void shroutFleissTable(String form, double expected) {
        Icc.Result r = Icc.compute(SHROUT_FLEISS, 0.05);
        assertEquals(expected, r.get(form).value(), 5e-5, form);
    }

    @Test
    void valuesAndBoundsMatchPsychIcc() throws IOException {
        // psych 2.2.9 (Debian r-cran-psych): ICC(sf, lmer = FALSE); see icc.R and icc_output.txt.
        List<CSVRecord> rows = Fixtures.csv("shrout_fleiss_psych.csv");
        String[] forms = {"ICC(1,1)", "ICC(2,1)", "ICC(3,1)", "ICC(1,k)", "ICC(2,k)", "ICC(3,k)"};
        Icc.Result r = Icc.compute(SHROUT_FLEISS, 0.05);
        assertEquals(6, rows.size());
        for (int i = 0; i < 6; i++) {
            CSVRecord row = rows.get(i);
            Icc.Estimate e = r.get(forms[i]);
            assertEquals(Double.parseDouble(row.get("icc")), e.value(), 1e-9, forms[i]);
            assertEquals(Double.parseDouble(row.get("f")), e.f(), 1e-9, forms[i] + " F");
            assertEquals(Double.parseDouble(row.get("df1")), e.df1(), 1e-12, forms[i] + " df1");
            assertEquals(Double.parseDouble(row.get("df2")), e.df2(), 1e-12, forms[i] + " df2");
            assertEquals(Double.parseDouble(row.get("p")), e.pValue(), 1e-8, forms[i] + " p");
            assertEquals(Double.parseDouble(row.get("lower")), e.lower(), 1e-7, forms[i] + " lower");
            assertEquals(Double.parseDouble(row.get("upper")), e.upper(), 1e-7, forms[i] + " upper");
            assertTrue(e.lower() <= e.value() && e.value() <= e.upper(), forms[i] + " inside its interval");
        }
    }

    @Test
    void degenerateInput() {
        assertThrows(IllegalArgumentException.class, () -> Icc.compute(new double[][] {{1, 2}}, 0.05));
        assertThrows(IllegalArgumentException.class, () -> Icc.compute(new double[][] {{1}, {2}}, 0.05));
        assertThrows(IllegalArgumentException.class, () -> Icc.compute(new double[][] {{1, 2}, {3, Double.NaN}}, 0.05));
        // perfectly consistent judges: EMS = 0, ICC(3,1) = 1 (common practice: no residual disagreement)
        Icc.Result r = Icc.compute(new double[][] {{1, 2}, {3, 4}, {6, 7}}, 0.05);
        assertEquals(1.0, r.get("ICC(3,1)").value(), 1e-12);
    }
}
