package org.accordia.report;

import java.io.IOException;
import java.io.OutputStream;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Objects;

/**
 * A table for a CSV file, with typed cells: {@linkplain #text(String) text} (names and words, which
 * may come from input and are neutralised against formula injection when written),
 * {@linkplain #number(double) numbers} (formatted by {@link Numbers#format(double)}, never altered;
 * NaN is an empty cell) and {@linkplain #integer(long) integers} (counts). Written by
 * {@link CsvWriter}: UTF-8, comma-separated, LF line endings, one header row, quotes only where
 * needed (RFC 4180 quoting).
 *
 * <pre>{@code
 * CsvTable t = new CsvTable(List.of("case", "reader_a", "reader_b", "dice"));
 * t.addRow(CsvTable.text("case-01"), CsvTable.text("R1"), CsvTable.text("R2"), CsvTable.number(0.912345678));
 * folder.writeAtomically("pairs.csv", t::write);
 * }</pre>
 */
public final class CsvTable {

    /** One cell. */
    public sealed interface Cell permits TextCell, NumberCell, IntegerCell {
    }

    /** Text, possibly from input; neutralised when written (see {@link CsvWriter#neutralise(String)}). */
    public record TextCell(String value) implements Cell {
        public TextCell {
            Objects.requireNonNull(value, "text cell");
        }
    }

    /** A measured number; NaN and infinities mean "undefined" and give an empty cell. */
    public record NumberCell(double value) implements Cell {
    }

    /** An exact integer (a count). */
    public record IntegerCell(long value) implements Cell {
    }

    private final List<String> headers;
    private final List<List<Cell>> rows = new ArrayList<>();

    /** A table with these column names (our own names, not from input). */
    public CsvTable(List<String> headers) {
        if (headers.isEmpty()) {
            throw new IllegalArgumentException("a CSV table needs at least one column");
        }
        this.headers = List.copyOf(headers);
    }

    public static Cell text(String value) {
        return new TextCell(value == null ? "" : value);
    }

    public static Cell number(double value) {
        return new NumberCell(value);
    }

    public static Cell integer(long value) {
        return new IntegerCell(value);
    }

    /** {@code true} or {@code false} as text. */
    public static Cell bool(boolean value) {
        return new TextCell(Boolean.toString(value));
    }

    /** Appends a row; it must have exactly one cell per column. */
    public CsvTable addRow(List<Cell> cells) {
        if (cells.size() != headers.size()) {
            throw new IllegalArgumentException("row has " + cells.size() + " cells, table has " + headers.size() + " columns");
        }
        for (Cell c : cells) {
            Objects.requireNonNull(c, "cell");
        }
        rows.add(List.copyOf(cells));
        return this;
    }

    /** Appends a row; it must have exactly one cell per column. */
    public CsvTable addRow(Cell... cells) {
        return addRow(Arrays.asList(cells));
    }

    public List<String> headers() {
        return headers;
    }

    public List<List<Cell>> rows() {
        return Collections.unmodifiableList(rows);
    }

    /** The CSV text (see {@link CsvWriter}). */
    public String toCsv() {
        return CsvWriter.toCsv(this);
    }

    /** Writes the CSV as UTF-8 to {@code out} (does not close it); fits {@link OutputFolder#writeAtomically}. */
    public void write(OutputStream out) throws IOException {
        CsvWriter.write(this, out);
    }
}
