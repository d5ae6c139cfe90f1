package org.accordia.cli;

import java.io.PrintWriter;
import java.util.Arrays;
import org.accordia.io.InputException;
import org.accordia.io.Messages;
import org.accordia.report.OutputFolder;
import java.io.IOException;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/** The command-line entry point: a thin layer over the library. The only place that exits. */
@Command(
    name = "accordia",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Agreement, consensus and annotation-shift analysis for multi-centre segmentation studies.",
        "A research and quality tool, not a diagnostic device. Nothing is sent anywhere."
    },
    subcommands = {
        CommandLine.HelpCommand.class,
        InspectCommand.class,
        AnalyzeCommand.class,
        DemoCommand.class,
        BenchCommand.class,
        CalibrateCommand.class
    },
    exitCodeListHeading = "%nExit codes:%n",
    exitCodeList = {
        "0:completed",
        "1:internal error (a bug; rerun with --debug and report it)",
        "2:bad input or usage (one line names the file and the problem)",
        "3:analyze --fail-on: a verdict reached the named level"
    })
public final class Main implements java.util.concurrent.Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    /** A bare {@code accordia}: the usage on standard error, exit 2. */
    @Override
    public Integer call() {
        PrintWriter err = spec.commandLine().getErr();
        err.println("accordia: missing command; the commands are listed below.");
        spec.commandLine().usage(err);
        err.flush();
        return ExitCodes.INPUT;
    }

    /** The command line with every subcommand and the project's help layout ({@link HelpFormat}). */
    static CommandLine commandLine() {
        CommandLine cl = new CommandLine(new Main());
        cl.setHelpFactory(new HelpFormat()); // after the subcommands, so that they all get it
        return cl;
    }

    /** Runs the command line and returns the exit code (no System.exit; tests call this). */
    public static int execute(PrintWriter out, PrintWriter err, String... args) {
        boolean debug = Arrays.asList(args).contains("--debug");
        String[] filtered = Arrays.stream(args).filter(a -> !a.equals("--debug")).toArray(String[]::new);
        CommandLine cl = commandLine();
        cl.setOut(out);
        cl.setErr(err);
        cl.setExitCodeExceptionMapper(t -> t instanceof InputException || environmentProblem(t) != null
            ? ExitCodes.INPUT : ExitCodes.INTERNAL);
        cl.setParameterExceptionHandler((ex, a) -> {
            err.println("accordia: " + Messages.oneLine(ex.getMessage()));
            // a mistyped option or command: the nearest names, then where the help is
            String near = suggestion(ex);
            if (near != null) {
                err.println(near);
            } else {
                CommandLine.UnmatchedArgumentException.printSuggestions(ex, err);
            }
            err.println("Run '" + ex.getCommandLine().getCommandSpec().qualifiedName() + " --help' for the usage.");
            err.flush();
            return ExitCodes.INPUT;
        });
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            if (ex instanceof InputException ie) {
                err.println("accordia: " + Messages.oneLine(ie.getMessage()));
                if (debug) {
                    ie.printStackTrace(err);
                }
                err.flush();
                return ExitCodes.INPUT;
            }
            String environment = environmentProblem(ex);
            if (environment != null) {
                err.println("accordia: " + Messages.oneLine(environment));
                if (debug) {
                    ex.printStackTrace(err);
                }
                err.flush();
                return ExitCodes.INPUT;
            }
            err.println("accordia: internal error: " + Messages.oneLine(String.valueOf(ex)) + (debug ? "" : " (rerun with --debug for details)"));
            if (debug) {
                ex.printStackTrace(err);
            }
            err.flush();
            return ExitCodes.INTERNAL;
        });
        int code;
        try {
            code = cl.execute(filtered);
        } catch (OutOfMemoryError e) {
            // Not a bug and not a file's fault alone: the input is too large for the heap given.
            err.println("accordia: out of memory (" + Runtime.getRuntime().maxMemory() / (1 << 20)
                + " MiB Java heap): raise the heap with -Xmx (ACCORDIA_JAVA_OPTS), lower --threads,"
                + " or refuse large volumes with --max-voxels");
            if (debug) {
                e.printStackTrace(err);
            }
            code = ExitCodes.INPUT;
        }
        out.flush();
        err.flush();
        return code;
    }

    /**
     * The one place where failures of the environment become one line and exit code 2 instead of
     * an internal error: an output that could not be written (full disk, no permission, a path too
     * long: {@link OutputFolder.WriteFailure} names the output folder), any other file-system
     * error (names its file and the reason), or another I/O error. Looks through wrapping
     * exceptions (worker threads wrap what they throw). Returns {@code null} for anything else.
     */
    static String environmentProblem(Throwable ex) {
        IOException io = null;
        for (Throwable t = ex; t != null; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof OutputFolder.WriteFailure w) {
                return w.getMessage();
            }
            if (t instanceof IOException e && io == null) {
                io = e;
            }
        }
        if (io instanceof java.nio.file.FileSystemException fs) {
            return (fs.getFile() == null ? "" : fs.getFile() + ": ") + (fs.getReason() != null ? fs.getReason()
                : fs.getClass().getSimpleName()) + (fs.getOtherFile() == null ? "" : " (" + fs.getOtherFile() + ")");
        }
        if (io != null) {
            return "input/output error: " + (io.getMessage() == null ? io.getClass().getSimpleName() : io.getMessage());
        }
        return null;
    }

    /**
     * For an unknown option, the command's visible options within a Levenshtein distance of 2
     * (Apache Commons Text), nearest first, as "Did you mean --threads?"; {@code null} when the
     * error is not an unknown option or nothing is that near (picocli's own suggestions, which only
     * look at options sharing the first two letters, are printed then).
     */
    static String suggestion(CommandLine.ParameterException ex) {
        if (!(ex instanceof CommandLine.UnmatchedArgumentException u) || !u.isUnknownOption()
                || u.getUnmatched().isEmpty()) {
            return null;
        }
        String typed = u.getUnmatched().get(0);
        int eq = typed.indexOf('=');
        String name = eq > 0 ? typed.substring(0, eq) : typed;
        org.apache.commons.text.similarity.LevenshteinDistance distance =
            new org.apache.commons.text.similarity.LevenshteinDistance(2);
        java.util.TreeMap<Integer, java.util.TreeSet<String>> byDistance = new java.util.TreeMap<>();
        for (CommandLine.Model.OptionSpec o : u.getCommandLine().getCommandSpec().options()) {
            if (o.hidden()) {
                continue;
            }
            for (String candidate : o.names()) {
                int d = distance.apply(name, candidate);
                if (d >= 0 && candidate.length() > 2) {
                    byDistance.computeIfAbsent(d, k -> new java.util.TreeSet<>()).add(candidate);
                }
            }
        }
        if (byDistance.isEmpty()) {
            return null;
        }
        return "Did you mean " + String.join(" or ", byDistance.firstEntry().getValue()) + "?";
    }

    public static void main(String[] args) {
        System.setProperty("java.awt.headless", "true");
        PrintWriter out = new PrintWriter(System.out, true, java.nio.charset.StandardCharsets.UTF_8);
        PrintWriter err = new PrintWriter(System.err, true, java.nio.charset.StandardCharsets.UTF_8);
        System.exit(execute(out, err, args));
    }
}
