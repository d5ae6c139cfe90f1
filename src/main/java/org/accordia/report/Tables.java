package org.accordia.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.PairMetrics;
import org.accordia.analysis.CaseRecord;
import org.accordia.analysis.FlaggedEvent;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.StructureCase;
import org.accordia.analysis.StudyResult;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.consensus.ReaderSummary;
import org.accordia.shift.CaseToAdjudicate;
import org.accordia.shift.CentreRow;
import org.accordia.study.ReaderId;

import static org.accordia.report.CsvTable.integer;
import static org.accordia.report.CsvTable.number;
import static org.accordia.report.CsvTable.text;

/**
 * The one place where result records become CSV tables: every name from input is a text cell
 * (neutralised against formula injection when written), every measurement a number cell (the one
 * number format, {@link Numbers#format}), every count an integer cell. Undefined values (NaN,
 * infinities) are empty cells. Rows are sorted by case, label (protocol order) and reader (centre,
 * then name); the column lists are documented in docs/outputs.md.
 */
public final class Tables {
    /** Columns of pairs.csv. */
    public static final List<String> PAIRS = List.of("case", "label", "reader_a", "centre_a", "reader_b",
        "centre_b", "dice", "jaccard", "volume_a_ml", "volume_b_ml", "hd_mm", "hd95_mm", "assd_mm", "nsd", "flag");
    /** Columns of readers.csv. */
    public static final List<String> READERS = List.of("case", "label", "reader", "centre", "sensitivity",
        "specificity", "dice_vs_consensus", "volume_ml", "volume_ratio", "signed_surface_mm", "reference",
        "border_outside_share", "border_inside_share");
    /** Columns of centres.csv. */
    public static final List<String> CENTRES = List.of("label", "centre", "readers", "cases", "signed_surface_mm",
        "signed_surface_lo", "signed_surface_hi", "volume_ratio", "volume_ratio_lo", "volume_ratio_hi", "flag",
        "effect_mm", "effect_lo_mm", "effect_hi_mm", "effect_volume_ratio", "effect_volume_ratio_lo",
        "effect_volume_ratio_hi", "test_p", "test_p_holm", "test_min_p", "test_splits", "finding",
        "border_outside_share", "border_outside_excess", "border_outside_excess_lo", "border_outside_excess_hi",
        "border_inside_share", "border_inside_excess", "border_inside_excess_lo", "border_inside_excess_hi");
    /** Columns of cases.csv. */
    public static final List<String> CASES = List.of("case", "label", "readers_present", "readers_missing",
        "mean_dice", "median_dice", "worst_reader_a", "worst_reader_b", "worst_dice", "max_hd95_mm", "fleiss_kappa",
        "flags", "adjudication_reason", "state", "readers_drawing", "masks_to_correct");
    /** Columns of reader_summary.csv. */
    public static final List<String> READER_SUMMARY = List.of("label", "reader", "centre", "reference", "cases",
        "resamples", "sensitivity", "sensitivity_lo", "sensitivity_hi", "specificity", "specificity_lo",
        "specificity_hi", "dice_vs_consensus", "dice_lo", "dice_hi", "signed_surface_mm", "signed_surface_lo_mm",
        "signed_surface_hi_mm", "volume_ratio_geomean", "volume_ratio_lo", "volume_ratio_hi");
    /** Columns of events.csv. */
    public static final List<String> EVENTS = List.of("case", "label", "reader", "kind", "detail");

    private Tables() {
    }

    /** One row per case, label and reader pair. */
    public static CsvTable pairs(StudyResult r) {
        CsvTable t = new CsvTable(PAIRS);
        for (CaseRecord c : r.cases()) {
            for (StructureCase sc : c.structures()) {
                for (PairMetrics p : sc.agreement().pairs()) {
                    t.addRow(pairRow(p));
                }
            }
        }
        return t;
    }

    /** The pairs.csv row of one pair. */
    public static List<CsvTable.Cell> pairRow(PairMetrics p) {
        return List.of(text(p.caseId()), text(p.label()), text(p.readerA()), text(p.centreA()), text(p.readerB()),
            text(p.centreB()), number(p.dice()), number(p.jaccard()), number(p.volumeAMl()), number(p.volumeBMl()),
            number(p.hdMm()), number(p.hd95Mm()), number(p.assdMm()), number(p.nsd()), text(p.flag()));
    }

    /** One row per case, label, reference and reader. */
    public static CsvTable readers(StudyResult r) {
        CsvTable t = new CsvTable(READERS);
        for (CaseRecord c : r.cases()) {
            for (StructureCase sc : c.structures()) {
                for (ReaderPerformance p : sc.performance()) {
                    t.addRow(readerRow(p));
                }
            }
        }
        return t;
    }

    /** The readers.csv row of one reader against one reference. */
    public static List<CsvTable.Cell> readerRow(ReaderPerformance p) {
        return List.of(text(p.caseId()), text(p.label()), text(p.reader()), text(p.centre()), number(p.sensitivity()),
            number(p.specificity()), number(p.diceVsConsensus()), number(p.volumeMl()), number(p.volumeRatio()),
            number(p.signedSurfaceMm()), text(p.reference()),
            number(p.border() == null ? Double.NaN : p.border().outsideShare()),
            number(p.border() == null ? Double.NaN : p.border().insideShare()));
    }

    /** One row per label and centre. */
    public static CsvTable centres(StudyResult r) {
        CsvTable t = new CsvTable(CENTRES);
        for (LabelResult l : r.labels()) {
            for (CentreRow c : l.shift().centreRows()) {
                t.addRow(centreRow(c));
            }
        }
        return t;
    }

    /** The centres.csv row of one centre. */
    public static List<CsvTable.Cell> centreRow(CentreRow c) {
        return List.of(text(c.label()), text(c.centre()), integer(c.readers()), integer(c.cases()),
            number(c.signedSurfaceMm()), number(c.signedSurfaceLoMm()), number(c.signedSurfaceHiMm()),
            number(c.volumeRatio()), number(c.volumeRatioLo()), number(c.volumeRatioHi()), text(c.flag()),
            number(c.effectMm()), number(c.effectLoMm()), number(c.effectHiMm()), number(c.effectVolumeRatio()),
            number(c.effectVolumeRatioLo()), number(c.effectVolumeRatioHi()), number(c.testP()),
            number(c.testPAdjusted()), number(c.testMinP()), integer(c.testPermutations()), text(c.finding()),
            number(c.outsideShare()), number(c.outsideExcess()), number(c.outsideExcessLo()),
            number(c.outsideExcessHi()), number(c.insideShare()), number(c.insideExcess()),
            number(c.insideExcessLo()), number(c.insideExcessHi()));
    }

    /** One row per case and label. */
    public static CsvTable cases(StudyResult r) {
        CsvTable t = new CsvTable(CASES);
        List<Map<String, CaseToAdjudicate>> adjudicate = new ArrayList<>();
        List<Map<String, List<String>>> corrections = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            Map<String, CaseToAdjudicate> m = new TreeMap<>();
            l.summary().casesToAdjudicate().forEach(a -> m.put(a.caseId(), a));
            adjudicate.add(m);
            Map<String, List<String>> fix = new TreeMap<>();
            l.summary().masksToCorrect().forEach(f -> fix.computeIfAbsent(f.caseId(), k -> new ArrayList<>())
                .add(f.reader() + "=" + f.kind().key()));
            corrections.add(fix);
        }
        for (CaseRecord c : r.cases()) {
            List<String> missing = new ArrayList<>();
            for (ReaderId reader : r.readers()) {
                if (!c.readers().contains(reader)) {
                    missing.add(reader.label());
                }
            }
            for (int s = 0; s < c.structures().size(); s++) {
                StructureCase sc = c.structures().get(s);
                CaseAgreement ca = sc.agreement();
                PairMetrics worst = sc.worstPair();
                CaseToAdjudicate adj = adjudicate.get(s).get(c.caseId());
                boolean absent = sc.absent(); // no reader drew it: no agreement to report, not Dice 1
                t.addRow(text(c.caseId()), text(sc.structure().name()), integer(c.readers().size()),
                    text(String.join(" ", missing)), number(absent ? Double.NaN : ca.meanDice()),
                    number(absent ? Double.NaN : ca.medianDice()),
                    text(worst == null ? "" : worst.centreA() + "/" + worst.readerA()),
                    text(worst == null ? "" : worst.centreB() + "/" + worst.readerB()),
                    number(worst == null ? Double.NaN : worst.dice()), number(sc.maxHd95Mm()),
                    number(ca.fleissKappa()), text(flags(c, sc)),
                    text(adj == null ? "" : String.join("; ", adj.reasons())), text(sc.state()),
                    integer(sc.readersDrawing()),
                    text(String.join(" ", corrections.get(s).getOrDefault(c.caseId(), List.of()))));
            }
        }
        return t;
    }

    /** The flags of one case and label, ";"-separated, in a fixed order (empty when none). */
    static String flags(CaseRecord c, StructureCase sc) {
        if (sc.absent()) {
            return StructureCase.ABSENT; // one flag, not an empty mask per reader and every pair
        }
        CaseAgreement ca = sc.agreement();
        List<String> f = new ArrayList<>();
        List<String> empty = new ArrayList<>();
        for (int j = 0; j < ca.readers().size(); j++) {
            if (ca.voxelCounts().get(j) == 0) {
                empty.add(ca.centres().get(j) + "/" + ca.readers().get(j));
            }
        }
        if (!empty.isEmpty()) {
            f.add("empty_mask=" + String.join(" ", empty));
        }
        if (ca.oneEmptyPairs() > 0) {
            f.add("one_empty_pairs=" + ca.oneEmptyPairs());
        }
        if (ca.bothEmptyPairs() > 0) {
            f.add("both_empty_pairs=" + ca.bothEmptyPairs());
        }
        List<String> missed = new ArrayList<>();
        for (int j = 0; j < sc.missedParts().size(); j++) {
            if (sc.missedParts().get(j) > 0) {
                missed.add(c.readers().get(j).label());
            }
        }
        if (!missed.isEmpty()) {
            f.add("missed_part=" + String.join(" ", missed));
        }
        return String.join(";", f);
    }

    /** One row per label, reader and reference: bootstrap summaries over cases. */
    public static CsvTable readerSummary(StudyResult r) {
        CsvTable t = new CsvTable(READER_SUMMARY);
        for (LabelResult l : r.labels()) {
            for (ReaderSummary s : l.readerSummaries()) {
                t.addRow(text(s.label()), text(s.reader()), text(s.centre()), text(s.reference()), integer(s.cases()),
                    integer(s.resamples()), number(s.meanSensitivity()), number(s.sensitivityLo()),
                    number(s.sensitivityHi()), number(s.meanSpecificity()), number(s.specificityLo()),
                    number(s.specificityHi()), number(s.meanDice()), number(s.diceLo()), number(s.diceHi()),
                    number(s.meanSignedSurfaceMm()), number(s.signedSurfaceLoMm()), number(s.signedSurfaceHiMm()),
                    number(s.geoMeanVolumeRatio()), number(s.volumeRatioLo()), number(s.volumeRatioHi()));
            }
        }
        return t;
    }

    /**
     * One row per flagged event (missing mask, empty mask, undefined distances), with one
     * {@code absent} row per case and structure that no reader drew ({@link Absence#events}).
     */
    public static CsvTable events(StudyResult r) {
        CsvTable t = new CsvTable(EVENTS);
        for (FlaggedEvent e : Absence.events(r)) {
            t.addRow(text(e.caseId()), text(e.label()), text(e.reader()), text(e.kind()), text(e.detail()));
        }
        return t;
    }
}
