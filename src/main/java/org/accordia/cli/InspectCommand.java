package org.accordia.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.stream.Collectors;
import org.accordia.io.Geometry;
import org.accordia.report.DecisionWords;
import org.accordia.shift.DesignLimit;
import org.accordia.shift.DesignLimits;
import org.accordia.shift.ShiftSettings;
import org.accordia.run.PreparedStudy;
import org.accordia.run.ProtocolSource;
import org.accordia.run.StudyRun;
import org.accordia.study.CaseReader;
import org.accordia.study.InspectionReport;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;
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
        out.print(format(report, prepared.protocolSource()));
        out.print(designWarnings(report, prepared.protocol()));
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

    /** The plain-text report (deterministic; one section per topic). */
    static String format(InspectionReport r, ProtocolSource protocol) {
        StringBuilder b = new StringBuilder();
        if (r.studyName() != null) {
            b.append("Study: ").append(r.studyName()).append('\n');
        }
        b.append("Root: ").append(r.root()).append('\n');
        b.append("Described by: ").append(r.manifest() == null ? "folder layout" : "manifest " + r.manifest()).append('\n');
        b.append("Protocol: ").append(protocol.words()).append('\n');
        b.append('\n');
        b.append("Centres (").append(r.centres().size()).append("), readers (").append(r.readers().size()).append("):\n");
        for (String c : r.centres()) {
            List<String> names = r.readers().stream().filter(x -> x.centre().equals(c)).map(ReaderId::reader).toList();
            b.append("  ").append(c).append(": ").append(String.join(", ", names)).append('\n');
        }
        b.append('\n');
        b.append("Cases (").append(r.cases().size()).append("):\n");
        if (!r.cases().isEmpty()) {
            List<String[]> rows = new ArrayList<>();
            rows.add(new String[] {"case", "readers", "grid (voxels)", "spacing (mm)", "image", "labels"});
            for (InspectionReport.CaseSummary c : r.cases().subList(0, Math.min(r.cases().size(), InspectionReport.LIST_CAP))) {
                Geometry g = c.geometry();
                rows.add(new String[] {
                    c.caseId(),
                    c.readers().size() + "/" + r.readers().size(),
                    g == null ? "unreadable" : g.dimsText(),
                    g == null ? "-" : spacing(g),
                    c.image() == null ? "no" : "yes",
                    c.labelVoxels().isEmpty() ? "none" : c.labelVoxels().keySet().stream().map(String::valueOf)
                        .collect(Collectors.joining(","))
                });
            }
            table(b, rows);
            more(b, r.cases().size(), "cases");
        }
        b.append('\n');
        b.append("Labels seen (voxels summed over all readable masks):\n");
        if (r.labelVoxels().isEmpty()) {
            b.append("  none\n");
        }
        for (Map.Entry<Integer, Long> e : r.labelVoxels().entrySet()) {
            b.append(String.format(Locale.ROOT, "  label %d: %d voxels%n", e.getKey(), e.getValue()));
        }
        b.append('\n');
        b.append("Structures analysed:\n");
        if (r.structures().isEmpty()) {
            b.append("  none\n");
        }
        for (Structure s : r.structures()) {
            b.append(String.format(Locale.ROOT, "  %s = labels {%s}, surface tolerance %s mm%n", s.name(),
                s.labels().stream().map(String::valueOf).collect(Collectors.joining(",")), num(s.toleranceMm())));
        }
        b.append('\n');
        b.append("Missing masks (").append(r.missingCount()).append("):");
        if (r.missing().isEmpty()) {
            b.append(" none\n");
        } else {
            b.append('\n');
            for (CaseReader m : r.missing()) {
                b.append("  ").append(m.caseId()).append(": ").append(m.reader().label()).append('\n');
            }
            more(b, r.missingCount(), "missing masks");
        }
        b.append('\n');
        b.append(String.format(Locale.ROOT, "Problems: %d error(s), %d warning(s), %d note(s)%n",
            r.count(StudyProblem.Severity.ERROR), r.count(StudyProblem.Severity.WARNING),
            r.count(StudyProblem.Severity.NOTE)));
        for (StudyProblem p : r.problems().subList(0, Math.min(r.problems().size(), InspectionReport.LIST_CAP))) {
            b.append("  ").append(p.line()).append('\n');
        }
        more(b, r.problems().size(), "problems");
        b.append('\n');
        b.append(r.analysable() ? "Result: the study can be analysed.\n" : "Result: the study cannot be analysed as it is.\n");
        return b.toString();
    }

    /**
     * What the roster cannot answer, before any analysis ({@link DesignLimits}, the same sentences
     * as the report's decision); empty when nothing is limited.
     */
    static String designWarnings(InspectionReport r, Protocol protocol) {
        Map<String, Integer> roster = new java.util.TreeMap<>();
        r.readers().forEach(x -> roster.merge(x.centre(), 1, Integer::sum));
        List<DesignLimit> limits = DesignLimits.of(roster, protocol.shift().alpha(), ShiftSettings.DEFAULT_EXACT_LIMIT,
            protocol.shift().permutations());
        if (limits.isEmpty()) {
            return "";
        }
        StringBuilder b = new StringBuilder("\nDesign warnings (what this roster cannot answer, whatever the masks show):\n");
        for (DesignLimit d : limits) {
            b.append("  warning: ").append(DecisionWords.design(d, protocol.shift().alpha())).append('\n');
        }
        return b.toString();
    }

    /** "  ... and N more <what>" when a list of {@code total} was cut at {@link InspectionReport#LIST_CAP}. */
    private static void more(StringBuilder b, long total, String what) {
        if (total > InspectionReport.LIST_CAP) {
            b.append(String.format(Locale.ROOT, "  ... and %d more %s (%d in all)%n", total - InspectionReport.LIST_CAP, what, total));
        }
    }

    private static String spacing(Geometry g) {
        return num(g.spacing(0)) + "x" + num(g.spacing(1)) + "x" + num(g.spacing(2));
    }

    private static String num(double v) {
        String s = String.format(Locale.ROOT, "%.4f", v);
        s = s.replaceAll("0+$", "");
        return s.endsWith(".") ? s.substring(0, s.length() - 1) : s;
    }

    private static void table(StringBuilder b, List<String[]> rows) {
        int[] w = new int[rows.get(0).length];
        for (String[] row : rows) {
            for (int i = 0; i < row.length; i++) {
                w[i] = Math.max(w[i], row[i].length());
            }
        }
        for (String[] row : rows) {
            StringBuilder line = new StringBuilder("  ");
            for (int i = 0; i < row.length; i++) {
                line.append(row[i]);
                if (i < row.length - 1) {
                    line.append(" ".repeat(w[i] - row[i].length() + 2));
                }
            }
            b.append(line.toString().stripTrailing()).append('\n');
        }
    }
}
