package org.accordia.report;

import java.io.IOException;
import java.io.OutputStream;
import java.io.OutputStreamWriter;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.QuoteMode;

/**
 * Writes a {@link CsvTable} with Apache Commons CSV: comma separator, double-quote quoting only
 * where needed (RFC 4180), LF record separator, UTF-8 without byte-order mark, a header row.
 *
 * <p>CSV injection: a text cell (header or {@link CsvTable.TextCell}) that starts with {@code =},
 * {@code +}, {@code -}, {@code @}, a tab or a carriage return is prefixed with a single quote
 * {@code '}, as the OWASP "CSV Injection" page recommends, so that a spreadsheet shows it as text
 * instead of evaluating it. Control characters other than tab, CR and LF are written as
 * {@code \}{@code uXXXX} ({@link #escapeControls}). Number and integer cells are never altered ({@code -1.5} stays
 * {@code -1.5}): they are formatted by us and cannot carry a formula.
 */
public final class CsvWriter {

    /** The format: RFC 4180 quoting, LF line endings. */
    static final CSVFormat FORMAT = CSVFormat.RFC4180.builder()
        .setRecordSeparator("\n")
        .setQuoteMode(QuoteMode.MINIMAL)
        .get();

    private CsvWriter() {
    }

    /**
     * Neutralises a text cell against formula injection (OWASP): prefixes {@code '} when the text
     * starts with {@code = + - @}, tab or carriage return; returns any other text unchanged.
     */
    public static String neutralise(String raw) {
        String text = escapeControls(raw);
        if (text.isEmpty()) {
            return text;
        }
        char c = text.charAt(0);
        if (c == '=' || c == '+' || c == '-' || c == '@' || c == '\t' || c == '\r') {
            return "'" + text;
        }
        return text;
    }

    /**
     * Control characters other than tab, line feed and carriage return (which CSV quoting keeps
     * intact) are written as a visible {@code \}{@code uXXXX}: a NUL or ESC in a name from input
     * must not reach a terminal or a spreadsheet raw (JSON and HTML escape them their own way).
     */
    static String escapeControls(String text) {
        StringBuilder b = null;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            boolean control = (c < 0x20 && c != '\t' && c != '\n' && c != '\r') || (c >= 0x7F && c <= 0x9F);
            if (control && b == null) {
                b = new StringBuilder(text.length() + 8).append(text, 0, i);
            }
            if (b != null) {
                if (control) {
                    b.append(String.format(java.util.Locale.ROOT, "\\u%04x", (int) c));
                } else {
                    b.append(c);
                }
            }
        }
        return b == null ? text : b.toString();
    }

    /** The text a cell is written as (before CSV quoting). */
    public static String cellText(CsvTable.Cell cell) {
        if (cell instanceof CsvTable.TextCell t) {
            return neutralise(t.value());
        }
        if (cell instanceof CsvTable.NumberCell n) {
            return Numbers.format(n.value());
        }
        return Long.toString(((CsvTable.IntegerCell) cell).value());
    }

    /** Writes {@code table} as UTF-8 to {@code out}; flushes, does not close. */
    public static void write(CsvTable table, OutputStream out) throws IOException {
        Writer w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
        write(table, w);
        w.flush();
    }

    /** The CSV text of {@code table}. */
    public static String toCsv(CsvTable table) {
        StringBuilder sb = new StringBuilder();
        try {
            write(table, sb);
        } catch (IOException e) {
            throw new UncheckedIOException(e); // a StringBuilder does not throw
        }
        return sb.toString();
    }

    private static void write(CsvTable table, Appendable target) throws IOException {
        CSVPrinter printer = new CSVPrinter(target, FORMAT);
        List<String> header = new ArrayList<>();
        for (String h : table.headers()) {
            header.add(neutralise(h));
        }
        printer.printRecord(header);
        List<String> record = new ArrayList<>(table.headers().size());
        for (List<CsvTable.Cell> row : table.rows()) {
            record.clear();
            for (CsvTable.Cell c : row) {
                record.add(cellText(c));
            }
            printer.printRecord(record);
        }
        printer.flush();
    }
}
