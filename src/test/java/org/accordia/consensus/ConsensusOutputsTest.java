package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.api.Test;

class ConsensusOutputsTest {

    @Test
    void probabilityMapAndBinaryMaskMatchPerVoxelOracle() {
        // W per voxel from the paper's per-voxel EM (BinaryStapleTest.perVoxelOracle) vs the map.
        SplittableRandom rnd = new SplittableRandom(31);
        int nx = 18;
        int ny = 15;
        int nz = 7;
        boolean[][] d = Fixtures.randomMasks(rnd, 4, nx, ny, nz);
        // keep the masks away from part of the grid so the union box is a real crop
        for (boolean[] m : d) {
            for (int i = 0; i < m.length; i++) {
                if (i % nx < 3) {
                    m[i] = false;
                }
            }
        }
        Geometry g = Geometry.axisAligned(nx, ny, nz, 1, 1, 1);
        List<LabelVolume> masks = new ArrayList<>();
        for (boolean[] m : d) {
            byte[] b = new byte[m.length];
            for (int i = 0; i < m.length; i++) {
                b[i] = (byte) (m[i] ? 2 : 0);
            }
            masks.add(LabelVolume.ofBytes(g, b));
        }
        PatternHistogram h = Fixtures.histogram(d);
        StapleResult res = BinaryStaple.run(h);
        double[][] o = BinaryStapleTest.perVoxelOracle(d, BinaryStapleTest.meanFraction(d), 1e-10, 10_000);
        float[] map = ConsensusOutputs.probabilityMap(masks, new int[] {2}, res);
        LabelVolume cons = ConsensusOutputs.binaryConsensus(masks, new int[] {2}, res, 0b1111, 5);
        // an output label beyond a byte takes the int store
        LabelVolume wide = ConsensusOutputs.binaryConsensus(masks, new int[] {2}, res, 0b1111, 300);
        org.junit.jupiter.api.Assertions.assertTrue(cons.isCompact());
        org.junit.jupiter.api.Assertions.assertFalse(wide.isCompact());
        ConsensusOutputs.BoxMap inBox = ConsensusOutputs.probabilityInBox(masks, new int[] {2}, res, null);
        for (int i = 0; i < map.length; i++) {
            assertEquals((float) o[2][i], map[i], 1e-6f);
            assertEquals(map[i], inBox.at(i % nx, i / nx % ny, i / (nx * ny)));
            assertEquals(o[2][i] >= 0.5 ? 5 : 0, cons.label(i));
            assertEquals(o[2][i] >= 0.5 ? 300 : 0, wide.label(i));
        }
    }

    @Test
    void labelConsensusFollowsTuples() {
        // Majority label per voxel, computed voxel by voxel, vs the label volume written from tuples.
        List<LabelVolume> vols = MultiLabelTest.randomVolumes(new SplittableRandom(5), 5, new int[] {0, 1, 4},
            13, 11, 9);
        LabelTupleHistogram h = LabelTupleHistogram.build(vols, new int[] {0, 1, 4});
        LabelVolume out = ConsensusOutputs.labelConsensus(vols, h, MajorityVote.labels(h, LabelTieRule.UNDECIDED));
        for (int i = 0; i < out.voxelCount(); i++) {
            int[] votes = new int[6];
            for (LabelVolume v : vols) {
                votes[v.label(i)]++;
            }
            int best = 0;
            boolean tie = false;
            for (int k = 1; k < votes.length; k++) {
                if (votes[k] > votes[best]) {
                    best = k;
                    tie = false;
                } else if (votes[k] == votes[best] && votes[k] > 0) {
                    tie = true;
                }
            }
            assertEquals(tie ? 5 : best, out.label(i), "voxel " + i);
        }
        MultiLabelStapleResult ml = MultiLabelStaple.run(h);
        LabelVolume st = ConsensusOutputs.labelConsensus(vols, ml);
        for (int i = 0; i < st.voxelCount(); i++) {
            int[] idx = new int[5];
            for (int j = 0; j < 5; j++) {
                idx[j] = java.util.Arrays.binarySearch(new int[] {0, 1, 4}, vols.get(j).label(i));
            }
            assertEquals(ml.consensusLabel(h.find(h.keyOf(idx))), st.label(i));
        }
    }
}
