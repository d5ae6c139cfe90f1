package org.accordia.consensus;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;

/**
 * Timing of the consensus step on a synthetic case (not a unit test; run by hand):
 * 9 readers in 3 centres, 256×256×128 voxels, two nested structures (labels 1 and 2).
 *
 * <pre>
 * mvn -o -q test-compile dependency:build-classpath -Dmdep.outputFile=/tmp/cp.txt
 * java -cp target/classes:target/test-classes:$(cat /tmp/cp.txt) org.accordia.consensus.ConsensusBenchmark
 * </pre>
 */
public final class ConsensusBenchmark {
    private static final java.lang.management.ThreadMXBean CPU =
        java.lang.management.ManagementFactory.getThreadMXBean();

    private ConsensusBenchmark() {
    }

    public static void main(String[] args) {
        int nx = 256;
        int ny = 256;
        int nz = 128;
        int readers = 9;
        Geometry g = Geometry.axisAligned(nx, ny, nz, 0.8, 0.8, 1.5);
        SplittableRandom rnd = new SplittableRandom(2026);
        List<LabelVolume> masks = new ArrayList<>();
        for (int j = 0; j < readers; j++) {
            double scale = 0.9 + 0.2 * rnd.nextDouble();
            double sx = rnd.nextDouble() * 4 - 2;
            double sy = rnd.nextDouble() * 4 - 2;
            byte[] b = new byte[nx * ny * nz];
            for (int z = 0; z < nz; z++) {
                for (int y = 0; y < ny; y++) {
                    for (int x = 0; x < nx; x++) {
                        double dx = (x - 128 - sx) / (40 * scale);
                        double dy = (y - 120 - sy) / (35 * scale);
                        double dz = (z - 64) / (25 * scale);
                        double r2 = dx * dx + dy * dy + dz * dz;
                        b[x + nx * (y + ny * z)] = (byte) (r2 <= 0.3 ? 2 : r2 <= 1 ? 1 : 0);
                    }
                }
            }
            masks.add(LabelVolume.ofBytes(g, b));
        }
        List<String> names = List.of("r1", "r2", "r3", "r4", "r5", "r6", "r7", "r8", "r9");
        List<String> centres = List.of("A", "A", "A", "B", "B", "B", "C", "C", "C");
        fullHistogram();
        int[] structure = {1, 2}; // outer structure = labels 1 and 2
        for (int rep = 0; rep < 5; rep++) {
            long c0 = CPU.getCurrentThreadCpuTime();
            long t0 = System.nanoTime();
            PatternHistogram h = histogram(masks, structure);
            long t1 = System.nanoTime();
            CaseReferences refs = CaseReferences.compute("case", "organ", names, centres, h, g.voxelVolumeMl(),
                StapleOptions.defaults());
            List<ReaderPerformance> rows = refs.rows();
            long t2 = System.nanoTime();
            List<ReaderPerformance> withSurf = refs.rowsWithSurfaces(masks, structure);
            long t3 = System.nanoTime();
            float[] map = ConsensusOutputs.probabilityMap(masks, structure, refs.all());
            long t4 = System.nanoTime();
            LabelTupleHistogram lt = LabelTupleHistogram.build(masks, new int[] {0, 1, 2});
            long t5 = System.nanoTime();
            MultiLabelStapleResult ml = MultiLabelStaple.run(lt);
            long t6 = System.nanoTime();
            LabelVolume cons = ConsensusOutputs.labelConsensus(masks, ml);
            long t7 = System.nanoTime();
            long c7 = CPU.getCurrentThreadCpuTime();
            System.out.printf(Locale.ROOT,
                "rep %d: patterns %d, STAPLE runs %d (all %d it), rows %d | pattern histogram (test helper) %.1f ms |"
                    + " STAPLE all+LOO+LOCO+rows %.2f ms | signed surfaces (%d rows, box) %.1f ms |"
                    + " probability map %.1f ms | tuple histogram %.1f ms (%d tuples) | multi-label STAPLE %.2f ms"
                    + " (%d it) | label consensus %.1f ms | map[centre]=%.3f label=%d | total wall %.0f ms, CPU %.0f ms%n",
                rep, h.size(), 1 + readers + refs.otherCentres().size(), refs.all().iterations(), rows.size(),
                ms(t0, t1), ms(t1, t2), withSurf.size(), ms(t2, t3), ms(t3, t4), ms(t4, t5), lt.size(), ms(t5, t6),
                ml.iterations(), ms(t6, t7), map[128 + nx * (120 + ny * 64)], cons.label(128, 120, 64), ms(t0, t7),
                ms(c0, c7));
        }
    }

    /** Worst case for 9 readers: all 512 patterns present. */
    static void fullHistogram() {
        SplittableRandom rnd = new SplittableRandom(7);
        long[] dense = new long[512];
        for (int p = 0; p < 512; p++) {
            dense[p] = 1 + rnd.nextInt(5000) * (long) (Long.bitCount(p) == 0 || Long.bitCount(p) == 9 ? 1000 : 1);
        }
        PatternHistogram h = PatternHistogram.fromDense(9, dense);
        List<String> names = List.of("r1", "r2", "r3", "r4", "r5", "r6", "r7", "r8", "r9");
        List<String> centres = List.of("A", "A", "A", "B", "B", "B", "C", "C", "C");
        for (int rep = 0; rep < 30; rep++) {
            long c0 = CPU.getCurrentThreadCpuTime();
            long t0 = System.nanoTime();
            CaseReferences refs = CaseReferences.compute("case", "organ", names, centres, h, 0.001,
                StapleOptions.defaults());
            int rows = refs.rows().size();
            long t1 = System.nanoTime();
            long c1 = CPU.getCurrentThreadCpuTime();
            int its = refs.all().iterations();
            for (StapleResult s : refs.others()) {
                its += s.iterations();
            }
            for (StapleResult s : refs.otherCentres().values()) {
                its += s.iterations();
            }
            if (rep % 5 == 4) {
                System.out.printf(Locale.ROOT,
                    "512 patterns: 13 STAPLE runs (%d EM iterations in all) + %d rows: wall %.2f ms, thread CPU %.2f ms%n",
                    its, rows, ms(t0, t1), ms(c0, c1));
            }
        }
    }

    private static double ms(long a, long b) {
        return (b - a) / 1e6;
    }

    /** Pattern histogram of one structure, a plain fast pass (the agreement step builds the real one). */
    static PatternHistogram histogram(List<LabelVolume> masks, int[] structure) {
        boolean[] lut = Patterns.lut(structure);
        int n = masks.get(0).voxelCount();
        long[] dense = new long[1 << masks.size()];
        int[] pat = new int[4096];
        for (int start = 0; start < n; start += pat.length) {
            int len = Math.min(pat.length, n - start);
            java.util.Arrays.fill(pat, 0, len, 0);
            for (int j = 0; j < masks.size(); j++) {
                byte[] b = masks.get(j).bytes();
                for (int i = 0; i < len; i++) {
                    if (lut[b[start + i] & 0xFF]) {
                        pat[i] |= 1 << j;
                    }
                }
            }
            for (int i = 0; i < len; i++) {
                dense[pat[i]]++;
            }
        }
        return PatternHistogram.fromDense(masks.size(), dense);
    }
}
