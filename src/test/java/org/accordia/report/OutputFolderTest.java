package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;
import org.accordia.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class OutputFolderTest {

    @TempDir
    Path tmp;

    private static List<String> names(Path dir) throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    @Test
    void createsAMissingFolder() throws Exception {
        Path out = tmp.resolve("a/b/out");
        OutputFolder f = OutputFolder.prepare(out, false);
        assertTrue(Files.isDirectory(out));
        assertEquals(out.toAbsolutePath().normalize(), f.dir());
    }

    @Test
    void refusesANonEmptyFolderWithoutForceAndChangesNothing() throws Exception {
        Path out = Files.createDirectories(tmp.resolve("out"));
        Files.writeString(out.resolve("report.html"), "old");
        Files.writeString(out.resolve("notes.txt"), "mine");
        InputException e = assertThrows(InputException.class, () -> OutputFolder.prepare(out, false));
        assertTrue(e.getMessage().startsWith(out.toString() + ": "), e.getMessage());
        assertTrue(e.getMessage().contains("--force"), e.getMessage());
        assertFalse(e.getMessage().contains("\n"));
        assertEquals(List.of("notes.txt", "report.html"), names(out));
    }

    @Test
    void refusesAFileAsFolder() throws Exception {
        Path file = Files.writeString(tmp.resolve("file"), "x");
        assertThrows(InputException.class, () -> OutputFolder.prepare(file, true));
    }

    @Test
    void forceRemovesReportAndSummaryFirstAndKeepsOtherFiles() throws Exception {
        Path out = Files.createDirectories(tmp.resolve("out"));
        Files.writeString(out.resolve("report.html"), "old");
        Files.writeString(out.resolve("summary.json"), "{}");
        Files.writeString(out.resolve("pairs.csv"), "old table");
        Path outside = Files.writeString(tmp.resolve("outside.txt"), "keep");
        OutputFolder.prepare(out, true);
        assertEquals(List.of("pairs.csv"), names(out));
        assertEquals("keep", Files.readString(outside));
    }

    @Test
    void forceRemovesALinkNotItsTarget() throws Exception {
        Path out = Files.createDirectories(tmp.resolve("out"));
        Path target = Files.writeString(tmp.resolve("precious.html"), "keep");
        Files.createSymbolicLink(out.resolve("report.html"), target);
        OutputFolder.prepare(out, true);
        assertEquals("keep", Files.readString(target));
        assertFalse(Files.exists(out.resolve("report.html"), java.nio.file.LinkOption.NOFOLLOW_LINKS));
    }

    @Test
    void staleTemporariesOfAKilledRunAreCleanedAndDoNotCountAsContent() throws Exception {
        Path out = Files.createDirectories(tmp.resolve("out"));
        // what a run killed inside writeAtomically leaves behind
        Files.writeString(out.resolve(".pairs.csv.partial-0123456789abcdef0123456789abcdef"), "half");
        OutputFolder.prepare(out, false);
        assertEquals(List.of(), names(out));
    }

    @Test
    void writesAtomicallyAndReplaces() throws Exception {
        OutputFolder f = OutputFolder.prepare(tmp.resolve("out"), false);
        f.writeString("pairs.csv", "one\n");
        Path p = f.writeString("pairs.csv", "two\n");
        assertEquals("two\n", Files.readString(p));
        Path sub = f.writeBytes("cases/case-01.png", new byte[] {1, 2, 3});
        assertArrayEquals(new byte[] {1, 2, 3}, Files.readAllBytes(sub));
        assertEquals(List.of("cases", "pairs.csv"), names(f.dir()));
        assertEquals(List.of("case-01.png"), names(f.dir().resolve("cases")));
    }

    @Test
    void aWriterKilledMidWriteLeavesNoFinalFileAndNoTemporary() throws Exception {
        OutputFolder f = OutputFolder.prepare(tmp.resolve("out"), false);
        IOException e = assertThrows(IOException.class, () -> f.writeAtomically("summary.json", out -> {
            out.write("{\"half\": ".getBytes(StandardCharsets.UTF_8));
            throw new IOException("simulated crash");
        }));
        // the failure names the folder and the file (the command line prints it as one line, exit 2)
        assertTrue(e instanceof OutputFolder.WriteFailure, e.toString());
        assertEquals(f.dir() + ": cannot write summary.json: simulated crash", e.getMessage());
        assertEquals(List.of(), names(f.dir()));
        // an unchecked failure behaves the same, and an existing file is left as it was
        f.writeString("summary.json", "old");
        assertThrows(IllegalStateException.class, () -> f.writeAtomically("summary.json", out -> {
            out.write(new byte[100_000]);
            throw new IllegalStateException("simulated bug");
        }));
        assertEquals(List.of("summary.json"), names(f.dir()));
        assertEquals("old", Files.readString(f.dir().resolve("summary.json")));
    }

    @ParameterizedTest
    @ValueSource(strings = {"../x", "../../x", "/etc/passwd", "a/../../x", "..", ".", "", "a//b", "a\\b",
        ".hidden", "a/.hidden", "case 1.csv", "x/", "C:x"})
    void refusesNamesThatEscapeOrAreUnsafe(String name) throws Exception {
        OutputFolder f = OutputFolder.prepare(tmp.resolve("out"), false);
        assertThrows(IllegalArgumentException.class, () -> f.writeString(name, "x"));
        assertEquals(List.of(), names(f.dir()));
        assertFalse(Files.exists(tmp.resolve("x")));
    }

    @Test
    void refusesToWriteThroughALinkedSubfolder() throws Exception {
        OutputFolder f = OutputFolder.prepare(tmp.resolve("out"), false);
        Path elsewhere = Files.createDirectories(tmp.resolve("elsewhere"));
        Files.createSymbolicLink(f.dir().resolve("cases"), elsewhere);
        assertThrows(IllegalArgumentException.class, () -> f.writeString("cases/a.png", "x"));
        assertEquals(List.of(), names(elsewhere));
    }

    @ParameterizedTest
    @ValueSource(strings = {"../../x", "/abs/path", "..", ".", "", "a/b", "a\\b", "<script>", "CON", "nul.txt",
        "ça va", "名前", "x-0123456789", "\u0000", ".hidden",
        "aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa"})
    void sanitisedNamesAreSafeSingleSegments(String name) throws Exception {
        String safe = OutputFolder.safeFileName(name);
        assertTrue(safe.matches("[A-Za-z0-9_-][A-Za-z0-9._-]*"), safe);
        assertTrue(safe.length() <= OutputFolder.MAX_SAFE_STEM + 11, safe);
        assertNotEquals(name, safe);
        assertEquals(safe, OutputFolder.safeFileName(name), "deterministic");
        OutputFolder f = OutputFolder.prepare(tmp.resolve("out"), true);
        Path p = f.writeString(safe + ".txt", "x");
        assertEquals(f.dir(), p.getParent());
    }

    @Test
    void safeNamesAreKeptAndDifferentNamesNeverCollide() {
        assertEquals("case_017", OutputFolder.safeFileName("case_017"));
        assertEquals("R1.left-lobe", OutputFolder.safeFileName("R1.left-lobe"));
        List<String> inputs = List.of("a b", "a_b", "a?b", "a/b", "a\\b", "a:b", "A b", ".ab", "_ab", "ab",
            "a".repeat(150), "a".repeat(151), "", "_", "..", "__");
        Set<String> outputs = new HashSet<>();
        for (String s : inputs) {
            outputs.add(OutputFolder.safeFileName(s));
        }
        assertEquals(inputs.size(), outputs.size(), outputs.toString());
    }

    @Test
    void randomNamesAreAlwaysSafeAndDistinct() {
        java.util.Random rnd = new java.util.Random(7);
        String alphabet = "aA0._-/\\: <>\"'|?*\u00e9\u4e2d\u0000.";
        Set<String> inputs = new HashSet<>();
        Set<String> outputs = new HashSet<>();
        for (int i = 0; i < 20_000; i++) {
            StringBuilder sb = new StringBuilder();
            int len = rnd.nextInt(12);
            for (int k = 0; k < len; k++) {
                sb.append(alphabet.charAt(rnd.nextInt(alphabet.length())));
            }
            String in = sb.toString();
            String out = OutputFolder.safeFileName(in);
            assertTrue(out.matches("[A-Za-z0-9_-][A-Za-z0-9._-]*"), in + " -> " + out);
            if (inputs.add(in)) {
                assertTrue(outputs.add(out), "collision for " + in + " -> " + out);
            }
        }
    }

    /** --out as a link to the study, a folder inside it (existing or not), or through a linked parent: refused. */
    @Test
    void anOutputFolderInsideTheStudyIsRefusedOnResolvedPaths() throws Exception {
        Path study = Files.createDirectories(tmp.resolve("study"));
        Path mask = Files.writeString(study.resolve("m.nii"), "x");
        Path link = Files.createSymbolicLink(tmp.resolve("link"), study);
        List<Path> inputs = List.of(mask);
        for (Path out : List.of(link, study, study.resolve("report"), link.resolve("new/deeper"), study.resolve("../study/x"))) {
            InputException e = assertThrows(InputException.class, () -> OutputFolder.requireOutsideStudy(out, study, inputs), out.toString());
            assertTrue(e.getMessage().contains("study folder"), e.getMessage());
        }
        OutputFolder.requireOutsideStudy(tmp.resolve("elsewhere"), study, inputs);
        // a manifest study whose input lies in the output folder
        Path outer = Files.createDirectories(tmp.resolve("outer"));
        Path input = Files.writeString(outer.resolve("in.nii"), "x");
        InputException e = assertThrows(InputException.class, () -> OutputFolder.requireOutsideStudy(outer, study, List.of(input)));
        assertTrue(e.getMessage().contains("holds input files"), e.getMessage());
        assertEquals(List.of("m.nii"), names(study));
    }

    /** An output path too long for the file system fails as a WriteFailure naming the folder. */
    @Test
    void anOverlongOutputPathIsAWriteFailure() {
        Path out = tmp.resolve("x".repeat(300));
        IOException e = assertThrows(IOException.class, () -> OutputFolder.prepare(out, false));
        assertTrue(e instanceof OutputFolder.WriteFailure, e.toString());
        assertTrue(e.getMessage().startsWith(out.toString()) && e.getMessage().contains("File name too long"), e.getMessage());
    }
}
