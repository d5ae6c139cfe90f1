package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class InspectCommandTest {
    @TempDir
    static Path shared;
    static Path demo;

    @TempDir
    Path tmp;

    static CliRun run(String... args) {
        return CliRun.of(args);
    }

    @BeforeAll
    static void generateDemo() throws Exception {
        demo = shared.resolve("demo");
        CliRun r = run("demo", "--out", demo.toString(), "--size", "48,48,24", "--spacing", "1.6,1.6,5");
        assertEquals(0, r.code(), r.err());
    }

    static void mask(Path p, Geometry g) throws IOException {
        Files.createDirectories(p.getParent());
        byte[] b = new byte[(int) g.voxelCount()];
        b[0] = 1;
        NiftiWriter.writeLabels(p, LabelVolume.ofBytes(g, b));
    }

    static final Geometry G = Geometry.axisAligned(4, 4, 2, 1, 1, 1);

    /** Two centres of three readers and a one-reader centre: the design warnings, before any analysis. */
    @Test
    void designsThatCannotAnswerAreWarnedAbout() throws Exception {
        Path two = tmp.resolve("two");
        for (String c : new String[] {"esterhaven", "norvale"}) {
            for (int r = 1; r <= 3; r++) {
                mask(two.resolve(c).resolve(c.substring(0, 3) + r).resolve("case01.nii.gz"), G);
            }
        }
        CliRun r = run("inspect", two.toString());
        assertEquals(0, r.code(), r.out() + r.err());
        String o = r.out();
        assertTrue(o.contains("Design warnings (what this roster cannot answer, whatever the masks show):"), o);
        assertTrue(o.contains("  warning: The readers can be split between the centres in only 10 distinct ways, so the "
            + "smallest reachable p-value is 0.1, above α = 0.05"), o);
        assertTrue(o.contains("  warning: With two centres (esterhaven and norvale) each is measured against the other"), o);
        Path one = tmp.resolve("one");
        mask(one.resolve("esterhaven/est1/case01.nii.gz"), G);
        mask(one.resolve("esterhaven/est2/case01.nii.gz"), G);
        mask(one.resolve("norvale/nor1/case01.nii.gz"), G);
        mask(one.resolve("norvale/nor2/case01.nii.gz"), G);
        mask(one.resolve("quillbay/qui1/case01.nii.gz"), G);
        o = run("inspect", one.toString()).out();
        assertTrue(o.contains("  warning: Centre quillbay has one reader: a shift there cannot be told apart from that "
            + "reader's own bias"), o);
        // the demo's 3 x 3 roster can answer: no design warning
        assertFalse(run("inspect", demo.toString(), "--protocol", "protocols/demo.yaml").out().contains("Design warnings"));
    }

    @Test
    void demoStudyIsAnalysableAndListed() {
        CliRun r = run("inspect", demo.toString(), "--protocol", "protocols/demo.yaml");
        assertEquals(0, r.code(), r.out() + r.err());
        String o = r.out();
        assertTrue(o.contains("Centres (3), readers (9):"), o);
        assertTrue(o.contains("  esterhaven: est1, est2, est3\n"), o);
        assertTrue(o.contains("  norvale: nor1, nor2, nor3\n"), o);
        assertTrue(o.contains("  quillbay: qui1, qui2, qui3\n"), o);
        assertTrue(o.contains("Cases (10):"), o);
        for (int c = 1; c <= 10; c++) {
            assertTrue(o.contains(String.format("  case%02d  9/9", c)), o);
        }
        assertTrue(o.contains("  label 1: "), o);
        assertTrue(o.contains("  label 2: "), o);
        assertTrue(o.contains("lesion = labels {1,2}, surface tolerance 2 mm"), o);
        assertTrue(o.contains("Study: Lantern pilot (fictional demo)"), o);
        assertTrue(o.contains("Missing masks (0): none"), o);
        assertTrue(o.contains("Problems: 0 error(s), 0 warning(s), 0 note(s)"), o);
        assertTrue(o.contains("Result: the study can be analysed."), o);
        assertEquals("", r.err());
        // deterministic output: the same run prints the same text
        assertEquals(o, run("inspect", demo.toString(), "--protocol", "protocols/demo.yaml", "--threads", "1").out());
    }

    @Test
    void missingStudyExitsTwoWithOneLine() {
        CliRun r = run("inspect", tmp.resolve("nothing").toString());
        assertEquals(2, r.code());
        assertEquals("accordia: " + tmp.resolve("nothing") + ": study folder or manifest not found\n", r.err());
    }

    @Test
    void emptyStudyIsNotAnalysable() {
        CliRun r = run("inspect", tmp.toString());
        assertEquals(2, r.code());
        assertTrue(r.out().contains("ERROR: " + tmp.toAbsolutePath() + ": the study has no case"), r.out());
        assertTrue(r.out().contains("the study has 0 reader(s); agreement needs at least 2"), r.out());
        assertTrue(r.err().startsWith("accordia: "), r.err());
        assertFalse(r.err().contains("Exception"), r.err());
    }

    @Test
    void oneReaderStudyIsNotAnalysable() throws Exception {
        mask(tmp.resolve("alpha/r1/c1.nii.gz"), G);
        mask(tmp.resolve("alpha/r1/c2.nii.gz"), G);
        CliRun r = run("inspect", tmp.toString());
        assertEquals(2, r.code());
        assertTrue(r.out().contains("the study has 1 reader(s); agreement needs at least 2"), r.out());
        assertTrue(r.out().contains("NOTE: " + tmp + ": centre 'alpha' has a single reader (r1): within-centre disagreement is not estimable for it"),
            r.out());
    }

    @Test
    void unreadableMaskAndGeometryMismatchAreBothReported() throws Exception {
        mask(tmp.resolve("alpha/r1/c1.nii.gz"), G);
        mask(tmp.resolve("alpha/r2/c1.nii.gz"), Geometry.axisAligned(4, 4, 2, 1, 1, 2));
        mask(tmp.resolve("alpha/r1/c2.nii.gz"), G);
        Files.writeString(tmp.resolve("alpha/r2/c2.nii.gz"), "not a volume");
        CliRun r = run("inspect", tmp.toString());
        assertEquals(2, r.code());
        assertTrue(r.out().contains("Problems: 2 error(s)"), r.out());
        assertTrue(r.out().contains("ERROR: " + tmp.resolve("alpha/r2/c1.nii.gz") + ": grid differs from " + tmp.resolve("alpha/r1/c1.nii.gz")),
            r.out());
        assertTrue(r.out().contains("ERROR: " + tmp.resolve("alpha/r2/c2.nii.gz") + ": unreadable mask: "), r.out());
    }

    @Test
    void protocolErrorsExitTwoWithoutStackTrace() throws Exception {
        Path p = tmp.resolve("p.yaml");
        Files.writeString(p, "shift:\n  alpa: 0.1\n");
        CliRun r = run("inspect", demo.toString(), "--protocol", p.toString());
        assertEquals(2, r.code());
        assertEquals("accordia: " + p + ": shift.alpa: unknown key (allowed here: distance, alpha, permutations, "
            + "minimum_shift_mm, minimum_volume_shift_percent)\n", r.err());
        CliRun debug = run("inspect", demo.toString(), "--protocol", p.toString(), "--debug");
        assertTrue(debug.err().contains("at org.accordia"), "stack trace only with --debug");
    }

    @Test
    void parameterErrorsExitTwo() {
        CliRun r = run("inspect", demo.toString(), "--max-voxels", "lots");
        assertEquals(2, r.code());
        assertTrue(r.err().startsWith("accordia: Invalid value for option '--max-voxels'"), r.err());
        assertEquals(2, run("inspect").code());
        assertEquals(2, run("inspect", demo.toString(), "--max-voxels", "0").code());
    }

    @Test
    void voxelLimitMakesMasksUnreadable() {
        CliRun r = run("inspect", demo.toString(), "--max-voxels", "1000");
        assertEquals(2, r.code());
        assertTrue(r.out().contains("unreadable mask"), r.out());
    }

    @Test
    void manifestEscapeNeedsTheOption() throws Exception {
        Path study = Files.createDirectories(tmp.resolve("s"));
        mask(tmp.resolve("out/c1.nii.gz"), G);
        mask(study.resolve("a.nii.gz"), G);
        Files.writeString(study.resolve("manifest.csv"), "case,centre,reader,path\nc1,x,r1,a.nii.gz\nc1,x,r2,../out/c1.nii.gz\n");
        CliRun refused = run("inspect", study.toString());
        assertEquals(2, refused.code());
        assertTrue(refused.err().contains("manifest.csv: line 3: path '../out/c1.nii.gz': path leads outside the study root"),
            refused.err());
        CliRun allowed = run("inspect", study.toString(), "--allow-outside-root");
        assertEquals(0, allowed.code(), allowed.out() + allowed.err());
    }

    @Test
    void helpDescribesEveryOption() {
        CliRun r = run("inspect", "--help");
        assertEquals(0, r.code());
        for (String opt : new String[] {"--protocol", "--max-voxels", "--allow-outside-root", "--threads"}) {
            assertTrue(r.out().contains(opt), opt);
        }
        CliRun d = run("demo", "--help");
        assertEquals(0, d.code());
        assertTrue(d.out().contains("default: 20261202"), d.out());
    }

    @Test
    void demoRefusesBadSizes() {
        CliRun r = run("demo", "--out", tmp.resolve("x").toString(), "--size", "4,4");
        assertEquals(2, r.code());
        assertTrue(r.err().startsWith("accordia: --size needs three values"), r.err());
        CliRun s = run("demo", "--out", tmp.resolve("y").toString(), "--cases", "0");
        assertEquals(2, s.code());
        assertTrue(s.err().contains("cases must lie in 1..999"), s.err());
    }
}
