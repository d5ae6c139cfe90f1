package org.accordia.cli;

import java.io.PrintStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.StudyResult;
import org.accordia.report.AnalysisReport;
import org.accordia.report.OutputFolder;
import org.accordia.run.PreparedStudy;
import org.accordia.run.StudyRun;
import org.accordia.shift.Verdict;
import org.accordia.study.Protocol;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code accordia analyze}: one command from a study folder to the decision and its report. */
@Command(
    name = "analyze",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Analyses a study and decides per structure: pool, review or re-annotate.",
        "Measures the agreement of every reader pair, estimates the STAPLE consensus with each reader's "
            + "performance, and splits the disagreement within and between centres with a permutation test.",
        "Writes report.html, pairs.csv, readers.csv, centres.csv, cases.csv, reader_summary.csv, "
            + "events.csv, summary.json and the consensus masks (consensus/) into the output folder "
            + "(docs/outputs.md). Inputs are never written."
    },
    exitCodeListHeading = "%nExit codes:%n",
    exitCodeList = {
        "0:completed",
        "1:internal error (a bug; rerun with --debug and report it)",
        "2:bad input or usage (one line names the file and the problem)",
        "3:--fail-on: a structure's verdict reached the named level"
    })
public final class AnalyzeCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "STUDY",
        description = "Study folder (<centre>/<reader>/<case>.<ext>, or holding manifest.csv) or a manifest CSV file.")
    Path study;

    @Option(names = "--protocol", paramLabel = "FILE",
        description = "Protocol file (YAML, docs/protocol.md). Default: <study>/protocol.yaml when present, "
            + "else built-in defaults with one structure per label value present.")
    Path protocolFile;

    @Option(names = "--out", paramLabel = "DIR",
        description = "Output folder; created when missing; refused when not empty unless --force "
            + "(default: ${DEFAULT-VALUE} in the working folder).")
    Path out = Path.of("accordia-report");

    @Option(names = "--threads", paramLabel = "N",
        description = "Cases analysed in parallel, and the most cases in memory at once; results do not depend "
            + "on it (default: all cores, here ${DEFAULT-VALUE}).")
    int threads = Math.max(1, Runtime.getRuntime().availableProcessors());

    @Option(names = "--seed", paramLabel = "N",
        description = "Seed of every random generator (permutations, bootstrap); overrides the protocol's seed "
            + "(default: the protocol's, itself " + Protocol.DEFAULT_SEED + " by default).")
    Long seed;

    @Option(names = "--force",
        description = "Write into a non-empty output folder: the previous report.html and summary.json are "
            + "removed first, other files are replaced (default: refused).")
    boolean force;

    @Option(names = "--quiet", description = "No progress on standard error (default: progress shown).")
    boolean quiet;

    @Option(names = "--fail-on", paramLabel = "LEVEL",
        description = "Exit with code 3 when a structure's verdict is at least LEVEL: review or re-annotate "
            + "(default: exit 0 whatever the verdict).")
    String failOn;

    @CommandLine.Mixin
    ReadOptions read = new ReadOptions();

    @Override
    public Integer call() throws Exception {
        ThreadCount.check(spec.commandLine(), threads);
        read.check(spec.commandLine());
        Verdict failLevel = null;
        if (failOn != null) {
            failLevel = switch (failOn) {
                case "review" -> Verdict.REVIEW;
                case "re-annotate" -> Verdict.RE_ANNOTATE;
                default -> throw new CommandLine.ParameterException(spec.commandLine(),
                    "--fail-on takes review or re-annotate, not '" + failOn + "'");
            };
        }
        PreparedStudy prepared = StudyRun.prepare(read.request(study, protocolFile).withSeed(seed));
        StudyRun.requireAnalysable(prepared);
        PrintWriter err = spec.commandLine().getErr();
        long t0 = System.nanoTime();
        StudyRun.Outcome outcome;
        try (PrintStream progressStream = new PrintStream(new WriterStream(err), true, StandardCharsets.UTF_8);
             Progress progress = Progress.create(prepared.study().cases().size(), quiet, progressStream)) {
            try {
                outcome = StudyRun.analyze(prepared, out, force, threads, VersionProvider.version(),
                    AnalysisReport.Run.commandLine("accordia", spec.commandLine().getParseResult().originalArgs()),
                    new StudyRun.Listener() {
                        @Override
                        public void caseDone() {
                            progress.step();
                        }

                        @Override
                        public void casesDone() {
                            progress.close();
                        }
                    });
            } catch (Exception | Error e) {
                progress.abandon(); // the error's one line is all a failed run prints
                throw e;
            }
        }
        double seconds = (System.nanoTime() - t0) / 1e9;
        StudyResult result = outcome.result();
        PrintWriter w = spec.commandLine().getOut();
        for (LabelResult l : result.labels()) {
            w.printf(Locale.ROOT, "%s: %s (%s)%n", l.name(), l.summary().verdict().word(), l.summary().rule());
        }
        w.printf(Locale.ROOT, "Report: %s (%d cases in %.1f s)%n", outcome.folder().resolve(OutputFolder.REPORT_HTML),
            result.cases().size(), seconds);
        w.flush();
        if (failLevel != null && result.worstVerdict().ordinal() >= failLevel.ordinal()) {
            return ExitCodes.VERDICT;
        }
        return ExitCodes.OK;
    }
}
