package org.accordia.hostile;

import static org.accordia.hostile.HostileCorpusTest.assertOneCleanErrLine;
import static org.accordia.hostile.HostileCorpusTest.materialise;
import static org.accordia.hostile.HostileCorpusTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.accordia.hostile.HostileCorpusTest.Kind;
import org.accordia.hostile.HostileCorpusTest.Run;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.jsoup.Jsoup;
import org.jsoup.nodes.Document;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * {@code accordia analyze} on hostile input, in-process: it stops at the first bad input with
 * exit 2 and exactly one stderr line naming the file and the problem, leaving nothing in the
 * output folder; it never modifies an input; names from the study cannot inject markup, formulas
 * or paths; an existing output folder is not overwritten without {@code --force}; the voxel limit
 * applies.
 */
class AnalyzeHostileTest {
    @TempDir
    static Path shared;
    static Path demo;

    @TempDir
    Path tmp;

    /** A small demo study (3 cases, 2 centres x 2 readers, 32x32x12 voxels). */
    @BeforeAll
    static void generate() {
        demo = shared.resolve("demo");
        Run r = run("demo", "--out", demo.toString(), "--size", "32,32,12", "--spacing", "2,2,5", "--cases", "3",
            "--centres", "2", "--readers-per-centre", "2");
        assertEquals(0, r.code(), r.err());
        try {
            Files.writeString(demo.resolve("protocol.yaml"), LIGHT);
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    /**
     * A small demo study at {@code dir} (2 cases, 2 centres x 2 readers, 16x16x6 voxels) with the
     * {@link #LIGHT} protocol as its protocol.yaml.
     */
    static Path smallDemo(Path dir) {
        Run r = run("demo", "--out", dir.toString(), "--size", "16,16,6", "--spacing", "2,2,5", "--cases", "2",
            "--centres", "2", "--readers-per-centre", "2");
        assertEquals(0, r.code(), r.err());
        try {
            Files.writeString(dir.resolve("protocol.yaml"), LIGHT);
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
        return dir;
    }

    /** The fewest resamples the protocol accepts: these tests check files, not statistics. */
    static final String LIGHT = "structures:\n  - name: lesion\n    labels: [1, 2]\n  - name: core\n    labels: [2]\n"
        + "consensus:\n  bootstrap_resamples: 100\nshift:\n  permutations: 99\n";

    static String[] analyzeArgs(Path study, Path out, String... extra) {
        List<String> a = new ArrayList<>(List.of("analyze", study.toString(), "--out", out.toString()));
        a.addAll(List.of(extra));
        return a.toArray(String[]::new);
    }

    /** A fresh copy of the demo study. */
    Path demoCopy(String name) throws IOException {
        Path dst = tmp.resolve(name);
        HostileCorpusTest.copyTree(demo, dst);
        return dst;
    }

    /**
     * Every corpus kind: exit 2, one stderr line naming the file and the problem (for analyze,
     * which stops at the first bad input, that line is the whole message), and an output folder
     * left without any file.
     */
    @ParameterizedTest(name = "{0}")
    @MethodSource("org.accordia.hostile.HostileCorpusTest#kinds")
    void analyzeStopsWithOneLineAndWritesNothing(Kind k) throws Exception {
        Path kindDir = materialise(k.kind(), tmp);
        Path out = tmp.resolve("out");
        List<String> extra = new ArrayList<>();
        if (Files.exists(kindDir.resolve("protocol.yaml"))) {
            extra.addAll(List.of("--protocol", kindDir.resolve("protocol.yaml").toString()));
        }
        Run r = run(analyzeArgs(kindDir.resolve("study"), out, extra.toArray(String[]::new)));
        assertEquals(2, r.code(), k + ": exit code\n" + r.out() + r.err());
        assertOneCleanErrLine(r);
        String line = r.err().strip();
        String file = AnalyzeExpectations.file(k);
        String phrase = AnalyzeExpectations.phrase(k);
        assertTrue(line.contains(file) && line.contains(phrase),
            k + ": the stderr line should name " + file + " and \"" + phrase + "\": " + line);
        assertEquals(List.of(), OutputChecks.files(out), k + ": files left in the output folder");
    }

    /**
     * A bad mask in the last case, found after the first cases' consensus masks were written:
     * the run stops with one line and removes everything it wrote, including the folder it created.
     */
    @Test
    void badMaskInALaterCaseLeavesNoOutputBehind() throws Exception {
        Path study = demoCopy("study");
        Path bad = study.resolve("norvale/nor2/case03.nii.gz");
        byte[] b = Files.readAllBytes(bad);
        Files.write(bad, java.util.Arrays.copyOf(b, b.length / 2));
        Path out = tmp.resolve("out");
        Run r = run(analyzeArgs(study, out, "--threads", "1"));
        assertEquals(2, r.code(), r.out() + r.err());
        assertOneCleanErrLine(r);
        assertTrue(r.err().contains("nor2/case03.nii.gz: truncated"), r.err());
        assertFalse(Files.exists(out), "the output folder this run created is removed: " + OutputChecks.files(out));
    }

    /**
     * A study with a single centre (two readers) is analysable: the between-centre part is not
     * estimable and the report says so (the centre-effect charts used to fail with an internal
     * error on an empty list of centres).
     */
    @Test
    void singleCentreStudyIsReportedNotACrash() throws Exception {
        Path study = demoCopy("study");
        Files.writeString(study.resolve("manifest.csv"), "case,centre,reader,path\n"
            + "case01,esterhaven,est1,esterhaven/est1/case01.nii.gz\ncase01,esterhaven,est2,esterhaven/est2/case01.nii.gz\n"
            + "case02,esterhaven,est1,esterhaven/est1/case02.nii.gz\ncase02,esterhaven,est2,esterhaven/est2/case02.nii.gz\n");
        Path out = tmp.resolve("out");
        Run r = run(analyzeArgs(study, out, "--quiet"));
        assertEquals(0, r.code(), r.out() + r.err());
        assertTrue(Files.readString(out.resolve("report.html")).contains("No centre effect for lesion"));
        OutputChecks.assertEveryFinalFileComplete(out);
    }

    /** An existing non-empty folder is refused without --force, and the refusal changes nothing. */
    @Test
    void existingOutputFolderIsNotOverwrittenWithoutForce() throws Exception {
        Path out = Files.createDirectories(tmp.resolve("out"));
        Files.writeString(out.resolve("report.html"), "my own notes\n");
        Files.writeString(out.resolve("keep.txt"), "keep me\n");
        Map<String, String> before = OutputChecks.fingerprint(out);
        Run r = run(analyzeArgs(demo, out));
        assertEquals(2, r.code(), r.out() + r.err());
        assertOneCleanErrLine(r);
        assertTrue(r.err().contains("the output folder is not empty") && r.err().contains("--force"), r.err());
        assertEquals(before, OutputChecks.fingerprint(out), "the refused run changed the folder");
    }

    @Test
    void maxVoxelsOptionBoundsEveryVolume() throws Exception {
        Path out = tmp.resolve("out");
        Run r = run(analyzeArgs(demo, out, "--max-voxels", "1000"));
        assertEquals(2, r.code(), r.out() + r.err());
        assertOneCleanErrLine(r);
        assertTrue(r.err().contains("declares 12288 voxels (32x32x12), more than the limit of 1000"), r.err());
        // cases are read in parallel: any of them may be the first refused
        assertTrue(r.err().matches("(?s)accordia: .*/case0[1-3]\\.nii\\.gz: .*"), r.err());
        assertEquals(List.of(), OutputChecks.files(out));
    }

    // ---------------------------------------------------------------- hostile names

    static final String SCRIPT = "<script>alert(1)</script>";

    /**
     * Names from the manifest that try markup, formulas and path escapes. Each row maps one of the
     * demo's masks to hostile case, centre and reader names.
     */
    @Test
    void hostileNamesCannotInjectMarkupFormulasOrPaths() throws Exception {
        Path study = demoCopy("study");
        String[] cases = {"=HYPERLINK(\"http://x\")", "../../escaped", SCRIPT};
        String[] centres = {"+centre", "@centre"};
        String[][] readers = {{"-r1", "<b>r2</b>"}, {"=1+1", "..\\r4"}};
        String[] demoCentres = {"esterhaven", "norvale"};
        String[][] demoReaders = {{"est1", "est2"}, {"nor1", "nor2"}};
        StringBuilder csv = new StringBuilder("case,centre,reader,path\n");
        for (int c = 0; c < 3; c++) {
            for (int k = 0; k < 2; k++) {
                for (int j = 0; j < 2; j++) {
                    csv.append(quote(cases[c])).append(',').append(quote(centres[k])).append(',')
                        .append(quote(readers[k][j])).append(',')
                        .append(demoCentres[k]).append('/').append(demoReaders[k][j]).append("/case0").append(c + 1).append(".nii.gz\n");
                }
            }
        }
        Files.writeString(study.resolve("manifest.csv"), csv.toString(), StandardCharsets.UTF_8);
        Path protocol = Files.writeString(tmp.resolve("protocol.yaml"),
            "structures:\n  - name: \"=SUM(A1:A9)\"\n    labels: [1, 2]\n  - name: \"<img src=x onerror=alert(2)>\"\n    labels: [2]\n"
                + "consensus:\n  bootstrap_resamples: 100\nshift:\n  permutations: 99\n");
        Path parent = Files.createDirectories(tmp.resolve("runs"));
        Path out = parent.resolve("out");
        Map<String, String> before = OutputChecks.fingerprint(study);
        Run r = run(analyzeArgs(study.resolve("manifest.csv"), out, "--protocol", protocol.toString(), "--quiet"));
        assertEquals(0, r.code(), r.out() + r.err());
        assertEquals("", r.err(), "--quiet: nothing on stderr");

        // inputs: opened read-only, never modified (SHA-256 of every file, the listing, sizes and times)
        assertEquals(before, OutputChecks.fingerprint(study), "the study changed");
        // outputs: every file under a final name complete, no temporary left
        assertTrue(OutputChecks.assertEveryFinalFileComplete(out) > 5);
        assertTrue(OutputChecks.files(out).stream().noneMatch(p -> OutputChecks.TEMPORARY.matcher(p.getFileName().toString()).matches()),
            "temporary files left behind");

        // paths: everything the run wrote is inside the output folder
        try (Stream<Path> s = Files.list(parent)) {
            assertEquals(List.of(out), s.toList(), "something was written beside the output folder");
        }
        assertFalse(Files.exists(tmp.resolve("escaped")) || Files.exists(study.resolve("escaped")), "escaped");
        for (Path rel : OutputChecks.files(out)) {
            for (Path part : rel) {
                String n = part.toString();
                assertFalse(n.equals("..") || n.contains("<") || n.contains("=") || n.contains("\\"), "unsafe output name " + rel);
            }
        }

        // HTML: the names are text, never markup
        Path html = out.resolve("report.html");
        assertTrue(Files.exists(html), "report.html");
        Document doc = Jsoup.parse(Files.readString(html));
        for (var script : doc.select("script")) {
            assertFalse(script.data().contains("alert("), "injected script: " + script);
        }
        assertTrue(doc.select("b").stream().noneMatch(b -> b.text().equals("r2")), "injected <b>");
        assertTrue(doc.select("img[onerror]").isEmpty(), "injected <img onerror>");
        assertTrue(doc.text().contains(SCRIPT), "the case name shows as text");

        // CSV: no text cell starts with a formula character
        int csvFiles = 0;
        for (Path rel : OutputChecks.files(out)) {
            if (!rel.toString().endsWith(".csv")) {
                continue;
            }
            csvFiles++;
            try (CSVParser p = CSVParser.parse(out.resolve(rel), StandardCharsets.UTF_8, CSVFormat.RFC4180)) {
                for (CSVRecord rec : p) {
                    for (String cell : rec) {
                        if (!cell.isEmpty() && "=+-@".indexOf(cell.charAt(0)) >= 0) {
                            assertTrue(cell.matches("[-+]?[0-9.eE+-]+|[-+]?(Infinity|NaN)"),
                                rel + ": formula-like cell " + cell);
                        }
                    }
                }
            }
        }
        assertTrue(csvFiles > 0, "no CSV written");
        OutputChecks.assertEveryFinalFileComplete(out);
    }

    static String quote(String s) {
        return "\"" + s.replace("\"", "\"\"") + "\"";
    }

    /** What analyze's one line says for each kind (by default what inspect's problem line says). */
    static final class AnalyzeExpectations {
        private static final Map<String, String[]> OVERRIDES = new TreeMap<>(Map.of(
            // analyze computes input checksums first: the over-long name fails there, with the system's words
            "manifest-long-file-name", new String[] {"n".repeat(300) + ".nii", "File name too long"},
            // a skipped loop or unusable name is a warning; what stops analyze is the single reader left
            "symlink-loop", new String[] {"study", "the study has 1 reader(s); agreement needs at least 2"},
            "non-utf8-name", new String[] {"study", "the study has 1 reader(s); agreement needs at least 2"}));

        static String file(Kind k) {
            String[] o = OVERRIDES.get(k.kind());
            return o == null ? k.file() : o[0];
        }

        static String phrase(Kind k) {
            String[] o = OVERRIDES.get(k.kind());
            return o == null ? k.phrase() : o[1];
        }
    }
}
