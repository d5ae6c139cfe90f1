package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.ByteArrayOutputStream;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class CsvWriterTest {

    // Leading characters from the OWASP "CSV Injection" page (=, +, -, @, tab, carriage return);
    // its recommendation is to prefix such cells with a single quote.
    @ParameterizedTest
    @CsvSource(delimiter = '|', quoteCharacter = '"', value = {
        "=1+2               | '=1+2",
        "+SUM(A1)           | '+SUM(A1)",
        "-2+3               | '-2+3",
        "@cmd               | '@cmd",
        "\"\tx\"            | \"'\tx\"",
        "\"\rx\"            | \"'\rx\"",
        "R1                 | R1",
        "a=b                | a=b",
        "'quoted            | 'quoted",
        "\"\"               | \"\"",
    })
    void neutralisesTextCellsAsOwaspRecommends(String in, String expected) {
        assertEquals(expected, CsvWriter.neutralise(in));
    }

    @Test
    void writesAValueTable() {
        CsvTable t = new CsvTable(List.of("case", "reader", "dice", "signed_distance_mm", "voxels"));
        t.addRow(CsvTable.text("case-01"), CsvTable.text("R1"), CsvTable.number(0.912345678), CsvTable.number(-1.5), CsvTable.integer(12_345_678));
        t.addRow(CsvTable.text("=HYPERLINK(\"x\")"), CsvTable.text("-R2, \"night\""), CsvTable.number(Double.NaN), CsvTable.number(1e-9), CsvTable.integer(-3));
        t.addRow(CsvTable.text("Zoë"), CsvTable.text("@home"), CsvTable.number(1.0), CsvTable.number(-0.0), CsvTable.integer(0));
        // Expected text written by hand from RFC 4180 quoting, the OWASP prefix rule and Numbers.format.
        String expected = "case,reader,dice,signed_distance_mm,voxels\n"
            + "case-01,R1,0.912346,-1.5,12345678\n"
            + "\"'=HYPERLINK(\"\"x\"\")\",\"'-R2, \"\"night\"\"\",,1E-9,-3\n"
            + "Zoë,'@home,1,0,0\n";
        assertEquals(expected, t.toCsv());
        assertFalse(t.toCsv().contains("\r"));
    }

    @Test
    void writesUtf8BytesAndParsesBack() throws Exception {
        CsvTable t = new CsvTable(List.of("reader", "value"));
        t.addRow(CsvTable.text("Zoë\nline two"), CsvTable.number(-1.5));
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        t.write(out);
        byte[] bytes = out.toByteArray();
        assertEquals(t.toCsv(), new String(bytes, StandardCharsets.UTF_8));
        assertEquals((byte) 'r', bytes[0], "no byte-order mark");
        try (CSVParser p = CSVParser.parse(new StringReader(t.toCsv()), CSVFormat.RFC4180.builder().setHeader().get())) {
            List<CSVRecord> records = p.getRecords();
            assertEquals(1, records.size());
            assertEquals("Zoë\nline two", records.get(0).get("reader"));
            assertEquals("-1.5", records.get(0).get("value"));
        }
    }

    /** NUL, ESC, DEL and a C1 control in a name from input are written as visible escapes; tab, CR, LF stay for CSV quoting. */
    @Test
    void controlCharactersAreWrittenAsEscapes() {
        assertEquals("a\\u0000b\\u001b[31mred\\u007f\\u009b", CsvWriter.neutralise("a\u0000b\u001b[31mred\u007f\u009b"));
        // an escaped control at the start is no formula, and a formula after it is still text
        assertEquals("\\u001b=1", CsvWriter.neutralise("\u001b=1"));
        assertEquals("'=\\u0000", CsvWriter.neutralise("=\u0000"));
        CsvTable t = new CsvTable(List.of("case"));
        t.addRow(CsvTable.text("c\u0000\u001b"));
        assertEquals("case\nc\\u0000\\u001b\n", t.toCsv());
        assertEquals("x\ty", CsvWriter.neutralise("x\ty"));
    }

    @Test
    void neutralisesHeadersToo() {
        CsvTable t = new CsvTable(List.of("case", "=R1"));
        assertEquals("case,'=R1\n", t.toCsv());
    }

    @Test
    void rowWidthIsChecked() {
        CsvTable t = new CsvTable(List.of("a", "b"));
        assertThrows(IllegalArgumentException.class, () -> t.addRow(CsvTable.text("x")));
    }
}
