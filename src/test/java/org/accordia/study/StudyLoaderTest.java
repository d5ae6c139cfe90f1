package org.accordia.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.accordia.io.InputException;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/** Discovery on empty placeholder files: only names matter here, no volume is opened. */
class StudyLoaderTest {
    @TempDir
    Path tmp;
    Path root;

    @BeforeEach
    void setUp() throws IOException {
        root = tmp.resolve("study");
        Files.createDirectories(root);
    }

    private Path touch(String rel) throws IOException {
        Path p = root.resolve(rel);
        Files.createDirectories(p.getParent());
        if (!Files.exists(p)) {
            Files.createFile(p);
        }
        return p;
    }

    /** Two centres; alpha has readers a1, a2; beta has b1. b1 did not read case2 (unbalanced). */
    private void layout() throws IOException {
        touch("alpha/a1/case1.nii.gz");
        touch("alpha/a1/case2.nii.gz");
        touch("alpha/a2/case1.nii.gz");
        touch("alpha/a2/case2.nii");
        touch("beta/b1/case1.nii");
        touch("images/case1.nii.gz");
    }

    private Path manifest(String name, String text) throws IOException {
        Path p = root.resolve(name);
        Files.writeString(p, text);
        return p;
    }

    private InputException refused(Path arg) {
        InputException e = assertThrows(InputException.class, () -> StudyLoader.load(arg, LoadOptions.DEFAULT));
        assertFalse(e.getMessage().contains("\n"), e.getMessage());
        return e;
    }

    @Test
    void layoutIsDiscoveredSortedWithMissingMasks() throws Exception {
        layout();
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertNull(s.manifest());
        assertEquals(List.of("alpha", "beta"), s.centres());
        assertEquals(List.of(new ReaderId("a1", "alpha"), new ReaderId("a2", "alpha"), new ReaderId("b1", "beta")), s.readers());
        assertEquals(List.of("case1", "case2"), s.cases());
        assertEquals(5, s.masks().size());
        assertEquals(List.of(new ReaderId("a1", "alpha"), new ReaderId("a2", "alpha"), new ReaderId("b1", "beta")),
            s.masksOf("case1").stream().map(MaskRef::reader).toList());
        assertEquals(root.resolve("beta/b1/case1.nii").toAbsolutePath().normalize(), s.masksOf("case1").get(2).path());
        assertEquals(root.resolve("images/case1.nii.gz").toAbsolutePath(), s.imageOf("case1"));
        assertNull(s.imageOf("case2"));
        assertEquals(List.of(new CaseReader("case2", new ReaderId("b1", "beta"))), s.missing());
        assertTrue(s.problems().isEmpty(), s.problems().toString());
    }

    @Test
    void layoutAndManifestGiveTheSameStudy() throws Exception {
        layout();
        Study fromLayout = StudyLoader.load(root, LoadOptions.DEFAULT);
        Path m = manifest("list.csv", String.join("\n",
            "case,centre,reader,path,image",
            "case2,alpha,a2,alpha/a2/case2.nii,",
            "case1,beta,b1,./beta/b1/case1.nii,images/case1.nii.gz",
            "case1,alpha,a1,alpha/a1/case1.nii.gz,images/case1.nii.gz",
            "case2,alpha,a1,alpha/a1/case2.nii.gz,",
            "case1,alpha,a2,alpha/a2/../a2/case1.nii.gz,images/case1.nii.gz", ""));
        Study fromManifest = StudyLoader.load(m, LoadOptions.DEFAULT);
        assertEquals(m.toAbsolutePath(), fromManifest.manifest());
        assertEquals(fromLayout.root(), fromManifest.root());
        assertEquals(fromLayout.centres(), fromManifest.centres());
        assertEquals(fromLayout.readers(), fromManifest.readers());
        assertEquals(fromLayout.cases(), fromManifest.cases());
        assertEquals(fromLayout.masks(), fromManifest.masks());
        assertEquals(fromLayout.images(), fromManifest.images());
        assertEquals(fromLayout.missing(), fromManifest.missing());
    }

    /** A UTF-8 byte-order mark, as spreadsheet programs write it, is not part of the first column's name. */
    @Test
    void manifestWithByteOrderMarkLoads() throws Exception {
        touch("x/r/c.nii.gz");
        touch("y/s/c.nii.gz");
        manifest("manifest.csv", "\uFEFFcase,centre,reader,path\nc,x,r,x/r/c.nii.gz\nc,y,s,y/s/c.nii.gz\n");
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(List.of("c"), s.cases());
        assertEquals(List.of("x", "y"), s.centres());
    }

    /** A manifest.csv that is a folder is refused, not skipped in favour of the layout. */
    @Test
    void manifestThatIsAFolderIsRefused() throws Exception {
        touch("x/r/c.nii.gz");
        Files.createDirectories(root.resolve("manifest.csv"));
        InputException e = refused(root);
        assertTrue(e.getMessage().contains("manifest.csv") && e.getMessage().contains("a folder, not a file"), e.getMessage());
    }

    @Test
    void folderWithManifestCsvUsesIt() throws Exception {
        touch("x/r/c.nii.gz");
        touch("y/s/c.nii.gz");
        manifest("manifest.csv", "case,centre,reader,path\nc,x,r,x/r/c.nii.gz\n");
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(root.resolve("manifest.csv").toAbsolutePath(), s.manifest());
        assertEquals(List.of("x"), s.centres());
    }

    @Test
    void hiddenAndNonVolumeFilesAreIgnoredAndNoted() throws Exception {
        layout();
        touch(".git/objects/x.nii.gz");
        touch("alpha/.hidden/case1.nii.gz");
        touch("alpha/a1/.case3.nii.gz");
        touch("alpha/a1/notes.txt");
        touch("README.txt");
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(List.of("case1", "case2"), s.cases());
        assertEquals(3, s.readers().size());
        List<String> lines = s.problems().stream().map(StudyProblem::line).toList();
        assertEquals(2, lines.size(), lines.toString());
        assertTrue(lines.stream().allMatch(l -> l.startsWith("NOTE: ")), lines.toString());
        assertTrue(lines.stream().anyMatch(l -> l.contains("notes.txt: ignored: not a volume file")), lines.toString());
    }

    @Test
    void missingStudyFolder() {
        Path nowhere = tmp.resolve("no-such-study");
        InputException e = refused(nowhere);
        assertEquals(nowhere + ": study folder or manifest not found", e.getMessage());
    }

    @Test
    void readerUnderTwoCentresInLayoutNamesBothFolders() throws Exception {
        touch("alpha/kim/case1.nii.gz");
        touch("beta/kim/case1.nii.gz");
        InputException e = refused(root);
        assertTrue(e.getMessage().contains("reader 'kim' appears under two centres"), e.getMessage());
        assertTrue(e.getMessage().contains(root.resolve("alpha/kim").toString()), e.getMessage());
        assertTrue(e.getMessage().contains(root.resolve("beta/kim").toString()), e.getMessage());
    }

    @Test
    void readerUnderTwoCentresInManifestNamesBothLines() throws Exception {
        Path m = manifest("m.csv", "case,centre,reader,path\nc1,alpha,kim,a.nii.gz\nc2,beta,kim,b.nii.gz\n");
        InputException e = refused(m);
        assertTrue(e.getMessage().startsWith(m.toAbsolutePath() + ": line 3: reader 'kim' is listed under centre 'beta' here "
            + "and under centre 'alpha' at line 2"), e.getMessage());
    }

    @Test
    void manifestWithTooFewColumns() throws Exception {
        Path m = manifest("m.csv", "case,centre,reader,path\nc1,alpha,r1,a.nii.gz\n\nc2,alpha,r1\n");
        InputException e = refused(m);
        assertEquals(m.toAbsolutePath() + ": line 4: 3 column(s), expected 4 (case,centre,reader,path)", e.getMessage());
    }

    @Test
    void manifestWithEmptyField() throws Exception {
        Path m = manifest("m.csv", "case,centre,reader,path\nc1,,r1,a.nii.gz\n");
        assertEquals(m.toAbsolutePath() + ": line 2: empty 'centre'", refused(m).getMessage());
    }

    @Test
    void manifestWithDuplicateRow() throws Exception {
        Path m = manifest("m.csv", "case,centre,reader,path\nc1,alpha,r1,a.nii.gz\nc1,alpha,r1,b.nii.gz\n");
        assertEquals(m.toAbsolutePath() + ": line 3: duplicate row for case 'c1' and reader 'r1' (first at line 2)",
            refused(m).getMessage());
    }

    @Test
    void manifestWithoutRequiredHeader() throws Exception {
        Path m = manifest("m.csv", "c1,alpha,r1,a.nii.gz\n");
        assertTrue(refused(m).getMessage().contains("line 1: unknown column 'c1'"));
        Path m2 = manifest("m2.csv", "case,centre,path\nc1,alpha,a.nii.gz\n");
        assertTrue(refused(m2).getMessage().contains("line 1: missing column 'reader'"));
    }

    @Test
    void manifestPathEscapingTheRootIsRefusedUnlessAllowed() throws Exception {
        Files.createFile(tmp.resolve("outside.nii.gz"));
        Path m = manifest("m.csv", "case,centre,reader,path\nc1,alpha,r1,a.nii.gz\nc1,alpha,r2,../outside.nii.gz\n");
        InputException e = refused(m);
        assertTrue(e.getMessage().startsWith(m.toAbsolutePath() + ": line 3: path '../outside.nii.gz': path leads outside the study root"),
            e.getMessage());
        Study allowed = StudyLoader.load(m, new LoadOptions(true));
        assertEquals(tmp.resolve("outside.nii.gz").toAbsolutePath(), allowed.masksOf("c1").get(1).path());
    }

    @Test
    void manifestPathEscapingThroughASymbolicLinkIsRefused() throws Exception {
        Path outside = Files.createDirectories(tmp.resolve("elsewhere"));
        Files.createFile(outside.resolve("x.nii.gz"));
        Files.createSymbolicLink(root.resolve("link"), outside);
        Path m = manifest("m.csv", "case,centre,reader,path\nc1,alpha,r1,link/x.nii.gz\n");
        InputException e = refused(m);
        assertTrue(e.getMessage().contains("line 2: path 'link/x.nii.gz': path resolves through a symbolic link outside"),
            e.getMessage());
    }

    @Test
    void layoutLinkEscapingTheRootIsAnError() throws Exception {
        layout();
        Path outside = Files.createDirectories(tmp.resolve("elsewhere/r9"));
        Files.createFile(outside.resolve("case1.nii.gz"));
        Files.createSymbolicLink(root.resolve("alpha/r9"), outside);
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(3, s.readers().size());
        assertEquals(StudyProblem.Severity.ERROR, s.problems().get(0).severity());
        assertTrue(s.problems().get(0).message().contains("outside the study root"), s.problems().toString());
        Study allowed = StudyLoader.load(root, new LoadOptions(true));
        assertEquals(4, allowed.readers().size());
    }

    @Test
    @Timeout(20)
    void symbolicLinkLoopsDoNotHangAndAreReported() throws Exception {
        layout();
        Files.createSymbolicLink(root.resolve("alpha/loop"), root.resolve("alpha"));
        Files.createSymbolicLink(root.resolve("alpha/a1/back"), root);
        Files.createSymbolicLink(root.resolve("again"), root);
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(3, s.readers().size());
        assertEquals(5, s.masks().size());
        List<String> loops = s.problems().stream().map(StudyProblem::line).filter(l -> l.contains("symbolic link loop")).toList();
        assertEquals(3, loops.size(), s.problems().toString());
        assertTrue(loops.stream().allMatch(l -> l.startsWith("WARNING: ")), loops.toString());
    }

    @Test
    void emptyFolderGivesAnEmptyStudy() throws Exception {
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertTrue(s.cases().isEmpty());
        assertTrue(s.readers().isEmpty());
    }

    @Test
    void twoMasksOfOneCaseForOneReaderAreAnError() throws Exception {
        layout();
        touch("alpha/a1/case1.nii");
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(StudyProblem.Severity.ERROR, s.problems().get(0).severity());
        assertTrue(s.problems().get(0).message().startsWith("second mask for case 'case1' of reader alpha/a1"),
            s.problems().toString());
    }

    @Test
    void longFileNamesAreReportedNotFatal() throws Exception {
        layout();
        String longName = "c".repeat(240) + ".nii.gz";
        touch("alpha/a1/" + longName);
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertTrue(s.cases().contains("c".repeat(240)));
    }

    /**
     * A name that was not valid text in the system encoding reaches Java with U+FFFD in place of
     * the bad bytes; such a file is reported and skipped. (Creating truly invalid bytes needs a
     * non-Java tool, so the decoded form is planted directly.)
     */
    @Test
    void undecodableFileNamesAreReportedNotFatal() throws Exception {
        layout();
        touch("alpha/a1/caf\uFFFD.nii.gz");
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(List.of("case1", "case2"), s.cases());
        assertTrue(s.problems().get(0).message().contains("not valid text"), s.problems().toString());
    }

    @Test
    void manifestThatIsNotUtf8IsRefused() throws Exception {
        Path m = root.resolve("m.csv");
        Files.write(m, new byte[] {'c', 'a', 's', 'e', ',', (byte) 0xff, '\n'});
        assertEquals(m.toAbsolutePath() + ": not valid UTF-8 text", refused(m).getMessage());
    }

    @Test
    void imageMustBeTheSameOnEveryRowOfACase() throws Exception {
        Path m = manifest("m.csv", "case,centre,reader,path,image\nc1,a,r1,x.nii.gz,i1.nii.gz\nc1,a,r2,y.nii.gz,i2.nii.gz\n");
        assertTrue(refused(m).getMessage().contains("line 3: case 'c1' has image 'i2.nii.gz' here but"));
    }
}
