package org.accordia.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.concurrent.ConcurrentHashMap;
import java.util.stream.Stream;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.accordia.report.CsvTable;
import org.accordia.report.JsonOutput;
import org.accordia.report.SummaryJson;
import org.accordia.report.Tables;
import org.accordia.run.RunRequest;
import org.accordia.run.StudyRun;
import org.accordia.study.Protocol;
import org.accordia.study.StudyProblem;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Every protocol key (docs/protocol.md) changes the output it documents, or is marked as a label
 * only: one row per key, the protocol changed in that key alone, the outputs compared with the
 * base run. Outputs are the CSV tables and parts of summary.json, computed in memory on a small
 * generated study (4 centres × 4 readers, so the permutation test runs Monte Carlo and
 * {@code shift.permutations} matters). The reading keys ({@code geometry_tolerance_mm},
 * {@code max_voxels}) change which inputs are accepted: their rows inspect a small study on disk.
 */
class ProtocolKeysTest {
    @TempDir
    static Path tmp;

    static DemoGenerator.InMemory demo;
    static final Map<String, Map<String, String>> CACHE = new ConcurrentHashMap<>();

    /** The base protocol: every key given (as in docs/protocol.md), resampling sizes small. */
    static final String BASE = String.join("\n",
        "study: keys",
        "structures:",
        "  - name: lesion",
        "    labels: [1, 2]",
        "    tolerance_mm: 2.0",
        "geometry_tolerance_mm: 0.001",
        "max_voxels: 2147483631",
        "seed: 11",
        "agreement:",
        "  hd95: per_direction",
        "consensus:",
        "  region: union_margin",
        "  bootstrap_resamples: 200",
        "shift:",
        "  distance: one_minus_jaccard",
        "  alpha: 0.05",
        "  permutations: 199",
        "  minimum_shift_mm: 1.0",
        "  minimum_volume_shift_percent: 15",
        "review:",
        "  adjudication_dice: 0.70",
        "  adjudication_hd95_mm: 10.0",
        "  recalibration_tolerance_mm: 1.0",
        "  recalibration_volume_percent: 20",
        "  adjudication_share_for_review: 0.20",
        "");

    @BeforeAll
    static void generate() {
        demo = DemoGenerator.inMemory(DemoSpec.defaults().withRoster(4, 4, 4).withGrid(40, 40, 12, 1.5, 1.5, 3.0)
            .withPlants(2.0, 1, 1));
    }

    @AfterAll
    static void clear() {
        CACHE.clear();
    }

    /**
     * One key.
     *
     * @param key the protocol key
     * @param from the line of the base protocol replaced
     * @param to its replacement
     * @param changes the outputs it must change; {@code LABEL_ONLY} for a display label (then
     *     nothing else may change); {@code READ} for the reading keys
     */
    record Row(String key, String from, String to, Set<String> changes) {
        @Override
        public String toString() {
            return key;
        }
    }

    static final Set<String> LABEL_ONLY = Set.of("summary.json#study");
    static final Set<String> READ = Set.of("read");

    static Stream<Row> rows() {
        return Stream.of(
            new Row("study", "study: keys", "study: another name", LABEL_ONLY),
            new Row("structures", "    labels: [1, 2]\n    tolerance_mm: 2.0",
                "    labels: [1, 2]\n    tolerance_mm: 2.0\n  - name: core\n    labels: [2]",
                Set.of("pairs.csv", "readers.csv", "cases.csv", "summary.json#structures", "summary.json#labels")),
            new Row("structures[i].name", "  - name: lesion", "  - name: mass", Set.of("pairs.csv", "summary.json#structures")),
            new Row("structures[i].labels", "    labels: [1, 2]", "    labels: [1]",
                Set.of("pairs.csv", "summary.json#structures")),
            new Row("structures[i].tolerance_mm", "    tolerance_mm: 2.0", "    tolerance_mm: 1.0",
                Set.of("pairs.csv", "summary.json#structures")),
            new Row("geometry_tolerance_mm", "geometry_tolerance_mm: 0.001", "geometry_tolerance_mm: 0.1", READ),
            new Row("max_voxels", "max_voxels: 2147483631", "max_voxels: 16", READ),
            new Row("seed", "seed: 11", "seed: 12", Set.of("reader_summary.csv", "centres.csv")),
            new Row("agreement.hd95", "  hd95: per_direction", "  hd95: pooled", Set.of("pairs.csv")),
            new Row("consensus.region", "  region: union_margin", "  region: grid", Set.of("readers.csv")),
            new Row("consensus.bootstrap_resamples", "  bootstrap_resamples: 200", "  bootstrap_resamples: 300",
                Set.of("reader_summary.csv")),
            new Row("shift.distance", "  distance: one_minus_jaccard", "  distance: hd95", Set.of("summary.json#labels")),
            new Row("shift.alpha", "  alpha: 0.05", "  alpha: 0.0001", Set.of("summary.json#labels")),
            new Row("shift.permutations", "  permutations: 199", "  permutations: 99", Set.of("summary.json#labels")),
            new Row("shift.minimum_shift_mm", "  minimum_shift_mm: 1.0", "  minimum_shift_mm: 0.0",
                Set.of("summary.json#labels")),
            new Row("shift.minimum_volume_shift_percent", "  minimum_volume_shift_percent: 15",
                "  minimum_volume_shift_percent: 0", Set.of("summary.json#labels")),
            new Row("review.adjudication_dice", "  adjudication_dice: 0.70", "  adjudication_dice: 0.99",
                Set.of("cases.csv", "summary.json#labels")),
            new Row("review.adjudication_hd95_mm", "  adjudication_hd95_mm: 10.0", "  adjudication_hd95_mm: 0.5",
                Set.of("cases.csv", "summary.json#labels")),
            new Row("review.recalibration_tolerance_mm", "  recalibration_tolerance_mm: 1.0",
                "  recalibration_tolerance_mm: 0.01", Set.of("summary.json#labels")),
            new Row("review.recalibration_volume_percent", "  recalibration_volume_percent: 20",
                "  recalibration_volume_percent: 0.1", Set.of("summary.json#labels")),
            new Row("review.adjudication_share_for_review", "  adjudication_share_for_review: 0.20",
                "  adjudication_share_for_review: 1.0", Set.of("summary.json#labels")));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("rows")
    void eachKeyChangesItsDocumentedOutput(Row row) throws Exception {
        assertTrue(BASE.contains(row.from() + "\n"), row + ": the base protocol has no line " + row.from());
        String changed = BASE.replace(row.from() + "\n", row.to() + "\n");
        if (row.changes() == READ) {
            assertReadKey(row, changed);
            return;
        }
        Map<String, String> base = outputs(BASE);
        Map<String, String> other = outputs(changed);
        Set<String> differ = new TreeSet<>();
        for (String k : base.keySet()) {
            if (!base.get(k).equals(other.get(k))) {
                differ.add(k);
            }
        }
        if (row.changes() == LABEL_ONLY) {
            assertEquals(LABEL_ONLY, differ, row + " is a label only: nothing but the name may change");
            return;
        }
        if (!differ.containsAll(row.changes())) {
            fail(row + ": expected changes in " + row.changes() + ", changed: " + differ);
        }
    }

    /** The outputs of one protocol: every CSV table, and summary.json's study, structures and labels. */
    static Map<String, String> outputs(String yaml) throws Exception {
        Map<String, String> cached = CACHE.get(yaml);
        if (cached != null) {
            return cached;
        }
        Path file = Files.createTempFile(tmp, "protocol", ".yaml");
        Files.writeString(file, yaml);
        Protocol p = Protocol.load(file);
        StudyResult r = StudyAnalysis.run(CaseSource.of(demo.caseIds(), demo::load, null), p,
            AnalysisOptions.defaults().withThreads(2));
        Map<String, String> out = new LinkedHashMap<>();
        Map<String, CsvTable> tables = new LinkedHashMap<>();
        tables.put("pairs.csv", Tables.pairs(r));
        tables.put("readers.csv", Tables.readers(r));
        tables.put("centres.csv", Tables.centres(r));
        tables.put("cases.csv", Tables.cases(r));
        tables.put("reader_summary.csv", Tables.readerSummary(r));
        tables.put("events.csv", Tables.events(r));
        for (var e : tables.entrySet()) {
            ByteArrayOutputStream b = new ByteArrayOutputStream();
            e.getValue().write(b);
            out.put(e.getKey(), b.toString(StandardCharsets.UTF_8));
        }
        JsonNode summary = new ObjectMapper().readTree(JsonOutput.toJson(SummaryJson.of(r, "test", List.of())));
        for (String part : List.of("study", "structures", "labels")) {
            out.put("summary.json#" + part, summary.get(part).toString());
        }
        CACHE.put(yaml, out);
        return out;
    }

    /** A reading key: the base protocol accepts a small study on disk, the changed one does not, or the reverse. */
    static void assertReadKey(Row row, String changed) throws Exception {
        Path study = tmp.resolve(row.key());
        Geometry g = Geometry.axisAligned(4, 4, 2, 1, 1, 1);
        // the second reader's spacing differs by 0.01 mm: beyond 0.001 mm, within 0.1 mm
        Geometry g2 = Geometry.axisAligned(4, 4, 2, 1.01, 1, 1);
        byte[] v = new byte[32];
        v[5] = 1;
        Files.createDirectories(study.resolve("c1/r1"));
        Files.createDirectories(study.resolve("c2/r2"));
        NiftiWriter.writeLabels(study.resolve("c1/r1/case1.nii.gz"), LabelVolume.ofBytes(g, v));
        NiftiWriter.writeLabels(study.resolve("c2/r2/case1.nii.gz"),
            LabelVolume.ofBytes(row.key().equals("geometry_tolerance_mm") ? g2 : g, v));
        Path before = tmp.resolve(row.key() + "-base.yaml");
        Path after = tmp.resolve(row.key() + "-changed.yaml");
        Files.writeString(before, BASE);
        Files.writeString(after, changed);
        long errorsBefore = errors(study, before);
        long errorsAfter = errors(study, after);
        assertTrue(errorsBefore != errorsAfter, row + ": " + errorsBefore + " error(s) either way");
    }

    static long errors(Path study, Path protocol) throws Exception {
        return StudyRun.inspect(StudyRun.prepare(RunRequest.of(study).withProtocolFile(protocol)), 1)
            .count(StudyProblem.Severity.ERROR);
    }
}
