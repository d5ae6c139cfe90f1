package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import picocli.CommandLine;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.Model.PositionalParamSpec;

/**
 * The usage help of every command reads as whole sentences.
 *
 * <p>"No help line ends mid-sentence" is checked as: (1) every description paragraph (an element
 * of a command's, an option's or a parameter's description, after {@code String.format}) ends with
 * a full stop; (2) every such paragraph appears whole in the printed help once line breaks and
 * indentation are collapsed into single spaces, so no paragraph is cut short (as picocli's command
 * list did with multi-line descriptions) and no word is split at a line end (as "summary." /
 * "json" was); (3) the command list shows each command's first paragraph whole. And nothing is
 * printed on standard error, picocli's own warnings included (they go to {@code System.err}).
 */
class HelpTextTest {

    static Stream<List<String>> commands() {
        List<List<String>> paths = new ArrayList<>();
        paths.add(List.of());
        for (String name : Main.commandLine().getSubcommands().keySet()) {
            if (!name.equals("help")) {
                paths.add(List.of(name));
            }
        }
        return paths.stream();
    }

    /** Runs the command line with System.err captured too (picocli warns there, not on cl.getErr()). */
    static CliRun runCapturingSystemErr(String... args) {
        PrintStream saved = System.err;
        ByteArrayOutputStream sysErr = new ByteArrayOutputStream();
        try {
            System.setErr(new PrintStream(sysErr, true, StandardCharsets.UTF_8));
            CliRun r = CliRun.of(args);
            return new CliRun(r.code(), r.out(), r.err() + sysErr.toString(StandardCharsets.UTF_8));
        } finally {
            System.setErr(saved);
        }
    }

    static String collapsed(String text) {
        return text.replaceAll("\\s+", " ");
    }

    static List<String> paragraphs(CommandSpec spec) {
        List<String> p = new ArrayList<>();
        for (String d : spec.usageMessage().description()) {
            p.add(String.format(Locale.ROOT, d));
        }
        for (OptionSpec o : spec.options()) {
            if (!o.hidden()) {
                for (String d : o.description()) {
                    p.add(String.format(Locale.ROOT, d));
                }
            }
        }
        for (PositionalParamSpec o : spec.positionalParameters()) {
            if (!o.hidden()) {
                for (String d : o.description()) {
                    p.add(String.format(Locale.ROOT, d));
                }
            }
        }
        return p;
    }

    @ParameterizedTest
    @MethodSource("commands")
    void everyParagraphEndsWithAFullStopAndIsPrintedWhole(List<String> path) {
        List<String> args = new ArrayList<>(path);
        args.add("--help");
        CliRun r = runCapturingSystemErr(args.toArray(new String[0]));
        assertEquals(ExitCodes.OK, r.code());
        assertEquals("", r.err(), "nothing on standard error");
        CommandLine cl = Main.commandLine();
        CommandSpec spec = path.isEmpty() ? cl.getCommandSpec() : cl.getSubcommands().get(path.get(0)).getCommandSpec();
        String printed = collapsed(r.out());
        for (String p : paragraphs(spec)) {
            assertTrue(p.endsWith("."), "paragraph does not end with a full stop: " + p);
            assertTrue(printed.contains(collapsed(p)), "paragraph not printed whole (cut or split): " + p
                + "\n--- help ---\n" + r.out());
        }
        for (String line : r.out().lines().toList()) {
            assertTrue(line.length() <= spec.usageMessage().width(), "line longer than the help width: " + line);
        }
    }

    @Test
    void commandListShowsEveryFirstParagraphWhole() {
        CliRun r = runCapturingSystemErr("--help");
        String printed = collapsed(r.out());
        for (var e : Main.commandLine().getSubcommands().entrySet()) {
            var usage = e.getValue().getCommandSpec().usageMessage();
            // as picocli: the header's first line when there is one, else the description's
            String first = String.format(Locale.ROOT, usage.header().length > 0 ? usage.header()[0] : usage.description()[0]);
            assertTrue(first.endsWith("."), e.getKey() + ": " + first);
            assertTrue(printed.contains(collapsed(e.getKey() + " " + first)), e.getKey() + " summary cut:\n" + r.out());
        }
    }

    @Test
    void analyzeHelpKeepsFileNamesWhole() {
        String out = runCapturingSystemErr("analyze", "--help").out();
        for (String name : List.of("summary.json", "report.html", "reader_summary.csv", "docs/outputs.md")) {
            assertTrue(out.contains(name), name + " split across lines:\n" + out);
        }
    }

    @Test
    void helpCommandAndBareCallPrintNoWarning() {
        CliRun help = runCapturingSystemErr("help");
        assertEquals(ExitCodes.OK, help.code());
        assertEquals("", help.err());
        assertTrue(help.out().contains("calibrate"), help.out());

        CliRun bare = runCapturingSystemErr();
        assertEquals(ExitCodes.INPUT, bare.code(), "a bare call is a usage error");
        assertTrue(bare.err().startsWith("accordia: missing command"), bare.err());
        assertTrue(bare.err().contains("Usage: accordia") && bare.err().contains("Commands:"), bare.err());
        assertFalse(bare.err().contains("WARN"), bare.err());
    }

    @Test
    void mistypedOptionGetsASuggestion() {
        CliRun r = runCapturingSystemErr("analyze", "demo-masks", "--treads", "2");
        assertEquals(ExitCodes.INPUT, r.code());
        assertTrue(r.err().contains("--treads"), r.err());
        assertTrue(r.err().contains("Did you mean --threads?"), "suggestion expected:\n" + r.err());
        assertTrue(r.err().contains("accordia analyze --help"), r.err());
    }

    @Test
    void mistypedCommandGetsASuggestion() {
        CliRun r = runCapturingSystemErr("analyse", "demo-masks");
        assertEquals(ExitCodes.INPUT, r.code());
        assertTrue(r.err().contains("analyze"), r.err());
    }

    @Test
    void wrapBreaksAtSpacesOnly() {
        String text = "Writes summary.json and docs/outputs.md into the output folder.";
        List<String> lines = new ArrayList<>();
        for (int[] p : HelpFormat.wrap(text, 20, 19)) {
            lines.add(text.substring(p[0], p[1]));
        }
        assertEquals(List.of("Writes summary.json", "and docs/outputs.md", "into the output", "folder."), lines);
        // a word longer than the line stands alone
        assertEquals(List.of(new int[] {0, 12}).size(), HelpFormat.wrap("abcdefghijkl", 5, 5).size());
    }
}
