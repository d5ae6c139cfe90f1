package org.accordia.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.accordia.report.InspectionText;
import org.accordia.run.PreparedStudy;
import org.accordia.run.StudyRun;
import org.accordia.study.InspectionReport;
import org.accordia.study.StudyProblem;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code accordia inspect}: checks a study and prints its roster, grids, missing masks and problems. */
@Command(
    name = "inspect",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Checks a study without analysing it; nothing is written.",
        "Lists centres, readers, cases, the labels seen, each case's grid, the missing masks and every "
            + "problem found. Exit 0 when the study can be analysed, 2 when it cannot (no case, fewer than "
            + "two readers, an unreadable mask, a grid mismatch within a case)."
    },
    exitCodeListHeading = "%nExit codes:%n",
    exitCodeList = {
        "0:the study can be analysed (warnings and notes may be listed)",
        "1:internal error (a bug; rerun with --debug)",
        "2:the study cannot be analysed as it is, or bad usage"
    })
public final class InspectCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "STUDY",
        description = "Study folder (<centre>/<reader>/<case>.<ext>, or holding manifest.csv) or a manifest CSV file.")
    Path study;

    @Option(names = "--protocol", paramLabel = "FILE",
        description = "Protocol file (YAML, docs/protocol.md). Default: <study>/protocol.yaml when present, "
            + "else built-in defaults with one structure per label value present (as analyze).")
    Path protocolFile;

    @CommandLine.Mixin
    ReadOptions read = new ReadOptions();

    @Option(names = "--threads", paramLabel = "N",
        description = "Cases read in parallel, one mask per thread in memory at a time (default: ${DEFAULT-VALUE}).")
    int threads = Math.max(1, Math.min(4, Runtime.getRuntime().availableProcessors()));

    @Override
    public Integer call() throws Exception {
        ThreadCount.check(spec.commandLine(), threads);
        read.check(spec.commandLine());
        PreparedStudy prepared = StudyRun.prepare(read.request(study, protocolFile));
        InspectionReport report = StudyRun.inspect(prepared, threads);
        PrintWriter out = spec.commandLine().getOut();
        out.print(InspectionText.format(report, prepared.protocolSource().words()));
        out.print(InspectionText.designWarnings(report, prepared.protocol()));
        out.flush();
        if (!report.analysable()) {
            PrintWriter err = spec.commandLine().getErr();
            err.println("accordia: " + study + ": the study cannot be analysed as it is ("
                + report.count(StudyProblem.Severity.ERROR) + " error(s), listed above)");
            err.flush();
            return ExitCodes.INPUT;
        }
        return ExitCodes.OK;
    }
}
