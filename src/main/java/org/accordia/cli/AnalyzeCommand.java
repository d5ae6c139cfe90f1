package org.accordia.cli;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.accordia.analysis.AnalysisOptions;
import org.accordia.analysis.CaseSource;
import org.accordia.analysis.InputChecksums;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.StudyAnalysis;
import org.accordia.analysis.StudyResult;
import org.accordia.io.InputException;
import org.accordia.report.AnalysisReport;
import org.accordia.report.ConsensusFiles;
import org.accordia.report.OutputFolder;
import org.accordia.shift.Verdict;
import org.accordia.study.Protocol;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;
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
    /** The protocol file looked for in the study folder when --protocol is not given. */
    public static final String STUDY_PROTOCOL = "protocol.yaml";

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
        if (threads < 1) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--threads must be at least 1");
        }
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
        Study s = StudyLoader.load(study, read.loadOptions());
        String protocolSource;
        Protocol protocol;
        Path inStudy = s.root().resolve(STUDY_PROTOCOL);
        if (protocolFile != null) {
            protocol = Protocol.load(protocolFile);
            protocolSource = "the file given with --protocol (" + protocolFile.getFileName() + ")";
        } else if (Files.isRegularFile(inStudy)) {
            protocol = Protocol.load(inStudy);
            protocolSource = STUDY_PROTOCOL + " in the study folder";
        } else {
            protocol = Protocol.defaults();
            protocolSource = "built-in defaults (docs/protocol.md), one structure per label value present";
        }
        if (seed != null) {
            protocol = protocol.withSeed(seed);
        }
        protocol = read.apply(protocol);
        if (s.cases().isEmpty()) {
            throw new InputException(study, "the study has no case");
        }
        StudyGate.requireAnalysable(s);
        CaseSource source = CaseSource.ofStudy(s, protocol, read.allowOutsideRoot());
        List<Path> inputs = new java.util.ArrayList<>(source.inputFiles());
        if (protocolFile != null) {
            inputs.add(protocolFile);
        } else if (Files.isRegularFile(inStudy)) {
            inputs.add(inStudy);
        }
        Path outAbs = out.toAbsolutePath().normalize();
        for (Path p : inputs) {
            if (p.toAbsolutePath().normalize().startsWith(outAbs)) {
                throw new InputException(out, "the output folder holds input files (" + p.getFileName()
                    + "); choose an output folder outside the study");
            }
        }
        // checksums before anything is written: they name the bytes the report was made from
        List<InputChecksums.InputFile> checksums = InputChecksums.of(inputs, s.root());
        AnalysisReport.Run run = new AnalysisReport.Run(AnalysisReport.Run.utc(java.time.Instant.now()),
            AnalysisReport.Run.commandLine("accordia", spec.commandLine().getParseResult().originalArgs()),
            s.root().toAbsolutePath().normalize().toString(),
            inputs.size() > source.inputFiles().size() ? checksums.get(checksums.size() - 1) : null);
        OutputFolder folder = OutputFolder.prepare(out, force);
        PrintWriter err = spec.commandLine().getErr();
        long t0 = System.nanoTime();
        StudyResult result;
        try {
            ConsensusFiles consensus = new ConsensusFiles(folder, AnalysisReport.PICTURES);
            try (PrintStream progressStream = new PrintStream(new WriterStream(err), true, StandardCharsets.UTF_8);
                 Progress progress = Progress.create(s.cases().size(), quiet, progressStream)) {
                try {
                    result = StudyAnalysis.run(source, protocol, AnalysisOptions.defaults().withThreads(threads), consensus,
                        progress::step);
                } catch (Exception | Error e) {
                    progress.abandon(); // the error's one line is all a failed run prints
                    throw e;
                }
            }
            AnalysisReport.write(folder, result, consensus.pictures(), source,
                new AnalysisReport.RunInfo(VersionProvider.version(), checksums, protocolSource).withRun(run), threads);
        } catch (Exception | Error e) {
            // stop at the first bad input and leave nothing of this run behind (no half set of outputs)
            folder.discardThisRun();
            throw e;
        }
        double seconds = (System.nanoTime() - t0) / 1e9;
        PrintWriter w = spec.commandLine().getOut();
        for (LabelResult l : result.labels()) {
            w.printf(Locale.ROOT, "%s: %s (%s)%n", l.name(), l.summary().verdict().word(), l.summary().rule());
        }
        w.printf(Locale.ROOT, "Report: %s (%d cases in %.1f s)%n", folder.dir().resolve(OutputFolder.REPORT_HTML),
            result.cases().size(), seconds);
        w.flush();
        if (failLevel != null && result.worstVerdict().ordinal() >= failLevel.ordinal()) {
            return ExitCodes.VERDICT;
        }
        return ExitCodes.OK;
    }

    /** Bytes (UTF-8) to a PrintWriter, decoded at each flush: lets Progress write to picocli's err. */
    private static final class WriterStream extends OutputStream {
        private final PrintWriter target;
        private final ByteArrayOutputStream pending = new ByteArrayOutputStream();

        WriterStream(PrintWriter target) {
            this.target = target;
        }

        @Override
        public synchronized void write(int b) {
            pending.write(b);
        }

        @Override
        public synchronized void write(byte[] b, int off, int len) {
            pending.write(b, off, len);
        }

        @Override
        public synchronized void flush() throws IOException {
            target.write(pending.toString(StandardCharsets.UTF_8));
            pending.reset();
            target.flush();
        }

        @Override
        public void close() throws IOException {
            flush();
        }
    }
}
