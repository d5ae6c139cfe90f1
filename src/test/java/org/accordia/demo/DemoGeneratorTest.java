package org.accordia.demo;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import org.accordia.io.Geometry;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;
import org.accordia.study.LoadOptions;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class DemoGeneratorTest {
    /** Same field of view as the default demo, coarser grid, so the tests stay fast. */
    static final DemoSpec SMALL = DemoSpec.defaults().withRoster(4, 3, 3).withGrid(32, 32, 16, 2.4, 2.4, 7.5);

    static DemoSpec spec = DemoSpec.defaults();
    static DemoGenerator.Plan plan;
    static Geometry geometry;
    static List<List<LabelVolume>> masks = new ArrayList<>();

    @BeforeAll
    static void generateDefaultsInMemory() {
        plan = DemoGenerator.plan(spec);
        geometry = Geometry.axisAligned(spec.nx(), spec.ny(), spec.nz(), spec.sxMm(), spec.syMm(), spec.szMm());
        for (int c = 0; c < spec.cases(); c++) {
            masks.add(DemoGenerator.generateCase(spec, plan, c, geometry).masks());
        }
    }

    @Test
    void sameSeedGivesByteIdenticalFilesAndAnotherSeedDoesNot(@TempDir Path tmp) throws Exception {
        DemoGenerator.generate(SMALL, tmp.resolve("a"));
        DemoGenerator.generate(SMALL, tmp.resolve("b"), 3);
        DemoGenerator.generate(SMALL.withSeed(7), tmp.resolve("c"));
        List<Path> files;
        try (Stream<Path> w = Files.walk(tmp.resolve("a"))) {
            files = w.filter(Files::isRegularFile).map(p -> tmp.resolve("a").relativize(p)).sorted().toList();
        }
        // 4 cases x 9 readers, 4 images, manifest.csv, demo-truth.json, protocol.yaml
        assertEquals(4 * 9 + 4 + 3, files.size(), files.toString());
        int differ = 0;
        for (Path rel : files) {
            byte[] a = Files.readAllBytes(tmp.resolve("a").resolve(rel));
            assertArrayEquals(a, Files.readAllBytes(tmp.resolve("b").resolve(rel)), rel.toString());
            if (!Arrays.equals(a, Files.readAllBytes(tmp.resolve("c").resolve(rel)))) {
                differ++;
            }
        }
        assertTrue(differ >= 4 * 9, "another seed changes the masks: " + differ);
    }

    @Test
    void layoutAndManifestOfTheOutputAgree(@TempDir Path tmp) throws Exception {
        Path out = tmp.resolve("study");
        DemoTruth truth = DemoGenerator.generate(SMALL, out);
        Study viaManifest = StudyLoader.load(out, LoadOptions.DEFAULT);
        Study viaLayout = StudyLoader.loadLayout(out, LoadOptions.DEFAULT);
        assertNotNull(viaManifest.manifest());
        assertEquals(viaLayout.masks(), viaManifest.masks());
        assertEquals(viaLayout.images(), viaManifest.images());
        assertEquals(List.of("esterhaven", "norvale", "quillbay"), viaManifest.centres());
        assertEquals(9, viaManifest.readers().size());
        assertEquals(List.of("case01", "case02", "case03", "case04"), viaManifest.cases());
        assertTrue(viaManifest.missing().isEmpty());
        assertEquals(truth, DemoTruth.read(out.resolve(DemoTruth.FILE_NAME)));
        assertEquals(4, viaManifest.images().size());
        Geometry g = Volumes.readGeometry(viaManifest.imageOf("case01"), ReadLimits.DEFAULT);
        assertEquals("32x32x16", g.dimsText());
    }

    @Test
    void refusesANonEmptyOutputFolder(@TempDir Path tmp) throws Exception {
        Files.writeString(tmp.resolve("keep.txt"), "x");
        InputException e = assertThrows(InputException.class, () -> DemoGenerator.generate(SMALL, tmp));
        assertTrue(e.getMessage().contains("not empty"), e.getMessage());
    }

    /** Exact first: the bounding-box path must equal evaluating the shape on every voxel. */
    @Test
    void boundingBoxPathEqualsWholeGridEvaluation() {
        DemoGenerator.Plan p = DemoGenerator.plan(SMALL);
        Geometry g = Geometry.axisAligned(32, 32, 16, 2.4, 2.4, 7.5);
        for (int c = 0; c < SMALL.cases(); c++) {
            List<LabelVolume> fast = DemoGenerator.generateCase(SMALL, p, c, g, false).masks();
            List<LabelVolume> slow = DemoGenerator.generateCase(SMALL, p, c, g, true).masks();
            for (int r = 0; r < fast.size(); r++) {
                assertArrayEquals(slow.get(r).bytes(), fast.get(r).bytes(), "case " + c + " reader " + r);
            }
        }
        for (int c = 0; c < 3; c++) {
            List<LabelVolume> fast = masks.get(c);
            List<LabelVolume> slow = DemoGenerator.generateCase(spec, plan, c, geometry, true).masks();
            for (int r = 0; r < fast.size(); r++) {
                assertArrayEquals(slow.get(r).bytes(), fast.get(r).bytes(), "default case " + c + " reader " + r);
            }
        }
    }

    @Test
    void shiftedCentreDrawsWiderInEveryOrdinaryCase() {
        DemoTruth t = plan.truth();
        assertEquals("norvale", t.shiftedCentre());
        assertEquals(1.5, t.centreShiftMm());
        for (int c = 0; c < spec.cases(); c++) {
            if (plan.hard()[c]) {
                continue;
            }
            double shifted = 0;
            double others = 0;
            for (int r = 0; r < plan.readers().size(); r++) {
                long n = foreground(masks.get(c).get(r));
                if (plan.readers().get(r).centre().equals(t.shiftedCentre())) {
                    shifted += n / 3.0;
                } else {
                    others += n / 6.0;
                }
            }
            // a 1.5 mm wider margin on a lesion of about 8 mm mean radius adds well over 30 % volume
            assertTrue(shifted > 1.3 * others, "case " + c + ": " + shifted + " vs " + others);
        }
    }

    @Test
    void missingReaderMissesTheSecondLesionExactlyInTheRecordedCases() {
        DemoTruth t = plan.truth();
        assertEquals(3, t.missedLesionCases().size());
        assertFalse(t.missingLesionCentre().equals(t.shiftedCentre()));
        int missing = plan.missingReader();
        assertEquals(t.missingLesionReader(), plan.readers().get(missing).name());
        int checked = 0;
        for (int c = 0; c < spec.cases(); c++) {
            if (!plan.secondLesion()[c]) {
                continue;
            }
            List<LabelVolume> m = masks.get(c);
            byte[] majority = new byte[m.get(0).voxelCount()];
            for (int i = 0; i < majority.length; i++) {
                int votes = 0;
                for (int r = 0; r < m.size(); r++) {
                    if (r != missing && m.get(r).label(i) != 0) {
                        votes++;
                    }
                }
                majority[i] = (byte) (votes * 2 > m.size() - 1 ? 1 : 0);
            }
            int[] comp = components(majority, geometry);
            int smallest = smallestComponent(comp);
            assertTrue(smallest > 0, "case " + c + " has two separate lesions in the others' majority");
            boolean missed = t.missedLesionCases().contains(plan.caseIds().get(c));
            for (int r = 0; r < m.size(); r++) {
                long inSmall = 0;
                for (int i = 0; i < comp.length; i++) {
                    if (comp[i] == smallest && m.get(r).label(i) != 0) {
                        inSmall++;
                    }
                }
                if (r == missing && missed) {
                    assertEquals(0, inSmall, "case " + c + ": the missing reader draws nothing there");
                } else {
                    assertTrue(inSmall > 0, "case " + c + " reader " + r + " draws the second lesion");
                }
            }
            checked++;
        }
        assertTrue(checked >= 3);
    }

    @Test
    void coreOnlyInRecordedCasesAndAlwaysInsideTheLesion() {
        for (int c = 0; c < spec.cases(); c++) {
            boolean core = plan.core()[c];
            boolean anyCore = false;
            for (LabelVolume v : masks.get(c)) {
                assertTrue(v.maxLabel() <= 2);
                anyCore |= v.maxLabel() == 2;
                if (v.maxLabel() == 2) {
                    // label 2 voxels never touch background directly along x (core lies inside label 1)
                    int nx = geometry.nx();
                    for (int i = 1; i < v.voxelCount() - 1; i++) {
                        if (v.label(i) == 2 && i % nx != 0 && i % nx != nx - 1) {
                            assertTrue(v.label(i - 1) != 0 && v.label(i + 1) != 0, "core inside lesion");
                        }
                    }
                }
            }
            assertEquals(core, anyCore, "case " + c);
        }
    }

    /** Smooth boundary noise, not white noise: hardly any voxel is isolated from its 6 neighbours. */
    @Test
    void boundariesAreSmooth() {
        long isolated = 0;
        long total = 0;
        int nx = geometry.nx();
        int ny = geometry.ny();
        int nz = geometry.nz();
        for (List<LabelVolume> cs : masks) {
            for (LabelVolume v : cs) {
                for (int z = 1; z < nz - 1; z++) {
                    for (int y = 1; y < ny - 1; y++) {
                        for (int x = 1; x < nx - 1; x++) {
                            if (v.label(x, y, z) == 0) {
                                continue;
                            }
                            total++;
                            if (v.label(x - 1, y, z) == 0 && v.label(x + 1, y, z) == 0 && v.label(x, y - 1, z) == 0
                                && v.label(x, y + 1, z) == 0 && v.label(x, y, z - 1) == 0 && v.label(x, y, z + 1) == 0) {
                                isolated++;
                            }
                        }
                    }
                }
            }
        }
        assertTrue(total > 100_000, "enough foreground: " + total);
        assertTrue(isolated * 1000 < total, isolated + " isolated of " + total);
    }

    @Test
    void hardCasesDisagreeMoreThanAnyOrdinaryCase() {
        double worstOrdinary = 1;
        double bestHard = 0;
        for (int c = 0; c < spec.cases(); c++) {
            double med = medianDice(masks.get(c));
            if (plan.hard()[c]) {
                bestHard = Math.max(bestHard, med);
            } else {
                worstOrdinary = Math.min(worstOrdinary, med);
            }
        }
        assertTrue(bestHard < worstOrdinary, bestHard + " vs " + worstOrdinary);
        assertTrue(bestHard < 0.70, "hard cases fall below the default adjudication Dice: " + bestHard);
    }

    static long foreground(LabelVolume v) {
        long n = 0;
        for (int i = 0; i < v.voxelCount(); i++) {
            if (v.label(i) != 0) {
                n++;
            }
        }
        return n;
    }

    /** Median over reader pairs of Dice = 2|A∩B| / (|A|+|B|) (Dice 1945, Ecology 26:297). */
    static double medianDice(List<LabelVolume> m) {
        List<Double> d = new ArrayList<>();
        for (int a = 0; a < m.size(); a++) {
            for (int b = a + 1; b < m.size(); b++) {
                long both = 0;
                long na = 0;
                long nb = 0;
                for (int i = 0; i < m.get(a).voxelCount(); i++) {
                    boolean x = m.get(a).label(i) != 0;
                    boolean y = m.get(b).label(i) != 0;
                    na += x ? 1 : 0;
                    nb += y ? 1 : 0;
                    both += x && y ? 1 : 0;
                }
                d.add(2.0 * both / (na + nb));
            }
        }
        d.sort(null);
        int n = d.size();
        return n % 2 == 1 ? d.get(n / 2) : (d.get(n / 2 - 1) + d.get(n / 2)) / 2;
    }

    /** 6-connected components of a binary mask (breadth-first); 0 = background, 1.. = component. */
    static int[] components(byte[] mask, Geometry g) {
        int nx = g.nx();
        int ny = g.ny();
        int nz = g.nz();
        int[] comp = new int[mask.length];
        int next = 0;
        int[] queue = new int[mask.length];
        for (int s = 0; s < mask.length; s++) {
            if (mask[s] == 0 || comp[s] != 0) {
                continue;
            }
            next++;
            int head = 0;
            int tail = 0;
            queue[tail++] = s;
            comp[s] = next;
            while (head < tail) {
                int i = queue[head++];
                int x = i % nx;
                int y = (i / nx) % ny;
                int z = i / (nx * ny);
                int[][] nb = {{x - 1, y, z}, {x + 1, y, z}, {x, y - 1, z}, {x, y + 1, z}, {x, y, z - 1}, {x, y, z + 1}};
                for (int[] q : nb) {
                    if (q[0] < 0 || q[1] < 0 || q[2] < 0 || q[0] >= nx || q[1] >= ny || q[2] >= nz) {
                        continue;
                    }
                    int j = q[0] + nx * (q[1] + ny * q[2]);
                    if (mask[j] != 0 && comp[j] == 0) {
                        comp[j] = next;
                        queue[tail++] = j;
                    }
                }
            }
        }
        return comp;
    }

    /** The smallest component's number when there are at least two, else 0. */
    static int smallestComponent(int[] comp) {
        int max = Arrays.stream(comp).max().orElse(0);
        if (max < 2) {
            return 0;
        }
        long[] sizes = new long[max + 1];
        for (int c : comp) {
            sizes[c]++;
        }
        int best = 1;
        for (int c = 2; c <= max; c++) {
            if (sizes[c] < sizes[best]) {
                best = c;
            }
        }
        return best;
    }

    /** The row evaluation of the smooth field equals point-wise trilinear interpolation. */
    @Test
    void smoothFieldRowEqualsPointwise() {
        SmoothField f = new SmoothField(new double[] {-3, 1, 2}, new double[] {40, 30, 25}, 7.0, 2.0,
            new java.util.SplittableRandom(5));
        double[] row = new double[60];
        for (double z : new double[] {-10, 2, 13.3, 25, 40}) {
            for (double y : new double[] {-5, 1, 17.25, 29.9, 50}) {
                f.row(-8, 0.9, row.length, y, z, row);
                for (int i = 0; i < row.length; i++) {
                    assertEquals(f.value(-8 + i * 0.9, y, z), row[i], 1e-9);
                    assertTrue(Math.abs(row[i]) <= f.bound() + 1e-12);
                }
            }
        }
    }

    /** protocols/demo.yaml is the generator's protocol resource, byte for byte (one source). */
    @Test
    void demoProtocolFileEqualsTheResource() throws Exception {
        assertEquals(DemoGenerator.protocolYaml(), Files.readString(Path.of("protocols/demo.yaml")));
        org.accordia.study.Protocol p = org.accordia.study.Protocol.load(Path.of("protocols/demo.yaml"));
        assertEquals(2, p.structures().size());
    }

    /** The committed demo-masks/ is exactly what `accordia demo --out demo-masks` writes (docs/demo.md). */
    @Test
    void committedDemoStudyMatchesTheDefaultGeneration(@TempDir Path tmp) throws Exception {
        Path committed = Path.of("demo-masks");
        DemoGenerator.generate(DemoSpec.defaults(), tmp.resolve("fresh"));
        List<Path> fresh;
        try (Stream<Path> w = Files.walk(tmp.resolve("fresh"))) {
            fresh = w.filter(Files::isRegularFile).map(p -> tmp.resolve("fresh").relativize(p)).sorted().toList();
        }
        List<Path> kept;
        try (Stream<Path> w = Files.walk(committed)) {
            kept = w.filter(Files::isRegularFile).map(committed::relativize).sorted().toList();
        }
        assertEquals(fresh, kept);
        for (Path rel : fresh) {
            assertArrayEquals(Files.readAllBytes(tmp.resolve("fresh").resolve(rel)), Files.readAllBytes(committed.resolve(rel)),
                rel.toString());
        }
    }
}
