package org.accordia.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.accordia.io.Geometry;
import org.accordia.io.ImageVolume;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.accordia.io.ReadLimits;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class CaseLoaderTest {
    @TempDir
    Path root;

    static final Geometry G = Geometry.axisAligned(6, 5, 4, 0.8, 0.8, 2.5);

    /** A mask whose voxel i holds label i % (labels + 1). */
    static LabelVolume mask(Geometry g, int labels) {
        byte[] b = new byte[(int) g.voxelCount()];
        for (int i = 0; i < b.length; i++) {
            b[i] = (byte) (i % (labels + 1));
        }
        return LabelVolume.ofBytes(g, b);
    }

    Path write(String rel, LabelVolume v) throws IOException {
        Path p = root.resolve(rel);
        Files.createDirectories(p.getParent());
        NiftiWriter.writeLabels(p, v);
        return p;
    }

    @Test
    void readsEveryMaskSortedAndAligned() throws Exception {
        write("b/r3/c1.nii.gz", mask(G, 1));
        write("a/r1/c1.nii.gz", mask(G, 2));
        write("a/r2/c1.nii.gz", mask(G, 3));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        LoadedCase c = CaseLoader.load(s, "c1", Protocol.defaults(), false);
        assertEquals(List.of(new ReaderId("r1", "a"), new ReaderId("r2", "a"), new ReaderId("r3", "b")), c.readers());
        assertEquals(List.of(2, 3, 1), c.masks().stream().map(LabelVolume::maxLabel).toList());
        assertNull(G.differenceFrom(c.geometry(), 1e-5), "float32 header round trip");
    }

    @Test
    void spacingWithinToleranceIsAccepted() throws Exception {
        write("a/r1/c1.nii.gz", mask(G, 1));
        write("a/r2/c1.nii.gz", mask(Geometry.axisAligned(6, 5, 4, 0.8 + 1e-5, 0.8, 2.5), 1));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertEquals(2, CaseLoader.load(s, "c1", Protocol.defaults(), false).masks().size());
    }

    @Test
    void geometryMismatchNamesBothFilesAndTheDifference() throws Exception {
        Path first = write("a/r1/c1.nii.gz", mask(G, 1));
        Path second = write("a/r2/c1.nii.gz", mask(Geometry.axisAligned(6, 5, 4, 0.8, 0.8, 3.0), 1));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        InputException e = assertThrows(InputException.class, () -> CaseLoader.load(s, "c1", Protocol.defaults(), false));
        assertEquals(second.toAbsolutePath(), e.file());
        assertTrue(e.getMessage().contains(first.toAbsolutePath().toString()), e.getMessage());
        assertTrue(e.getMessage().contains("spacing along axis 2 differs by 0.500000 mm (2.50000 vs 3.00000)"), e.getMessage());
    }

    @Test
    void dimensionMismatchIsRefused() throws Exception {
        write("a/r1/c1.nii.gz", mask(G, 1));
        write("a/r2/c1.nii.gz", mask(Geometry.axisAligned(6, 5, 5, 0.8, 0.8, 2.5), 1));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        InputException e = assertThrows(InputException.class, () -> CaseLoader.load(s, "c1", Protocol.defaults(), false));
        assertTrue(e.getMessage().contains("dimensions 6x5x4 vs 6x5x5"), e.getMessage());
    }

    @Test
    void unreadableMaskIsAnInputException() throws Exception {
        write("a/r1/c1.nii.gz", mask(G, 1));
        Path bad = root.resolve("a/r2/c1.nii.gz");
        Files.createDirectories(bad.getParent());
        Files.write(bad, new byte[] {1, 2, 3, 4, 5});
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        InputException e = assertThrows(InputException.class, () -> CaseLoader.load(s, "c1", Protocol.defaults(), false));
        assertEquals(bad.toAbsolutePath(), e.file());
    }

    @Test
    void voxelLimitIsApplied() throws Exception {
        write("a/r1/c1.nii.gz", mask(G, 1));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        assertThrows(InputException.class, () -> CaseLoader.load(s, "c1", new ReadLimits(100, false), 0.001));
    }

    @Test
    void imageMustShareTheMasksGrid() throws Exception {
        write("a/r1/c1.nii.gz", mask(G, 1));
        write("a/r1/c2.nii.gz", mask(G, 1));
        Files.createDirectories(root.resolve("images"));
        NiftiWriter.writeImage(root.resolve("images/c1.nii.gz"), new ImageVolume(G, new float[120]));
        Geometry other = Geometry.axisAligned(6, 5, 4, 1, 1, 1);
        NiftiWriter.writeImage(root.resolve("images/c2.nii.gz"), new ImageVolume(other, new float[120]));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        ImageVolume img = CaseLoader.loadImage(s, "c1", G, ReadLimits.DEFAULT, 0.001);
        assertNull(G.differenceFrom(img.geometry(), 1e-5));
        InputException e = assertThrows(InputException.class, () -> CaseLoader.loadImage(s, "c2", G, ReadLimits.DEFAULT, 0.001));
        assertTrue(e.getMessage().contains("image grid differs from the masks of case 'c2'"), e.getMessage());
        assertNull(CaseLoader.loadImage(StudyLoader.load(root.resolve("a"), LoadOptions.DEFAULT), "c1", G, ReadLimits.DEFAULT, 0.001));
    }

    @Test
    void inspectorCollectsEveryProblem() throws Exception {
        write("a/r1/c1.nii.gz", mask(G, 2));
        write("a/r2/c1.nii.gz", mask(Geometry.axisAligned(6, 5, 4, 0.8, 0.8, 3.0), 2));
        write("a/r1/c2.nii.gz", mask(G, 2));
        Path bad = root.resolve("a/r2/c2.nii.gz");
        Files.write(bad, new byte[] {0});
        write("b/r9/c3.nii.gz", mask(G, 5));
        Study s = StudyLoader.load(root, LoadOptions.DEFAULT);
        Protocol p = new Protocol(null, List.of(new Structure("x", List.of(1, 2, 7), 2.0)), 0.001,
            ReadLimits.ARRAY_LIMIT, 1, Protocol.defaults().agreement(), Protocol.defaults().consensus(),
            Protocol.defaults().shift(), Protocol.defaults().review());
        InspectionReport r = Inspector.inspect(s, p, ReadLimits.DEFAULT, 2);
        List<String> lines = r.problems().stream().map(StudyProblem::line).toList();
        String all = String.join("\n", lines);
        assertTrue(all.contains("ERROR: " + root.resolve("a/r2/c1.nii.gz") + ": grid differs from"), all);
        assertTrue(all.contains("ERROR: " + bad + ": unreadable mask"), all);
        assertTrue(all.contains("case 'c3' has 1 reader(s)"), all);
        assertTrue(all.contains("structure 'x': label 7 is never seen"), all);
        assertTrue(all.contains("label 3 is seen"), all);
        assertTrue(all.contains("centre 'b' has a single reader (r9)"), all);
        assertEquals(2, r.count(StudyProblem.Severity.ERROR), all);
        assertEquals(false, r.analysable());
        // labels seen: 120 voxels per mask, label v appears at i % (L+1) == v
        // c1/r1 (L=2): labels 1,2: 40 each; c1/r2 (L=2, other grid, still counted): 40 each;
        // c2/r1: 40 each; c3/r9 (L=5): 20 each of 1..5
        assertEquals(Map.of(1, 140L, 2, 140L, 3, 20L, 4, 20L, 5, 20L), r.labelVoxels());
    }
}
