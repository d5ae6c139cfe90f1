package org.accordia.cli;

import java.io.PrintWriter;
import java.io.StringWriter;

/** One in-process run of the command line, with what it printed (tests). */
record CliRun(int code, String out, String err) {

    static CliRun of(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(new PrintWriter(out), new PrintWriter(err), args);
        return new CliRun(code, out.toString(), err.toString());
    }
}
