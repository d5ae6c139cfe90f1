package org.accordia.consensus;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeMap;
import org.accordia.agreement.PatternHistogram;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class MultiLabelTest {

    /** Random label volumes: nested shells with labels from {@code labels}, perturbed per reader. */
    static List<LabelVolume> randomVolumes(SplittableRandom rnd, int readers, int[] labels, int nx, int ny, int nz) {
        Geometry g = Geometry.axisAligned(nx, ny, nz, 1, 1, 1);
        List<LabelVolume> out = new ArrayList<>();
        for (int j = 0; j < readers; j++) {
            int[] v = new int[nx * ny * nz];
            double shift = rnd.nextDouble() * 2 - 1;
            double noise = rnd.nextDouble() * 0.2;
            for (int z = 0; z < nz; z++) {
                for (int y = 0; y < ny; y++) {
                    for (int x = 0; x < nx; x++) {
                        double dd = Math.sqrt(Math.pow(x - nx / 2.0 - shift, 2) + Math.pow(y - ny / 2.0, 2)
                            + Math.pow(z - nz / 2.0, 2));
                        int k = Math.max(0, labels.length - 1 - (int) (dd / 2.0));
                        if (rnd.nextDouble() < noise) {
                            k = rnd.nextInt(labels.length);
                        }
                        v[x + nx * (y + ny * z)] = labels[k];
                    }
                }
            }
            out.add(LabelVolume.ofInts(g, v)); // byte storage when every label fits, int storage otherwise
        }
        return out;
    }

    /** Naive histogram: map from the tuple of label indices to its count. */
    static TreeMap<Long, Long> naive(List<LabelVolume> vols, int[] labels, int bits) {
        TreeMap<Long, Long> m = new TreeMap<>();
        for (int i = 0; i < vols.get(0).voxelCount(); i++) {
            long key = 0;
            for (int j = 0; j < vols.size(); j++) {
                int idx = Arrays.binarySearch(labels, vols.get(j).label(i));
                key |= (long) Math.max(idx, 0) << (bits * j);
            }
            m.merge(key, 1L, Long::sum);
        }
        return m;
    }

    @ParameterizedTest(name = "{0} readers, labels {1}")
    @CsvSource({
        "3, '0 1 2'",
        "9, '0 1 2 5'",
        "12, '0 3 7 9 11'",   // 12 x 3 bits = 36 > 20: hashed counting
        "5, '0 1 300 400'"     // int storage (a label above 255)
    })
    void tupleHistogramMatchesNaiveCount(int readers, String labelText) {
        int[] labels = Arrays.stream(labelText.split(" ")).mapToInt(Integer::parseInt).toArray();
        List<LabelVolume> vols = randomVolumes(new SplittableRandom(readers), readers, labels, 11, 9, 70);
        LabelTupleHistogram h = LabelTupleHistogram.build(vols, labels);
        TreeMap<Long, Long> m = naive(vols, labels, h.bitsPerReader());
        assertEquals(m.size(), h.size());
        int i = 0;
        for (var e : m.entrySet()) {
            assertEquals(e.getKey(), h.key(i));
            assertEquals(e.getValue(), h.count(i));
            i++;
        }
        assertEquals(11L * 9 * 70, h.total());
        assertEquals(h, LabelTupleHistogram.build(vols));
    }

    @Test
    void unlistedLabelsCountAsBackground() {
        Geometry g = Geometry.axisAligned(4, 1, 1, 1, 1, 1);
        LabelVolume a = LabelVolume.ofBytes(g, new byte[] {0, 1, 2, 9});
        LabelTupleHistogram h = LabelTupleHistogram.build(List.of(a), new int[] {0, 1, 2});
        assertEquals(2L, h.count(0)); // labels 0 and 9 → index 0
    }

    /**
     * Per-voxel oracle of multi-label STAPLE (Warfield et al. 2004, multi-label section; Rohlfing et
     * al. 2004): plain products over readers, voxel by voxel, same start and stopping rule.
     */
    static double[][] perVoxelOracle(int[][] d, int s, double tol, int maxIter, double[][][] thetaOut,
            boolean skipTies) {
        int r = d.length;
        int n = d[0].length;
        double[] f = new double[s];
        for (int[] row : d) {
            for (int v : row) {
                f[v] += 1.0 / (n * r);
            }
        }
        double[][] w = new double[n][s];
        for (int i = 0; i < n; i++) {
            int[] votes = new int[s];
            for (int j = 0; j < r; j++) {
                votes[d[j][i]]++;
            }
            int max = Arrays.stream(votes).max().getAsInt();
            long ties = Arrays.stream(votes).filter(v -> v == max).count();
            for (int k = 0; k < s; k++) {
                w[i][k] = votes[k] == max && !(skipTies && ties > 1) ? 1.0 / ties : 0;
            }
        }
        double[][][] last = null;
        for (int iter = 1; iter <= maxIter; iter++) {
            double[][][] th = new double[r][s][s];
            for (int j = 0; j < r; j++) {
                for (int k = 0; k < s; k++) {
                    double den = 0;
                    for (int i = 0; i < n; i++) {
                        den += w[i][k];
                        th[j][d[j][i]][k] += w[i][k];
                    }
                    for (int a = 0; a < s; a++) {
                        th[j][a][k] = den > 0 ? th[j][a][k] / den : Double.NaN;
                    }
                }
            }
            for (int i = 0; i < n; i++) {
                double sum = 0;
                double[] a = new double[s];
                for (int k = 0; k < s; k++) {
                    a[k] = f[k];
                    for (int j = 0; j < r; j++) {
                        a[k] *= Double.isNaN(th[j][d[j][i]][k]) ? 0 : th[j][d[j][i]][k];
                    }
                    sum += a[k];
                }
                for (int k = 0; k < s; k++) {
                    w[i][k] = a[k] / sum;
                }
            }
            boolean done = last != null;
            for (int j = 0; j < r && done; j++) {
                for (int a = 0; a < s; a++) {
                    for (int k = 0; k < s; k++) {
                        done &= Math.abs(th[j][a][k] - last[j][a][k]) <= tol
                            || Double.isNaN(th[j][a][k]) && Double.isNaN(last[j][a][k]);
                    }
                }
            }
            last = th;
            if (done) {
                break;
            }
        }
        for (int j = 0; j < r; j++) {
            thetaOut[j] = last[j];
        }
        return w;
    }

    @ParameterizedTest(name = "seed {0}, {1} readers, {2} labels, {3}")
    @CsvSource({"1, 3, 3, MAJORITY_WEIGHTS", "2, 5, 4, MAJORITY_WEIGHTS", "3, 7, 3, MAJORITY_WEIGHTS",
        "4, 4, 5, MAJORITY_WEIGHTS", "2, 5, 4, MAJORITY_CONFUSION", "5, 6, 3, MAJORITY_CONFUSION"})
    void emMatchesPerVoxelOracle(long seed, int readers, int labelCount, MultiLabelStart start) {
        int[] labels = new int[labelCount];
        for (int k = 0; k < labelCount; k++) {
            labels[k] = 2 * k; // 0, 2, 4, ...
        }
        List<LabelVolume> vols = randomVolumes(new SplittableRandom(seed), readers, labels, 12, 10, 6);
        LabelTupleHistogram h = LabelTupleHistogram.build(vols, labels);
        MultiLabelStapleResult res = MultiLabelStaple.run(h, StapleOptions.defaults(), 2 * labelCount, start);
        int n = vols.get(0).voxelCount();
        int[][] d = new int[readers][n];
        for (int j = 0; j < readers; j++) {
            for (int i = 0; i < n; i++) {
                d[j][i] = Arrays.binarySearch(labels, vols.get(j).label(i));
            }
        }
        double[][][] th = new double[readers][][];
        double[][] w = perVoxelOracle(d, labelCount, 1e-10, 10_000, th, start == MultiLabelStart.MAJORITY_CONFUSION);
        assertTrue(res.converged());
        for (int j = 0; j < readers; j++) {
            for (int a = 0; a < labelCount; a++) {
                assertArrayEquals(th[j][a], res.theta()[j][a], 1e-9);
            }
        }
        for (int i = 0; i < n; i++) {
            int[] idx = new int[readers];
            for (int j = 0; j < readers; j++) {
                idx[j] = d[j][i];
            }
            int t = h.find(h.keyOf(idx));
            assertArrayEquals(w[i], res.posterior()[t], 1e-9);
        }
        assertEquals(2 * labelCount, res.undecided());
        assertEquals(labels[labelCount - 1] + 1, UndecidedLabel.defaultFor(labels));
    }

    @Test
    void identicalReadersGiveIdentityConfusion() {
        // Closed form: identical readers → θ_j = identity for every label in use, consensus = their labels.
        Geometry g = Geometry.axisAligned(6, 1, 1, 1, 1, 1);
        byte[] v = {0, 1, 1, 2, 2, 2};
        List<LabelVolume> vols = List.of(LabelVolume.ofBytes(g, v), LabelVolume.ofBytes(g, v), LabelVolume.ofBytes(g, v));
        MultiLabelStapleResult res = MultiLabelStaple.run(LabelTupleHistogram.build(vols, new int[] {0, 1, 2}));
        for (int j = 0; j < 3; j++) {
            for (int a = 0; a < 3; a++) {
                for (int k = 0; k < 3; k++) {
                    assertEquals(a == k ? 1.0 : 0.0, res.theta(j, a, k), 0);
                }
            }
        }
        assertEquals(new TreeMap<>(java.util.Map.of(0, 1L, 1, 2L, 2, 3L)), res.consensusCounts());
    }

    @Test
    void exactTieIsUndecided() {
        // Two readers who disagree on every labelled voxel in a symmetric way: reader a says 1 where
        // b says 2 and vice versa, equally often; the posterior of such a tuple is symmetric → tie.
        Geometry g = Geometry.axisAligned(4, 1, 1, 1, 1, 1);
        LabelVolume a = LabelVolume.ofBytes(g, new byte[] {1, 2, 0, 0});
        LabelVolume b = LabelVolume.ofBytes(g, new byte[] {2, 1, 0, 0});
        LabelTupleHistogram h = LabelTupleHistogram.build(List.of(a, b), new int[] {0, 1, 2});
        MultiLabelStapleResult res = MultiLabelStaple.run(h);
        int t = h.find(h.keyOf(1, 2));
        assertEquals(3, res.consensusLabel(t));
        assertEquals(0, res.consensusLabel(h.find(h.keyOf(0, 0))));
        assertThrows(IllegalArgumentException.class,
            () -> MultiLabelStaple.run(h, StapleOptions.defaults(), 2));
        assertEquals(99, MultiLabelStaple.run(h, StapleOptions.defaults(), 99).consensusLabel(t));
    }

    @Test
    void majorityVoteTieRules() {
        // Binary: 4 readers; 2 marks is a tie → background by default, foreground with TIE_TO_FOREGROUND.
        PatternHistogram h = new PatternHistogram(4, new long[] {0b0001, 0b0011, 0b0111}, new long[] {1, 5, 2});
        assertArrayEquals(new boolean[] {false, false, true}, MajorityVote.binary(h, BinaryTieRule.TIE_TO_BACKGROUND));
        assertArrayEquals(new boolean[] {false, true, true}, MajorityVote.binary(h, BinaryTieRule.TIE_TO_FOREGROUND));
        assertEquals(2, MajorityVote.binaryCount(h, BinaryTieRule.TIE_TO_BACKGROUND));
        assertEquals(7, MajorityVote.binaryCount(h, BinaryTieRule.TIE_TO_FOREGROUND));
        // Multi-label: readers say (1, 2, 2) → 2; (1, 2, 0) → three-way tie → undecided or smallest (0).
        Geometry g = Geometry.axisAligned(2, 1, 1, 1, 1, 1);
        List<LabelVolume> vols = List.of(LabelVolume.ofBytes(g, new byte[] {1, 1}),
            LabelVolume.ofBytes(g, new byte[] {2, 2}), LabelVolume.ofBytes(g, new byte[] {2, 0}));
        LabelTupleHistogram lt = LabelTupleHistogram.build(vols, new int[] {0, 1, 2});
        int[] und = MajorityVote.labels(lt, LabelTieRule.UNDECIDED);
        int[] small = MajorityVote.labels(lt, LabelTieRule.SMALLER_LABEL);
        int tie = lt.find(lt.keyOf(1, 2, 0));
        int win = lt.find(lt.keyOf(1, 2, 2));
        assertEquals(3, und[tie]);
        assertEquals(0, small[tie]);
        assertEquals(2, und[win]);
        assertEquals(2, small[win]);
        assertThrows(IllegalArgumentException.class, () -> MajorityVote.labels(lt, LabelTieRule.UNDECIDED, 1));
    }
}
