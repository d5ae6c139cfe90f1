package org.accordia.hostile;

import static org.accordia.hostile.HostileCorpusTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.BufferedWriter;
import java.io.RandomAccessFile;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;
import org.accordia.hostile.HostileCorpusTest.Run;
import org.accordia.io.NiftiWriter;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * Bad input at scale. No timing is asserted: the JUnit timeouts only guard against a hang; the
 * assertions are on what is read and printed.
 */
class HostileScaleTest {
    @TempDir
    Path tmp;

    /**
     * A manifest of 10^6 rows naming files that do not exist: inspect reports every problem by
     * count and lists only the first {@code InspectionReport.LIST_CAP} of each list.
     */
    @Test
    @Timeout(value = 600, unit = TimeUnit.SECONDS, threadMode = Timeout.ThreadMode.SEPARATE_THREAD)
    void aMillionRowsOfMissingFilesGiveABoundedReport() throws Exception {
        Path manifest = tmp.resolve("manifest.csv");
        try (BufferedWriter w = Files.newBufferedWriter(manifest, StandardCharsets.UTF_8)) {
            w.write("case,centre,reader,path\n");
            for (int i = 0; i < 1_000_000; i++) {
                w.write(String.format("case%06d,centre%d,reader%d,masks/c%06d_r%d.nii%n", i / 4, (i % 4) / 2, i % 4, i / 4, i % 4));
            }
        }
        Run r = run("inspect", tmp.toString());
        assertEquals(2, r.code(), r.err());
        long lines = r.out().lines().count();
        assertTrue(lines < 200, lines + " lines of output");
        assertTrue(r.out().contains("Cases (250000):"), r.out());
        assertTrue(r.out().contains("... and 249950 more cases (250000 in all)"), r.out());
        // one error per missing file, plus the study-level ones (e.g. no mask holds a label)
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("Problems: (\\d+) error\\(s\\)").matcher(r.out());
        assertTrue(m.find(), r.out());
        long errors = Long.parseLong(m.group(1));
        assertTrue(errors >= 1_000_000 && errors < 1_000_010, r.out());
        assertTrue(r.out().contains("... and " + (errors - 50) + " more problems (" + errors + " in all)"), r.out());
        assertTrue(r.err().contains(errors + " error(s)"), r.err());
    }

    /**
     * A valid raw .nii mask followed by a 100 GB sparse tail (no reader reads past the declared
     * payload): analyze completes, and the input checksum covers the bytes read, not the tail.
     */
    @Test
    @Timeout(value = 600, unit = TimeUnit.SECONDS, threadMode = Timeout.ThreadMode.SEPARATE_THREAD)
    void aHundredGigabyteTailIsNeitherReadNorHashed() throws Exception {
        Path study = AnalyzeHostileTest.smallDemo(tmp.resolve("study"));
        Files.delete(study.resolve("manifest.csv"));
        Path gz = study.resolve("esterhaven/est1/case01.nii.gz");
        Path raw = study.resolve("esterhaven/est1/case01.nii");
        NiftiWriter.writeLabels(raw, Volumes.readLabels(gz, ReadLimits.DEFAULT));
        Files.delete(gz);
        long used = Files.size(raw);
        long tail = 100L << 30;
        try (RandomAccessFile f = new RandomAccessFile(raw.toFile(), "rw")) {
            f.setLength(used + tail); // sparse on the usual file systems: no 100 GB written
        }
        Run i = run("inspect", study.toString(), "--protocol", study.resolve("protocol.yaml").toString());
        assertEquals(0, i.code(), i.out() + i.err());
        Path out = tmp.resolve("out");
        Run a = run("analyze", study.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, a.code(), a.err());
        JsonNode inputs = new ObjectMapper().readTree(out.resolve("summary.json").toFile()).get("inputs");
        boolean found = false;
        for (JsonNode n : inputs) {
            if (n.get("path").asText().equals("esterhaven/est1/case01.nii")) {
                found = true;
                assertEquals(used + tail, n.get("bytes").asLong());
                assertEquals(used, n.get("sha256_bytes").asLong(), "the header and the declared payload, not the tail");
            } else {
                assertEquals(n.get("bytes").asLong(), n.get("sha256_bytes").asLong(), n.toString());
            }
        }
        assertTrue(found, inputs.toString());
    }
}
