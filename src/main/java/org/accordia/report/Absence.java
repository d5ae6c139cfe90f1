package org.accordia.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import org.accordia.analysis.CaseRecord;
import org.accordia.analysis.FlaggedEvent;
import org.accordia.analysis.StructureCase;
import org.accordia.analysis.StudyResult;

/**
 * Structures absent from a case — no reader drew them — as their own state in every output.
 *
 * <p>Two empty masks have Dice 1 by convention, which is not agreement: a case where nobody drew
 * the structure would otherwise show as perfect agreement (median and worst Dice 1 with an
 * arbitrary worst pair), as a bar of height 0 among the cases ranked by disagreement, and as one
 * empty-mask event per reader plus an undefined-distances event. Here such a case becomes one
 * {@value FlaggedEvent#ABSENT} event per case and structure (in events.csv, summary.json and the
 * report), the tables leave its agreement cells empty and say {@value StructureCase#ABSENT}, and the
 * charts mark it apart.
 */
final class Absence {
    private Absence() {
    }

    /** Per structure (protocol order), the cases in which no reader drew it, in case order. */
    static Map<String, List<String>> absentCases(StudyResult r) {
        Map<String, List<String>> m = new java.util.LinkedHashMap<>();
        for (var s : r.structures()) {
            m.put(s.name(), new ArrayList<>());
        }
        for (CaseRecord c : r.cases()) {
            for (StructureCase sc : c.structures()) {
                if (sc.absent()) {
                    m.get(sc.structure().name()).add(c.caseId());
                }
            }
        }
        return m;
    }

    /**
     * The flagged events as the outputs show them: the analysis's events, except that for a case
     * and structure that no reader drew, its per-reader empty-mask events and its
     * undefined-distances event are replaced by one {@value FlaggedEvent#ABSENT} event. Sorted as
     * the analysis sorts its events.
     */
    static List<FlaggedEvent> events(StudyResult r) {
        Set<String> absent = new TreeSet<>();
        List<FlaggedEvent> out = new ArrayList<>();
        for (CaseRecord c : r.cases()) {
            for (StructureCase sc : c.structures()) {
                if (sc.absent()) {
                    String name = sc.structure().name();
                    absent.add(key(c.caseId(), name));
                    int n = sc.agreement().readers().size();
                    out.add(new FlaggedEvent(c.caseId(), name, "", FlaggedEvent.ABSENT, "no reader drew " + name
                        + " (" + n + " reader" + (n == 1 ? "" : "s") + ", every mask empty): absent, not agreement"));
                }
            }
        }
        for (FlaggedEvent e : r.events()) {
            boolean replaced = absent.contains(key(e.caseId(), e.label()))
                && (e.kind().equals(FlaggedEvent.EMPTY_MASK) || e.kind().equals(FlaggedEvent.UNDEFINED_DISTANCES));
            if (!replaced) {
                out.add(e);
            }
        }
        out.sort(null);
        return out;
    }

    private static String key(String caseId, String structure) {
        return caseId + "\u0000" + structure;
    }
}
