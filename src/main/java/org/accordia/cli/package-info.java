/**
 * The command line: one picocli class per subcommand, option parsing, progress and printing over
 * the library ({@code run} for inspect and analyze), exit codes from one place
 * ({@link org.accordia.cli.ExitCodes}); {@link org.accordia.cli.Main} is the only place that exits
 * the JVM. Not library API; nothing depends on it.
 */
package org.accordia.cli;
