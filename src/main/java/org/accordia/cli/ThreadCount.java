package org.accordia.cli;

import picocli.CommandLine;

/** The one check of every command's {@code --threads}: at least 1, at most {@value #MAX}. */
final class ThreadCount {
    /**
     * The most worker threads a command starts. Far above the cores of any workstation; a larger
     * value would only start threads that wait (and each holds a case in memory), and 100,000
     * threads exhaust the operating system's limits.
     */
    static final int MAX = 256;

    private ThreadCount() {
    }

    static void check(CommandLine cl, int threads) {
        if (threads < 1 || threads > MAX) {
            throw new CommandLine.ParameterException(cl, "--threads must be between 1 and " + MAX + " (got " + threads + ")");
        }
    }
}
