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
public final class Main implements Runnable {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        throw new CommandLine.ParameterException(spec.commandLine(), "Missing subcommand");
    }

    /** Runs the command line and returns the exit code (no System.exit; tests call this). */
    public static int execute(PrintWriter out, PrintWriter err, String... args) {
        boolean debug = Arrays.asList(args).contains("--debug");
        String[] filtered = Arrays.stream(args).filter(a -> !a.equals("--debug")).toArray(String[]::new);
        CommandLine cl = new CommandLine(new Main());
        cl.setOut(out);
        cl.setErr(err);
        cl.setExitCodeExceptionMapper(t -> t instanceof InputException || environmentProblem(t) != null
            ? ExitCodes.INPUT : ExitCodes.INTERNAL);
        cl.setParameterExceptionHandler((ex, a) -> {
            err.println("accordia: " + Messages.oneLine(ex.getMessage()));
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

    public static void main(String[] args) {
        System.setProperty("java.awt.headless", "true");
        PrintWriter out = new PrintWriter(System.out, true, java.nio.charset.StandardCharsets.UTF_8);
        PrintWriter err = new PrintWriter(System.err, true, java.nio.charset.StandardCharsets.UTF_8);
        System.exit(execute(out, err, args));
    }
}
