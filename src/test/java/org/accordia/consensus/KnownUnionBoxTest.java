package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.accordia.grid.Box;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The overloads that take an already known union box (as the agreement engine has it) give exactly
 * what the plain methods give, which compute the box themselves; so does any larger box (the
 * voxels outside the union have pattern 0 whatever the box). The plain methods are checked
 * against per-voxel oracles in SignedSurfaceTest, ConsensusOutputsTest and CaseReferencesTest.
 */
class KnownUnionBoxTest {

    @ParameterizedTest(name = "seed {0}, {1} readers")
    @CsvSource({"31, 3", "32, 6", "33, 9"})
    void knownBoxGivesTheSameOutputs(long seed, int nReaders) {
        SplittableRandom rnd = new SplittableRandom(seed);
        boolean[][] small = Fixtures.randomMasks(rnd, nReaders, 12, 12, 5);
        // placed inside a larger grid so that the union box is a strict part of it
        int nx = 23;
        int ny = 19;
        int nz = 9;
        Geometry g = Geometry.axisAligned(nx, ny, nz, 0.7, 0.8, 1.5);
        List<LabelVolume> masks = new ArrayList<>();
        boolean[][] full = new boolean[nReaders][nx * ny * nz];
        for (int j = 0; j < nReaders; j++) {
            byte[] b = new byte[nx * ny * nz];
            for (int z = 0; z < 5; z++) {
                for (int y = 0; y < 12; y++) {
                    for (int x = 0; x < 12; x++) {
                        if (small[j][x + 12 * (y + 12 * z)]) {
                            int i = (x + 6) + nx * ((y + 4) + ny * (z + 2));
                            b[i] = 1;
                            full[j][i] = true;
                        }
                    }
                }
            }
            masks.add(LabelVolume.ofBytes(g, b));
        }
        List<String> readers = new ArrayList<>();
        List<String> centres = new ArrayList<>();
        for (int j = 0; j < nReaders; j++) {
            readers.add("r" + j);
            centres.add("c" + (j % 3));
        }
        CaseReferences refs = CaseReferences.compute("case", "organ", readers, centres, Fixtures.histogram(full),
            0.001, StapleOptions.defaults());
        int[] labels = {1};
        Box union = Patterns.unionBox(masks, Patterns.lut(labels));
        assertNotEquals(Box.grid(nx, ny, nz), union);
        Box larger = union.grow(2, nx, ny, nz);
        List<ReaderPerformance> plain = refs.rowsWithSurfaces(masks, labels);
        assertEquals(plain, refs.rowsWithSurfaces(masks, labels, union));
        assertEquals(plain, refs.rowsWithSurfaces(masks, labels, larger));
        float[] map = ConsensusOutputs.probabilityMap(masks, labels, refs.all());
        assertArrayEquals(map, ConsensusOutputs.probabilityMap(masks, labels, refs.all(), union));
        assertArrayEquals(map, ConsensusOutputs.probabilityMap(masks, labels, refs.all(), larger));
        long keep = refs.keepMask("all", 0);
        LabelVolume bin = ConsensusOutputs.binaryConsensus(masks, labels, refs.all(), keep, 1);
        for (Box b : new Box[] {union, larger}) {
            LabelVolume other = ConsensusOutputs.binaryConsensus(masks, labels, refs.all(), keep, 1, b);
            for (int i = 0; i < bin.voxelCount(); i++) {
                assertEquals(bin.label(i), other.label(i));
            }
        }
    }
}
