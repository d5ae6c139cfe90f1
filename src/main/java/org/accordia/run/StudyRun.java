package org.accordia.run;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.List;
import org.accordia.analysis.AnalysisOptions;
import org.accordia.analysis.CaseSource;
import org.accordia.analysis.InputChecksums;
import org.accordia.analysis.StudyAnalysis;
import org.accordia.analysis.StudyResult;
import org.accordia.io.InputException;
import org.accordia.report.AnalysisReport;
import org.accordia.report.ConsensusFiles;
import org.accordia.report.OutputFolder;
import org.accordia.study.Analysability;
import org.accordia.study.InspectionReport;
import org.accordia.study.Inspector;
import org.accordia.study.LoadOptions;
import org.accordia.study.Protocol;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;
import org.accordia.study.StudyProblem;

/**
 * The one entry point of a run over a study on disk, shared by {@code inspect}, {@code analyze}
 * and the end-to-end benchmark:
 * <pre>
 * RunRequest ──prepare──▶ PreparedStudy ──inspect──▶ InspectionReport
 *                                       └─analyze──▶ StudyResult + the output folder
 * </pre>
 * <ul>
 *   <li>{@link #prepare}: discovers the study and resolves its protocol once: the file given,
 *       else the study's {@value #STUDY_PROTOCOL}, else the defaults ({@link ProtocolSource});
 *       then the overrides (seed, voxel limit).</li>
 *   <li>{@link #inspect}: reads every mask and lists every problem; the verdict "can be
 *       analysed" is {@link Analysability}'s rule.</li>
 *   <li>{@link #analyze}: the same rule, stopping at the first problem; checksums of every input
 *       before anything is written; the output folder refused when it holds an input; the
 *       analysis ({@link StudyAnalysis}) with the consensus files written per case, then the
 *       tables, summary.json and report.html; on any failure the files of this run are removed
 *       (no half set of outputs).</li>
 * </ul>
 * Simulations over studies generated in memory call {@link StudyAnalysis#run} directly: it is
 * the same analysis without files.
 */
public final class StudyRun {
    /** The protocol file looked for in the study folder when none is given. */
    public static final String STUDY_PROTOCOL = StudyLoader.PROTOCOL;

    private StudyRun() {
    }

    /** Told about the progress of {@link #analyze} (from worker threads for {@link #caseDone}). */
    public interface Listener {
        /** Listens to nothing. */
        Listener NONE = () -> { };

        /** One case is analysed. */
        void caseDone();

        /** Every case is analysed; the study level and the report follow. */
        default void casesDone() {
        }
    }

    /** What {@link #analyze} produced. */
    public record Outcome(StudyResult result, Path folder) {
    }

    /**
     * Discovers the study and resolves its protocol.
     *
     * @throws InputException the study cannot be discovered, or the protocol file is bad
     */
    public static PreparedStudy prepare(RunRequest request) throws InputException {
        Study study = StudyLoader.load(request.study(), new LoadOptions(request.allowOutsideRoot()));
        ProtocolSource source = protocolSource(request.protocolFile(), study.root());
        Protocol protocol = source.file() == null ? Protocol.defaults() : Protocol.load(source.file());
        if (request.seed() != null) {
            protocol = protocol.withSeed(request.seed());
        }
        if (request.maxVoxels() != null) {
            protocol = protocol.withMaxVoxels(request.maxVoxels());
        }
        return new PreparedStudy(study, protocol, source, request.allowOutsideRoot());
    }

    /** A study with a protocol supplied by the calling program (benchmarks, tests). */
    public static PreparedStudy prepare(Study study, Protocol protocol, boolean allowOutsideRoot) {
        return new PreparedStudy(study, protocol, new ProtocolSource(ProtocolSource.Kind.SUPPLIED, null),
            allowOutsideRoot);
    }

    /**
     * Which protocol file a run reads: {@code given} when not null, else the study's
     * {@value #STUDY_PROTOCOL} when present, else none (the defaults). A study protocol that is
     * present but not a regular file (a folder, a named pipe, a dangling link) is an error, not
     * silently skipped.
     */
    public static ProtocolSource protocolSource(Path given, Path studyRoot) throws InputException {
        if (given != null) {
            return new ProtocolSource(ProtocolSource.Kind.GIVEN, given);
        }
        Path inStudy = studyRoot.resolve(STUDY_PROTOCOL);
        if (!Files.exists(inStudy, LinkOption.NOFOLLOW_LINKS)) {
            return new ProtocolSource(ProtocolSource.Kind.DEFAULTS, null);
        }
        if (!Files.isRegularFile(inStudy)) {
            throw new InputException(inStudy, "the study's protocol file is not a regular file");
        }
        return new ProtocolSource(ProtocolSource.Kind.STUDY, inStudy);
    }

    /** Reads every mask and lists every problem ({@link Inspector}); nothing is written. */
    public static InspectionReport inspect(PreparedStudy p, int threads) {
        return Inspector.inspect(p.study(), p.protocol(), p.protocol().readLimits(p.allowOutsideRoot()), threads);
    }

    /** Throws the first problem that stops an analysis before any mask is read ({@link Analysability}). */
    public static void requireAnalysable(PreparedStudy p) throws InputException {
        List<StudyProblem> blockers = Analysability.beforeReading(p.study());
        if (!blockers.isEmpty()) {
            throw new InputException(blockers.get(0).file(), blockers.get(0).message());
        }
    }

    /**
     * Analyses the study and writes every output into {@code out}.
     *
     * @param out the output folder (created when missing)
     * @param force write into a non-empty output folder
     * @param threads cases analysed in parallel (and the most cases in memory at once)
     * @param version the tool's version, written into the outputs
     * @param listener told about progress
     * @throws InputException bad input (nothing of this run is left behind)
     * @throws IOException the outputs cannot be written (nothing of this run is left behind)
     */
    public static Outcome analyze(PreparedStudy p, Path out, boolean force, int threads, String version,
            Listener listener) throws InputException, IOException {
        return analyze(p, out, force, threads, version, null, listener);
    }

    /**
     * As {@link #analyze(PreparedStudy, Path, boolean, int, String, Listener)}, with the command line
     * that started the run ({@code null} when a program did), shown in the report's Run section
     * with the start time, the study folder and the protocol file's SHA-256.
     */
    public static Outcome analyze(PreparedStudy p, Path out, boolean force, int threads, String version,
            String commandLine, Listener listener) throws InputException, IOException {
        String started = AnalysisReport.Run.utc(java.time.Instant.now());
        requireAnalysable(p);
        CaseSource source = p.caseSource();
        List<Path> inputs = p.inputFiles(source);
        // on real paths: --out given as a link to the study, or inside it, is refused
        OutputFolder.requireOutsideStudy(out, p.study().root(), inputs);
        // checksums before anything is written: they name the bytes the report was made from (the
        // bytes the readers read, never more: a valid header followed by a 100 GB tail is quick)
        List<InputChecksums.InputFile> checksums = InputChecksums.of(inputs, p.study().root(),
            p.protocol().readLimits(p.allowOutsideRoot()));
        OutputFolder folder = OutputFolder.prepare(out, force);
        try {
            ConsensusFiles consensus = new ConsensusFiles(folder, AnalysisReport.PICTURES);
            StudyResult result = StudyAnalysis.run(source, p.protocol(), AnalysisOptions.defaults().withThreads(threads),
                consensus, listener::caseDone);
            listener.casesDone();
            AnalysisReport.Run run = new AnalysisReport.Run(started, commandLine,
                p.study().root().toAbsolutePath().normalize().toString(),
                p.protocolSource().file() != null ? checksums.get(checksums.size() - 1) : null);
            AnalysisReport.write(folder, result, consensus.pictures(),
                new AnalysisReport.RunInfo(version, checksums, p.protocolSource().words(),
                    p.protocolSource().info(p.study().root())).withRun(run), threads);
            return new Outcome(result, folder.dir());
        } catch (Exception | Error e) {
            // stop at the first bad input and leave nothing of this run behind (no half set of outputs)
            folder.discardThisRun();
            throw e;
        }
    }
}
