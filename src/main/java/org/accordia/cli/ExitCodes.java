package org.accordia.cli;

/** Every exit code the command line uses, in one place (documented in docs/cli.md and --help). */
public final class ExitCodes {
    /** The command completed. */
    public static final int OK = 0;
    /** An internal error (a bug): please report it with the --debug output. */
    public static final int INTERNAL = 1;
    /** Bad input or bad usage: one line on stderr names the file and the problem. */
    public static final int INPUT = 2;
    /** analyze with --fail-on: a label's verdict reached the named level. */
    public static final int VERDICT = 3;

    private ExitCodes() {
    }
}
