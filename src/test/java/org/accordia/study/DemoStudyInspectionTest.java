package org.accordia.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.accordia.io.ReadLimits;
import org.junit.jupiter.api.Test;

/**
 * The committed demo study inspected by Accordia against the same files read by nibabel
 * (Debian python3-nibabel): fixtures/study/demo_label_counts.py made demo_label_counts.csv.
 */
class DemoStudyInspectionTest {
    static final Path FIXTURE = Path.of("src/test/resources/fixtures/study/demo_label_counts.csv");

    /** case -> label -> voxels summed over readers; and "case/centre/reader" -> label -> voxels. */
    static Map<String, TreeMap<Integer, Long>> perCase = new TreeMap<>();
    static Map<String, TreeMap<Integer, Long>> perMask = new HashMap<>();
    static Map<String, String> spacing = new HashMap<>();

    @org.junit.jupiter.api.BeforeAll
    static void readFixture() throws Exception {
        List<String> lines = Files.readAllLines(FIXTURE);
        for (String line : lines.subList(1, lines.size())) {
            String[] f = line.split(",");
            int label = Integer.parseInt(f[5]);
            long n = Long.parseLong(f[6]);
            perCase.computeIfAbsent(f[0], k -> new TreeMap<>()).merge(label, n, Long::sum);
            perMask.computeIfAbsent(f[0] + "/" + f[1] + "/" + f[2], k -> new TreeMap<>()).merge(label, n, Long::sum);
            spacing.put(f[0], f[3] + " " + f[4]);
        }
    }

    @Test
    void inspectionAgreesWithNibabel() throws Exception {
        Study s = StudyLoader.load(Path.of("demo-masks"), LoadOptions.DEFAULT);
        Protocol p = Protocol.load(Path.of("protocols/demo.yaml"));
        InspectionReport r = Inspector.inspect(s, p, ReadLimits.DEFAULT, 2);
        assertTrue(r.analysable(), r.problems().toString());
        assertEquals(10, r.cases().size());
        TreeMap<Integer, Long> total = new TreeMap<>();
        for (InspectionReport.CaseSummary c : r.cases()) {
            assertEquals(perCase.get(c.caseId()), c.labelVoxels(), c.caseId());
            c.labelVoxels().forEach((k, v) -> total.merge(k, v, Long::sum));
            Geometry g = c.geometry();
            String[] sp = spacing.get(c.caseId()).split(" ")[1].split("x");
            assertEquals(spacing.get(c.caseId()).split(" ")[0], g.dimsText());
            for (int d = 0; d < 3; d++) {
                assertEquals(Double.parseDouble(sp[d]), g.spacing(d), 1e-4);
            }
        }
        assertEquals(total, r.labelVoxels());
        assertEquals(List.of(1, 2), List.copyOf(r.labelVoxels().keySet()));
    }

    @Test
    void caseLoaderMasksAgreeWithNibabel() throws Exception {
        Study s = StudyLoader.load(Path.of("demo-masks"), LoadOptions.DEFAULT);
        LoadedCase c = CaseLoader.load(s, "case02", Protocol.defaults(), false);
        assertEquals(9, c.masks().size());
        for (int i = 0; i < 9; i++) {
            LabelVolume v = c.masks().get(i);
            ReaderId id = c.readers().get(i);
            Map<Integer, Long> counts = new TreeMap<>(v.labelCounts());
            counts.remove(0);
            assertEquals(perMask.get("case02/" + id.centre() + "/" + id.reader()), counts, id.label());
        }
        assertNull(c.geometry().differenceFrom(CaseLoader.loadImage(s, "case02", c.geometry(), ReadLimits.DEFAULT,
            0.001).geometry(), 0.001));
    }
}
