package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringReader;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.demo.DemoTruth;
import org.accordia.io.NiftiWriter;
import org.accordia.study.LoadedCase;
import org.jsoup.Jsoup;
import org.jsoup.nodes.Document;
import org.jsoup.nodes.Element;
import org.jsoup.parser.Parser;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code accordia analyze} end to end, in-process through {@link Main#execute}: on a copy of the
 * committed demo study (what was planted is read from its demo-truth.json) and on small studies
 * built here.
 */
class AnalyzeCommandTest {

    static CliRun run(String... args) {
        return CliRun.of(args);
    }

    /** The demo protocol with fewer bootstrap resamples (keeps the test quick; the method is the same). */
    static Path quickProtocol(Path dir) throws Exception {
        String text = DemoGenerator.protocolYaml().replace("bootstrap_resamples: 2000", "bootstrap_resamples: 200");
        Path p = dir.resolve("quick-protocol.yaml");
        Files.writeString(p, text);
        return p;
    }

    static Map<String, String> checksums(Path root) throws Exception {
        Map<String, String> out = new TreeMap<>();
        try (Stream<Path> w = Files.walk(root)) {
            for (Path p : w.filter(Files::isRegularFile).toList()) {
                out.put(root.relativize(p).toString(),
                    HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(p))));
            }
        }
        return out;
    }

    static void copy(Path from, Path to) throws Exception {
        try (Stream<Path> w = Files.walk(from)) {
            for (Path p : w.toList()) {
                Path t = to.resolve(from.relativize(p).toString());
                if (Files.isDirectory(p)) {
                    Files.createDirectories(t);
                } else {
                    Files.copy(p, t);
                }
            }
        }
    }

    @Test
    void demoStudyEndToEnd(@TempDir Path tmp) throws Exception {
        Path study = tmp.resolve("study");
        copy(Path.of("demo-masks"), study);
        Path protocol = quickProtocol(tmp);
        Map<String, String> before = checksums(study);
        DemoTruth truth = DemoTruth.read(study.resolve(DemoTruth.FILE_NAME));

        CliRun a = run("analyze", study.toString(), "--protocol", protocol.toString(), "--out", tmp.resolve("a").toString(),
            "--threads", "2", "--quiet");
        assertEquals(ExitCodes.OK, a.code(), a.err());
        assertTrue(a.out().contains("lesion: re-annotate"), a.out());
        // the same run on one thread, failing on re-annotate: exit 3, the same files
        CliRun b = run("analyze", study.toString(), "--protocol", protocol.toString(), "--out", tmp.resolve("b").toString(),
            "--threads", "1", "--quiet", "--fail-on", "re-annotate");
        assertEquals(ExitCodes.VERDICT, b.code(), b.err());
        for (String f : List.of("pairs.csv", "readers.csv", "centres.csv", "cases.csv", "reader_summary.csv",
            "events.csv", "summary.json")) {
            assertArrayEquals(Files.readAllBytes(tmp.resolve("a").resolve(f)), Files.readAllBytes(tmp.resolve("b").resolve(f)),
                f + " differs between --threads 2 and --threads 1");
        }
        assertArrayEquals(Files.readAllBytes(tmp.resolve("a/consensus/case04/lesion_consensus.nii.gz")),
            Files.readAllBytes(tmp.resolve("b/consensus/case04/lesion_consensus.nii.gz")));
        assertEquals(before, checksums(study), "the input folder changed");

        JsonNode summary = new ObjectMapper().readTree(tmp.resolve("a/summary.json").toFile());
        JsonNode lesion = summary.get("labels").get(0);
        assertEquals("lesion", lesion.get("name").asText());
        assertEquals("re-annotate", lesion.get("verdict").asText());
        // the shifted centre is the primary finding, drawn outside (positive = wider)
        assertEquals(truth.shiftedCentre(), lesion.get("shift").get("flagged_centres").get(0).asText());
        boolean found = false;
        for (CSVRecord r : csv(tmp.resolve("a/centres.csv"))) {
            if (r.get("label").equals("lesion") && r.get("centre").equals(truth.shiftedCentre())) {
                found = true;
                assertEquals("shift", r.get("flag"));
                assertTrue(Double.parseDouble(r.get("signed_surface_lo")) > 0, r.toString());
                assertTrue(Double.parseDouble(r.get("volume_ratio")) > 1, r.toString());
            }
        }
        assertTrue(found);
        // the hard cases are on the adjudication list
        List<String> adjudicate = new ArrayList<>();
        lesion.get("cases_to_adjudicate").forEach(c -> adjudicate.add(c.get("case").asText()));
        assertTrue(adjudicate.containsAll(truth.hardCases()), adjudicate.toString());
        // the reader who misses the second lesion, with exactly the affected cases; in each of them the
        // reader's sensitivity (vs the other readers' consensus) is below the others' median
        JsonNode missed = lesion.get("readers_missing_parts").get(0);
        assertEquals(truth.missingLesionReader(), missed.get("reader").asText());
        assertEquals(truth.missingLesionCentre(), missed.get("centre").asText());
        List<String> cases = new ArrayList<>();
        missed.get("cases").forEach(c -> cases.add(c.asText()));
        assertEquals(truth.missedLesionCases(), cases);
        for (int i = 0; i < cases.size(); i++) {
            assertTrue(missed.get("sensitivity").get(i).asDouble() < missed.get("others_median_sensitivity").get(i).asDouble());
        }
        // and the report says so in words, naming the cases
        Document doc = parseStrict(tmp.resolve("a/report.html"));
        String text = doc.text();
        assertTrue(text.contains("Leaves out a whole part of lesion"), "missing-part row");
        for (String c : truth.missedLesionCases()) {
            assertTrue(text.contains(c + " ("), c);
        }
        assertTrue(text.contains("The primary finding is centre " + truth.shiftedCentre()));
        assertNoRemoteReference(Files.readString(tmp.resolve("a/report.html")), doc);
        assertEquals(3, doc.select("figure img[alt^=Reader contours]").size());
        // every input file has its checksum in the summary
        assertEquals(before.size() - 2 + 1, summary.get("inputs").size()); // minus demo-truth.json and protocol.yaml, plus --protocol
    }

    static List<CSVRecord> csv(Path p) throws Exception {
        return CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get()
            .parse(new StringReader(Files.readString(p))).getRecords();
    }

    /** Well-formed HTML5 (jsoup's HTML5 tree builder reports no parse error). */
    static Document parseStrict(Path html) throws Exception {
        Parser parser = Parser.htmlParser().setTrackErrors(20);
        Document doc = Jsoup.parse(Files.readString(html), "", parser);
        assertTrue(parser.getErrors().isEmpty(), parser.getErrors().toString());
        return doc;
    }

    static void assertNoRemoteReference(String html, Document doc) {
        String lower = html.toLowerCase(java.util.Locale.ROOT);
        assertFalse(lower.contains("http:"), "http:");
        assertFalse(lower.contains("https:"), "https:");
        assertFalse(lower.contains("<link"), "<link");
        assertFalse(lower.contains("<script"), "<script");
        for (Element e : doc.select("[src], [href]")) {
            String v = e.hasAttr("src") ? e.attr("src") : e.attr("href");
            assertFalse(v.startsWith("//"), v);
            assertTrue(v.startsWith("data:") || v.startsWith("#"), v);
        }
        assertFalse(lower.replace("data:image/png;base64,", "").matches("(?s).*[\"'(]//.*"), "protocol-relative URL");
    }

    /** A manifest study with hostile names, built from the in-memory demo generator. */
    static Path hostileStudy(Path dir) throws Exception {
        DemoSpec spec = DemoSpec.defaults().withRoster(3, 2, 2).withGrid(40, 40, 10, 1.5, 1.5, 3.0).withPlants(1.0, 0, 0);
        DemoGenerator.InMemory demo = DemoGenerator.inMemory(spec);
        Map<String, String> caseNames = Map.of(demo.caseIds().get(0), "=cmd|' /C calc'!A0");
        StringBuilder manifest = new StringBuilder("case,centre,reader,path\n");
        Files.createDirectories(dir);
        for (String c : demo.caseIds()) {
            LoadedCase lc = demo.load(c);
            for (int j = 0; j < lc.readers().size(); j++) {
                String file = c + "-" + j + ".nii.gz";
                NiftiWriter.writeLabels(dir.resolve(file), lc.masks().get(j));
                String reader = j == 0 ? "<script>alert(1)</script>" : lc.readers().get(j).reader();
                String caseName = caseNames.getOrDefault(c, c);
                manifest.append('"').append(caseName.replace("\"", "\"\"")).append("\",").append(lc.readers().get(j).centre())
                    .append(',').append(reader).append(',').append(file).append('\n');
            }
        }
        Files.writeString(dir.resolve("manifest.csv"), manifest.toString(), StandardCharsets.UTF_8);
        return dir;
    }

    @Test
    void hostileNamesAreTextInTheReportAndNeutralisedInEveryCsv(@TempDir Path tmp) throws Exception {
        Path study = hostileStudy(tmp.resolve("study"));
        Path protocol = quickProtocol(tmp);
        CliRun r = run("analyze", study.toString(), "--protocol", protocol.toString(), "--out", tmp.resolve("out").toString(),
            "--quiet");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        Document doc = parseStrict(tmp.resolve("out/report.html"));
        assertTrue(doc.text().contains("<script>alert(1)</script>"));
        assertTrue(doc.select("script").isEmpty());
        assertNoRemoteReference(Files.readString(tmp.resolve("out/report.html")), doc);
        int seen = 0;
        try (Stream<Path> files = Files.list(tmp.resolve("out"))) {
            for (Path f : files.filter(p -> p.toString().endsWith(".csv")).sorted().toList()) {
                for (CSVRecord rec : csv(f)) {
                    for (String cell : rec) {
                        if (cell.contains("cmd|")) {
                            assertEquals("'=cmd|' /C calc'!A0", cell, f.toString());
                            seen++;
                        }
                        // no cell may start a formula (numbers are written as numbers: "-1.5" is fine)
                        if (!cell.isEmpty() && "=+@\t\r".indexOf(cell.charAt(0)) >= 0) {
                            throw new AssertionError(f + ": cell starts a formula: " + cell);
                        }
                        if (cell.startsWith("-")) {
                            Double.parseDouble(cell); // a text cell starting with '-' would have been quoted with '
                        }
                    }
                }
            }
        }
        assertTrue(seen >= 4, "the hostile case name appears in pairs, readers, cases and events: " + seen);
        // the consensus folder of that case has a safe name
        try (Stream<Path> dirs = Files.list(tmp.resolve("out/consensus"))) {
            assertTrue(dirs.allMatch(p -> p.getFileName().toString().matches("[A-Za-z0-9._-]+")));
        }
    }

    @Test
    void nonEmptyOutputFolderIsRefusedWithoutForce(@TempDir Path tmp) throws Exception {
        Path study = hostileStudy(tmp.resolve("study"));
        Path out = Files.createDirectories(tmp.resolve("out"));
        Files.writeString(out.resolve("notes.txt"), "mine");
        CliRun r = run("analyze", study.toString(), "--out", out.toString(), "--quiet");
        assertEquals(ExitCodes.INPUT, r.code());
        assertTrue(r.err().contains(out.toString()) && r.err().contains("--force"), r.err());
        assertEquals(1, r.err().strip().lines().count(), r.err());
        assertEquals("mine", Files.readString(out.resolve("notes.txt")));
    }

    @Test
    void usageErrorsAreExitTwo(@TempDir Path tmp) throws Exception {
        assertEquals(ExitCodes.INPUT, run("analyze", tmp.toString(), "--fail-on", "sometimes").code());
        assertEquals(ExitCodes.INPUT, run("analyze", tmp.resolve("missing").toString(), "--quiet").code());
        CliRun help = run("analyze", "--help");
        assertEquals(ExitCodes.OK, help.code());
        assertTrue(help.out().contains("Exit codes:") && help.out().contains("--fail-on"), help.out());
    }
}
