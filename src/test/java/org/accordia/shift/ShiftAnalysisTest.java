package org.accordia.shift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;

/**
 * End to end on an invented study ("Lakeside liver-lesion pilot"): 3 centres x 3 readers, 12
 * cases. Each reader's boundary is summarised by an effective radius in mm: case radius + centre
 * offset + reader bias + noise; pairwise distances are |r_i - r_j| mm; the signed surface
 * distance against the other centres' consensus is r_i minus the mean radius of the other centres'
 * readers; volume ratio is the cube of the radius ratio.
 */
class ShiftAnalysisTest {
    static final List<String> CENTRES = List.of("harbour", "hill", "meadow");

    static LabelShiftInput study(double harbourOffsetMm, long seed) {
        Random random = new Random(seed);
        Map<String, String> centreOf = new TreeMap<>();
        Map<String, Double> bias = new TreeMap<>();
        for (String c : CENTRES) {
            for (int r = 1; r <= 3; r++) {
                String id = c.substring(0, 2) + r;
                centreOf.put(id, c);
                bias.put(id, 0.2 * random.nextGaussian());
            }
        }
        List<CaseDistances> distances = new ArrayList<>();
        List<ReaderCaseMeasure> measures = new ArrayList<>();
        List<ReaderCaseMeasure> common = new ArrayList<>();
        List<ReaderMeasure> variance = new ArrayList<>();
        List<CaseSummary> summaries = new ArrayList<>();
        for (int k = 0; k < 12; k++) {
            String caseId = String.format("lk%02d", k + 1);
            double radius = 15 + 3 * random.nextGaussian();
            List<String> readers = new ArrayList<>(centreOf.keySet());
            if (k == 3) {
                readers.remove("hi2"); // a missing mask
            }
            Map<String, Double> r = new TreeMap<>();
            for (String id : readers) {
                double offset = centreOf.get(id).equals("harbour") ? harbourOffsetMm : 0;
                r.put(id, radius + offset + bias.get(id) + 0.3 * random.nextGaussian());
            }
            double[][] d = new double[readers.size()][readers.size()];
            for (int i = 0; i < readers.size(); i++) {
                for (int j = 0; j < readers.size(); j++) {
                    d[i][j] = Math.abs(r.get(readers.get(i)) - r.get(readers.get(j)));
                }
            }
            distances.add(new CaseDistances(caseId, readers, d));
            for (String id : readers) {
                double others = r.entrySet().stream().filter(e -> !centreOf.get(e.getKey()).equals(centreOf.get(id)))
                        .mapToDouble(Map.Entry::getValue).average().orElseThrow();
                double signed = r.get(id) - others;
                measures.add(new ReaderCaseMeasure(id, centreOf.get(id), caseId, signed, Math.pow(r.get(id) / others, 3)));
                // the common reference of the case: the mean radius of all its readers
                double all = r.values().stream().mapToDouble(Double::doubleValue).average().orElseThrow();
                common.add(new ReaderCaseMeasure(id, centreOf.get(id), caseId, r.get(id) - all,
                        Math.pow(r.get(id) / all, 3)));
                variance.add(new ReaderMeasure(caseId, centreOf.get(id), id, r.get(id)));
            }
            summaries.add(new CaseSummary(caseId, k == 5 ? 0.6 : 0.85, 4.0, 0, readers.size()));
        }
        return new LabelShiftInput(1, "lesion", "|radius difference| (mm)", centreOf, distances, measures, measures,
                common, "effective radius (mm)", variance, summaries, null);
    }

    static final ShiftSettings FAST = ShiftSettings.defaults().withResampling(999, 500, 20, 0);

    @Test
    void strongOutsideShiftAtOneCentreIsReAnnotate() throws Exception {
        LabelShiftReport report = ShiftAnalysis.analyse(study(2.0, 1), FAST);
        LabelShiftSummary s = report.summary();
        assertEquals(Verdict.RE_ANNOTATE, s.verdict());
        assertEquals("centre-shift", s.rule());
        // One-vs-rest contrasts: the two other centres sit 1 mm inside a consensus that includes
        // harbour's readers. This test used to allow them to be flagged too (on the inside); that
        // was the mirror defect. Their own centre-vs-rest tests do not reject: harbour only.
        assertEquals(List.of("harbour"), s.shift().flaggedCentres());
        for (CentreRow row : report.centreRows()) {
            if (!row.centre().equals("harbour")) {
                assertEquals("none", row.flag(), row.toString());
                assertTrue(row.signedSurfaceMm() < -0.5, "centres.csv keeps the raw mirror effect: " + row);
            }
        }
        assertTrue(s.shift().exact());
        assertEquals(280, s.shift().permutations());
        assertTrue(s.shift().pValue() <= 0.05);
        assertTrue(s.reasons().get(0).startsWith("Centre harbour draws "), s.reasons().get(0));
        assertTrue(s.reasons().get(0).contains("outside the other centres"), s.reasons().get(0));
        assertTrue(s.reasons().get(0).contains("its own test against the other centres' readers gives p = 0.0119"),
                s.reasons().get(0));
        // harbour's split is the most extreme of C(9, 3) = 84; Holm over 3 centres: 3/84
        CentreVsRest.Result own = report.centreFindings().of("harbour").test();
        assertEquals(1.0 / 84, own.pValue(), 1e-12);
        assertEquals(3.0 / 84, own.adjustedP(), 1e-12);
        assertEquals(84, own.permutations());
        for (CentreFindings.Finding f : report.centreFindings().findings()) {
            if (!f.centre().equals("harbour")) {
                assertTrue(f.test().adjustedP() > 0.05, f.toString());
            }
        }
        assertEquals(List.of("lk06"), s.casesToAdjudicate().stream().map(CaseToAdjudicate::caseId).toList());
        assertEquals(List.of("case", "centre", "reader", "residual"), new ArrayList<>(s.varianceComponents().keySet()));
        assertTrue(s.shift().betweenShare() > 0.5, "between-centre share " + s.shift().betweenShare());
        CentreRow harbour = report.centreRows().get(0);
        assertEquals("harbour", harbour.centre());
        assertEquals("shift", harbour.flag());
        assertTrue(harbour.signedSurfaceLoMm() > 1.0);
        assertTrue(harbour.volumeRatio() > 1.15);
        // the judged effect: planted 2.0 mm against the mean of the other centres
        assertTrue(harbour.effectLoMm() > 1.0 && harbour.effectLoMm() < 2.0 && harbour.effectHiMm() > 2.0,
                harbour.toString());
        assertEquals("shift", harbour.finding());
        assertTrue(s.shift().notes().isEmpty() || s.shift().notes().stream().noneMatch(n -> n.contains("removed")));
    }

    @Test
    void noCentreEffectIsPool() {
        LabelShiftReport report = ShiftAnalysis.analyse(study(0.0, 2), FAST);
        LabelShiftSummary s = report.summary();
        assertTrue(s.shift().flaggedCentres().isEmpty());
        assertTrue(s.verdict() != Verdict.RE_ANNOTATE);
        if (s.verdict() == Verdict.POOL) {
            assertEquals("no-shift", s.rule());
            assertTrue(s.reasons().get(0).startsWith("No centre shift"), s.reasons().get(0));
        }
        assertTrue(report.centreRows().stream().allMatch(r -> !r.flag().equals("shift")));
    }

    @Test
    void jsonAndCsvAreDeterministicAndInTheDocumentedShape() throws Exception {
        ObjectMapper mapper = new ObjectMapper();
        LabelShiftInput in = study(2.0, 1);
        String a = mapper.writeValueAsString(ShiftAnalysis.analyse(in, FAST).summary());
        String b = mapper.writeValueAsString(ShiftAnalysis.analyse(in, FAST).summary());
        assertEquals(a, b, "same input and seed, same JSON");
        JsonNode root = mapper.readTree(a);
        List<String> top = new ArrayList<>();
        root.fieldNames().forEachRemaining(top::add);
        assertEquals(List.of("label", "name", "shift", "variance_measure", "variance_components",
                "variance_interval_method", "centre_variance_test", "icc", "verdict", "rule", "reasons",
                "cases_to_adjudicate", "readers_to_recalibrate", "design_limitations", "empty_groups",
                "masks_to_correct"), top);
        JsonNode shift = root.get("shift");
        for (String f : List.of("between_share", "pseudo_f", "p_value", "permutations", "exact", "min_p", "flagged_centres")) {
            assertNotNull(shift.get(f), f);
        }
        assertEquals("re-annotate", root.get("verdict").asText());
        assertEquals("harbour", shift.get("flagged_centres").get(0).asText());
        JsonNode caseComponent = root.get("variance_components").get("case");
        Iterator<String> fields = caseComponent.fieldNames();
        assertEquals("estimate", fields.next());
        assertEquals("lower", fields.next());
        assertEquals("upper", fields.next());
        assertTrue(root.get("centre_variance_test").get("method").asText().contains("chi2"));
        assertEquals("lk06", root.get("cases_to_adjudicate").get(0).get("case").asText());
    }

    @Test
    void nanIsWrittenAsNull() throws Exception {
        // Two readers of one centre only: no between-centre part, the permutation test is not applicable.
        Map<String, String> centreOf = Map.of("a", "solo", "b", "solo");
        LabelShiftInput in = new LabelShiftInput(2, "cyst", "1 - Jaccard", centreOf,
                List.of(new CaseDistances("k1", List.of("a", "b"), new double[][] {{0, 0.2}, {0.2, 0}})),
                List.of(), List.of(), List.of(), "none", List.of(), List.of(new CaseSummary("k1", 0.9, 2, 0, 2)), null);
        LabelShiftReport report = ShiftAnalysis.analyse(in, FAST);
        JsonNode root = new ObjectMapper().readTree(new ObjectMapper().writeValueAsString(report.summary()));
        assertTrue(root.get("shift").get("p_value").isNull());
        assertTrue(root.get("shift").get("pseudo_f").isNull());
        assertNull(report.varianceComponents());
        assertEquals("pool", root.get("verdict").asText());
    }
}
