package org.accordia.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Collectors;
import org.accordia.io.Geometry;
import org.accordia.shift.DesignLimit;
import org.accordia.shift.DesignLimits;
import org.accordia.shift.ShiftSettings;
import org.accordia.study.CaseReader;
import org.accordia.study.InspectionReport;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;
import org.accordia.study.StudyProblem;

/**
 * The words of {@code accordia inspect}: the plain-text inspection report (roster, grids, labels,
 * missing masks, problems, each long list capped with its count) and the design warnings (what a
 * roster cannot answer, in the same sentences as the report's decision). Deterministic.
 */
public final class InspectionText {
    private InspectionText() {
    }

    /** The plain-text report (deterministic; one section per topic). */
    public static String format(InspectionReport r, String protocolWords) {
        StringBuilder b = new StringBuilder();
        if (r.studyName() != null) {
            b.append("Study: ").append(r.studyName()).append('\n');
        }
        b.append("Root: ").append(r.root()).append('\n');
        b.append("Described by: ").append(r.manifest() == null ? "folder layout" : "manifest " + r.manifest()).append('\n');
        b.append("Protocol: ").append(protocolWords).append('\n');
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
    public static String designWarnings(InspectionReport r, Protocol protocol) {
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
