package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.csv.CSVRecord;
import org.accordia.agreement.CaseAgreement;
import org.accordia.agreement.CaseAgreementEngine;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code agreement.hd95} reaches the computation: {@code pairs.csv}'s {@code hd95_mm} holds the
 * variant the protocol names.
 *
 * <p>Worked example (by hand): a 10 × 1 × 1 grid with 1 mm voxels, where every foreground voxel
 * is a border voxel (its y and z neighbours are outside the grid). A = x 0..9, B = x 0..4. The
 * directed distances are dA = {0,0,0,0,0,1,2,3,4,5} (A to B) and dB = {0,0,0,0,0} (B to A).
 * Type-7 95th percentile (Hyndman &amp; Fan 1996): of dA, h = 9 × 0.95 = 8.55, 4 + 0.55 × (5 − 4)
 * = 4.55; of dB, 0. Per direction: max(4.55, 0) = 4.55 mm. Pooled: the 15 values sorted are ten
 * zeros then 1..5; h = 14 × 0.95 = 13.3, 4 + 0.3 × (5 − 4) = 4.3 mm.
 */
class Hd95SettingTest {
    static final Geometry LINE = Geometry.axisAligned(10, 1, 1, 1, 1, 1);

    static LabelVolume upTo(int last) {
        byte[] b = new byte[10];
        for (int x = 0; x <= last; x++) {
            b[x] = 1;
        }
        return LabelVolume.ofBytes(LINE, b);
    }

    @Test
    void theEngineComputesTheNamedVariant() {
        Structure whole = new Structure("whole", List.of(1), 1.0);
        List<ReaderId> ids = List.of(new ReaderId("a", "x"), new ReaderId("b", "y"));
        List<LabelVolume> masks = List.of(upTo(9), upTo(4));
        CaseAgreement per = new CaseAgreementEngine(1.0, 1.0, Protocol.Hd95Mode.PER_DIRECTION, null)
            .evaluate("c", ids, masks, List.of(whole)).get(0);
        CaseAgreement pooled = new CaseAgreementEngine(1.0, 1.0, Protocol.Hd95Mode.POOLED, null)
            .evaluate("c", ids, masks, List.of(whole)).get(0);
        assertEquals(4.55, per.pairs().get(0).hd95Mm(), 1e-12);
        assertEquals(4.3, pooled.pairs().get(0).hd95Mm(), 1e-12);
        assertEquals(4.3, per.pairs().get(0).hd95PooledMm(), 1e-12);
    }

    @Test
    void pairsCsvFollowsTheProtocol(@TempDir Path tmp) throws Exception {
        Path study = tmp.resolve("study");
        // three readers, two centres, two cases: est1 and nor1 draw x 0..9, est2 draws x 0..4
        for (String c : List.of("case01", "case02")) {
            write(study.resolve("esterhaven/est1/" + c + ".nii.gz"), upTo(9));
            write(study.resolve("esterhaven/est2/" + c + ".nii.gz"), upTo(4));
            write(study.resolve("norvale/nor1/" + c + ".nii.gz"), upTo(9));
        }
        String base = "structures:\n  - name: whole\n    labels: [1]\n    tolerance_mm: 1.0\n"
            + "consensus:\n  bootstrap_resamples: 200\n";
        Path perFile = tmp.resolve("per.yaml");
        Files.writeString(perFile, base + "agreement:\n  hd95: per_direction\n");
        Path pooledFile = tmp.resolve("pooled.yaml");
        Files.writeString(pooledFile, base + "agreement:\n  hd95: pooled\n");
        CliRun a = CliRun.of("analyze", study.toString(), "--protocol", perFile.toString(), "--out",
            tmp.resolve("per").toString(), "--quiet", "--threads", "1");
        assertEquals(ExitCodes.OK, a.code(), a.err());
        CliRun b = CliRun.of("analyze", study.toString(), "--protocol", pooledFile.toString(), "--out",
            tmp.resolve("pooled").toString(), "--quiet", "--threads", "1");
        assertEquals(ExitCodes.OK, b.code(), b.err());
        List<CSVRecord> per = AnalyzeCommandTest.csv(tmp.resolve("per/pairs.csv"));
        List<CSVRecord> pooled = AnalyzeCommandTest.csv(tmp.resolve("pooled/pairs.csv"));
        assertEquals(per.size(), pooled.size());
        int checked = 0;
        for (int i = 0; i < per.size(); i++) {
            boolean differ = !per.get(i).get("reader_a").equals(per.get(i).get("reader_b"))
                && (per.get(i).get("reader_a").equals("est2") || per.get(i).get("reader_b").equals("est2"));
            if (differ) {
                assertEquals(4.55, Double.parseDouble(per.get(i).get("hd95_mm")), 1e-9, per.get(i).toString());
                assertEquals(4.3, Double.parseDouble(pooled.get(i).get("hd95_mm")), 1e-9, pooled.get(i).toString());
                checked++;
            } else {
                assertEquals(0.0, Double.parseDouble(per.get(i).get("hd95_mm")), 0.0);
                assertEquals(0.0, Double.parseDouble(pooled.get(i).get("hd95_mm")), 0.0);
            }
        }
        assertEquals(4, checked, "two pairs with est2 in each of two cases");
        // the per-case maximum follows too
        CSVRecord casePer = AnalyzeCommandTest.csv(tmp.resolve("per/cases.csv")).get(0);
        CSVRecord casePooled = AnalyzeCommandTest.csv(tmp.resolve("pooled/cases.csv")).get(0);
        assertEquals(4.55, Double.parseDouble(casePer.get("max_hd95_mm")), 1e-9);
        assertEquals(4.3, Double.parseDouble(casePooled.get("max_hd95_mm")), 1e-9);
        String summary = Files.readString(tmp.resolve("pooled/summary.json"));
        assertTrue(summary.contains("\"agreement.hd95\": \"pooled\""), summary);
        // the protocol's source is recorded: a file given outside the study, by its name alone
        JsonNode protocol = new ObjectMapper().readTree(summary).get("protocol");
        assertEquals("given_file", protocol.get("source").asText());
        assertEquals("pooled.yaml", protocol.get("file").asText());
    }

    static void write(Path p, LabelVolume v) throws Exception {
        Files.createDirectories(p.getParent());
        NiftiWriter.writeLabels(p, v);
    }
}
