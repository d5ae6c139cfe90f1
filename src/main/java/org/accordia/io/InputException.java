package org.accordia.io;

import java.nio.file.Path;

/**
 * The one typed error for bad input: a file that is missing, truncated, malformed, inconsistent
 * with its study, or beyond a configured limit. The message always names the file (when there is
 * one) and the problem in a single line; the command line turns it into exit code 2.
 */
public class InputException extends Exception {
    private static final long serialVersionUID = 1L;

    private final transient Path file;
    private final String problem;

    public InputException(Path file, String problem) {
        this(file, problem, null);
    }

    public InputException(Path file, String problem, Throwable cause) {
        super(format(file, problem), cause);
        this.file = file;
        this.problem = problem;
    }

    /** The offending file, or {@code null} when the problem is not tied to one file. */
    public Path file() {
        return file;
    }

    /** The problem alone, without the file name. */
    public String problem() {
        return problem;
    }

    private static String format(Path file, String problem) {
        String what = problem == null ? "invalid input" : problem;
        return Messages.oneLine(file == null ? what : file + ": " + what);
    }
}
