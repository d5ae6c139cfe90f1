package org.accordia.cli;

import java.util.ArrayList;
import java.util.IllegalFormatException;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import picocli.CommandLine;
import picocli.CommandLine.Help;
import picocli.CommandLine.Help.Ansi.Text;
import picocli.CommandLine.Help.Column;
import picocli.CommandLine.Help.ColorScheme;
import picocli.CommandLine.Help.TextTable;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.Model.PositionalParamSpec;

/**
 * The usage help's layout: picocli's, except that long texts are wrapped at spaces only.
 *
 * <p>picocli wraps with the JDK's line {@link java.text.BreakIterator}, which allows a break after
 * a full stop followed by a letter, so a file name such as {@code summary.json} or a path such as
 * {@code docs/outputs.md} could be cut in two at the end of a line. Here every wrapped cell
 * (command descriptions, the command list, option and parameter descriptions) breaks at a space,
 * and a word longer than the column stands on its own line (picocli then cuts it, as before).
 * Installed on every command by {@link Main#commandLine()}.
 */
final class HelpFormat implements CommandLine.IHelpFactory {

    @Override
    public Help create(CommandSpec commandSpec, ColorScheme colorScheme) {
        return new SpaceWrappingHelp(commandSpec, colorScheme);
    }

    /** The line pieces of a text wrapped at spaces: the first {@code first} wide, the rest {@code rest}. */
    static List<int[]> wrap(String plain, int first, int rest) {
        List<int[]> pieces = new ArrayList<>();
        int start = 0;
        int n = plain.length();
        while (start < n) {
            while (start < n && plain.charAt(start) == ' ') {
                start++;
            }
            if (start >= n) {
                break;
            }
            int width = Math.max(1, pieces.isEmpty() ? first : rest);
            if (n - start <= width) {
                pieces.add(new int[] {start, n});
                break;
            }
            int cut = plain.lastIndexOf(' ', start + width);
            if (cut <= start) { // one word longer than the line: keep it whole on its own line
                cut = plain.indexOf(' ', start);
                if (cut < 0) {
                    cut = n;
                }
            }
            int end = cut;
            while (end > start && plain.charAt(end - 1) == ' ') {
                end--;
            }
            pieces.add(new int[] {start, end});
            start = cut;
        }
        return pieces;
    }

    /** A text table whose wrapping columns break at spaces only. */
    static final class SpaceWrappingTable extends TextTable {
        private final ColorScheme scheme;

        SpaceWrappingTable(ColorScheme colorScheme, Column... columns) {
            super(colorScheme, columns);
            this.scheme = colorScheme;
        }

        @Override
        public Cell putValue(int row, int col, Text value) {
            Column column = columns()[col];
            String plain = value == null ? "" : value.plainString();
            int first = column.width - column.indent;
            if (column.overflow != Column.Overflow.WRAP || plain.length() <= first || plain.indexOf('\n') >= 0
                    || plain.indexOf('\r') >= 0) {
                return super.putValue(row, col, value);
            }
            List<int[]> pieces = wrap(plain, first, first - indentWrappedLines);
            Cell last = null;
            String continuation = " ".repeat(Math.max(0, indentWrappedLines));
            for (int i = 0; i < pieces.size(); i++) {
                Text piece = value.substring(pieces.get(i)[0], pieces.get(i)[1]);
                if (i > 0) {
                    row++;
                    addEmptyRow();
                    piece = scheme.text(continuation).concat(piece);
                }
                last = super.putValue(row, col, piece);
                row = last.row;
            }
            return last;
        }
    }

    /** picocli's help with {@link SpaceWrappingTable} in every place that wraps text. */
    static final class SpaceWrappingHelp extends Help {
        SpaceWrappingHelp(CommandSpec spec, ColorScheme colorScheme) {
            super(spec, colorScheme);
        }

        private int width() {
            return commandSpec().usageMessage().width();
        }

        @Override
        public Layout createDefaultLayout(List<OptionSpec> options, List<PositionalParamSpec> positionals,
                                          ColorScheme scheme) {
            int longOptions = calcLongOptionColumnWidth(options, positionals, scheme);
            // the columns of picocli's TextTable.forDefaultColumns: "* -c, --create   Creates a ..."
            TextTable table = new SpaceWrappingTable(scheme,
                new Column(2, 0, Column.Overflow.TRUNCATE),
                new Column(2, 0, Column.Overflow.SPAN),
                new Column(1, 0, Column.Overflow.TRUNCATE),
                new Column(longOptions, 1, Column.Overflow.SPAN),
                new Column(width() - 5 - longOptions, 1, Column.Overflow.WRAP));
            return new Layout(scheme, table, createDefaultOptionRenderer(), createDefaultParameterRenderer());
        }

        @Override
        public String description(Object... params) {
            return paragraphs(commandSpec().usageMessage().description(), params);
        }

        @Override
        public String header(Object... params) {
            return paragraphs(commandSpec().usageMessage().header(), params);
        }

        @Override
        public String footer(Object... params) {
            return paragraphs(commandSpec().usageMessage().footer(), params);
        }

        private String paragraphs(String[] values, Object... params) {
            if (values == null || values.length == 0) {
                return "";
            }
            TextTable table = new SpaceWrappingTable(colorScheme(), new Column(width(), 0, Column.Overflow.WRAP));
            table.indentWrappedLines = 0;
            for (String v : values) {
                for (Text line : colorScheme().text(format(v, params)).splitLines()) {
                    table.addRowValues(line);
                }
            }
            return table.toString();
        }

        @Override
        public String commandList(Map<String, Help> subcommands) {
            if (subcommands.isEmpty()) {
                return "";
            }
            int longest = 0;
            for (String name : subcommands.keySet()) {
                longest = Math.max(longest, name.length());
            }
            int nameWidth = Math.min(longest, width() / 2);
            TextTable table = new SpaceWrappingTable(colorScheme(),
                new Column(nameWidth + 2, 2, Column.Overflow.SPAN),
                new Column(width() - (nameWidth + 2), 2, Column.Overflow.WRAP));
            for (Map.Entry<String, Help> e : subcommands.entrySet()) {
                Help help = e.getValue();
                var usage = help.commandSpec().usageMessage();
                String summary = usage.header().length > 0 ? usage.header()[0]
                    : usage.description().length > 0 ? usage.description()[0] : "";
                Text[] lines = colorScheme().text(format(summary)).splitLines();
                for (int i = 0; i < lines.length; i++) {
                    table.addRowValues(i == 0 ? help.commandNamesText(", ") : colorScheme().text(""), lines[i]);
                }
            }
            return table.toString();
        }

        /** As picocli: {@code String.format} (so {@code %n} is a line break), the raw text when that fails. */
        private static String format(String text, Object... params) {
            if (text == null) {
                return "";
            }
            try {
                return String.format(Locale.ROOT, text, params);
            } catch (IllegalFormatException e) {
                return text;
            }
        }
    }
}
