package org.accordia.agreement;

import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.api.Test;

class CaseAgreementEngineTest {
    private static final Structure WHOLE = Structure.of("whole", 1, 2);
    private static final Structure CORE = Structure.of("core", 2);

    // ------------------------------------------------------------ brute-force oracle (definitions only)

    /** Exact pair metrics by definition: voxel loops, all border-voxel pairs, full sort for percentiles. */
    static double[] oracle(boolean[] a, boolean[] b, int nx, int ny, int nz, double[] sp, double tol) {
        long na = 0;
        long nb = 0;
        long both = 0;
        for (int i = 0; i < a.length; i++) {
            na += a[i] ? 1 : 0;
            nb += b[i] ? 1 : 0;
            both += a[i] && b[i] ? 1 : 0;
        }
        double dice = na + nb == 0 ? 1 : 2.0 * both / (na + nb);
        double jac = na + nb == 0 ? 1 : (double) both / (na + nb - both);
        if (na == 0 || nb == 0) {
            return new double[] {dice, jac, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN};
        }
        int[] ba = indices(BordersTest.bruteBorder(a, nx, ny, nz));
        int[] bb = indices(BordersTest.bruteBorder(b, nx, ny, nz));
        double[] dA = directed(ba, bb, nx, ny, sp);
        double[] dB = directed(bb, ba, nx, ny, sp);
        double[] pooled = new double[dA.length + dB.length];
        System.arraycopy(dA, 0, pooled, 0, dA.length);
        System.arraycopy(dB, 0, pooled, dA.length, dB.length);
        double hd = Math.max(max(dA), max(dB));
        double hd95 = Math.max(sortedType7(dA, 0.95), sortedType7(dB, 0.95));
        double pooled95 = sortedType7(pooled, 0.95);
        double sum = 0;
        int within = 0;
        for (double d : pooled) {
            sum += d;
            within += d <= tol ? 1 : 0;
        }
        return new double[] {dice, jac, hd, hd95, pooled95, sum / pooled.length, (double) within / pooled.length};
    }

    static int[] indices(boolean[] m) {
        int n = 0;
        for (boolean v : m) {
            n += v ? 1 : 0;
        }
        int[] out = new int[n];
        int k = 0;
        for (int i = 0; i < m.length; i++) {
            if (m[i]) {
                out[k++] = i;
            }
        }
        return out;
    }

    static double[] directed(int[] from, int[] to, int nx, int ny, double[] sp) {
        double[] out = new double[from.length];
        for (int i = 0; i < from.length; i++) {
            double best = Double.POSITIVE_INFINITY;
            for (int j : to) {
                double dx = (from[i] % nx - j % nx) * sp[0];
                double dy = ((from[i] / nx) % ny - (j / nx) % ny) * sp[1];
                double dz = (from[i] / (nx * ny) - j / (nx * ny)) * sp[2];
                best = Math.min(best, Math.sqrt(dx * dx + dy * dy + dz * dz));
            }
            out[i] = best;
        }
        return out;
    }

    static double max(double[] v) {
        return Arrays.stream(v).max().orElse(Double.NaN);
    }

    /** Hyndman & Fan (1996) definition 7 on a fully sorted copy. */
    static double sortedType7(double[] v, double p) {
        double[] s = v.clone();
        Arrays.sort(s);
        double h = (s.length - 1) * p;
        int lo = (int) Math.floor(h);
        return lo + 1 < s.length ? s[lo] + (h - lo) * (s[lo + 1] - s[lo]) : s[lo];
    }

    static void close(double expected, double actual, String what) {
        if (Double.isNaN(expected)) {
            assertTrue(Double.isNaN(actual), what + ": expected NaN, got " + actual);
        } else {
            assertEquals(expected, actual, 1e-9 * Math.max(1, Math.abs(expected)), what);
        }
    }

    // ------------------------------------------------------------ random masks

    static byte[] randomLabels(Random rnd, int nx, int ny, int nz, int kind) {
        byte[] lab = new byte[nx * ny * nz];
        switch (kind) {
            case 0 -> { } // empty
            case 1 -> lab[rnd.nextInt(lab.length)] = (byte) (1 + rnd.nextInt(2)); // single voxel
            case 2 -> { // random blob, may touch the grid edge
                double p = 0.05 + 0.6 * rnd.nextDouble();
                for (int i = 0; i < lab.length; i++) {
                    if (rnd.nextDouble() < p) {
                        lab[i] = (byte) (1 + rnd.nextInt(2));
                    } else if (rnd.nextDouble() < 0.05) {
                        lab[i] = 3; // a label in no structure
                    }
                }
            }
            default -> { // a box, often touching the edge
                int x0 = rnd.nextInt(nx);
                int y0 = rnd.nextInt(ny);
                int z0 = rnd.nextInt(nz);
                int x1 = x0 + 1 + rnd.nextInt(nx - x0);
                int y1 = y0 + 1 + rnd.nextInt(ny - y0);
                int z1 = z0 + 1 + rnd.nextInt(nz - z0);
                for (int z = z0; z < z1; z++) {
                    for (int y = y0; y < y1; y++) {
                        for (int x = x0; x < x1; x++) {
                            lab[x + nx * (y + ny * z)] = (byte) (rnd.nextInt(4) == 0 ? 2 : 1);
                        }
                    }
                }
            }
        }
        return lab;
    }

    static boolean[] member(byte[] lab, Structure st) {
        boolean[] m = new boolean[lab.length];
        for (int i = 0; i < lab.length; i++) {
            m[i] = st.covers(lab[i] & 0xFF);
        }
        return m;
    }

    static List<ReaderId> ids(int r) {
        List<ReaderId> ids = new ArrayList<>();
        for (int j = 0; j < r; j++) {
            ids.add(new ReaderId("r" + j, "c" + (j % 2)));
        }
        return ids;
    }

    @Test
    void fastPathMatchesBruteForceOnRandomMasks() {
        Random rnd = new Random(424242L);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            int checkedPairs = 0;
            for (int trial = 0; trial < 300; trial++) {
                int nx = 1 + rnd.nextInt(12);
                int ny = 1 + rnd.nextInt(9);
                int nz = trial % 3 == 0 ? 1 : 1 + rnd.nextInt(6);
                double[] sp = {0.3 + rnd.nextDouble() * 2, 0.3 + rnd.nextDouble() * 2, 0.5 + rnd.nextDouble() * 3};
                double tol = rnd.nextDouble() * 3;
                Geometry g = Geometry.axisAligned(nx, ny, nz, sp[0], sp[1], sp[2]);
                int r = 2 + rnd.nextInt(4);
                List<LabelVolume> masks = new ArrayList<>();
                List<byte[]> raw = new ArrayList<>();
                for (int j = 0; j < r; j++) {
                    byte[] lab = randomLabels(rnd, nx, ny, nz, rnd.nextInt(6) == 0 ? rnd.nextInt(2) : 2 + rnd.nextInt(2));
                    raw.add(lab);
                    // every fifth case in int storage, to exercise the general path too
                    masks.add(trial % 5 == 4 ? intVolume(g, lab) : LabelVolume.ofBytes(g, lab.clone()));
                }
                CaseAgreementEngine engine = new CaseAgreementEngine(tol, tol, trial % 2 == 0 ? null : pool);
                List<CaseAgreement> res = engine.evaluate("case", ids(r), masks, List.of(WHOLE, CORE));
                for (int s = 0; s < 2; s++) {
                    Structure st = s == 0 ? WHOLE : CORE;
                    CaseAgreement ca = res.get(s);
                    int k = 0;
                    for (int a = 0; a < r; a++) {
                        for (int b = a + 1; b < r; b++, k++) {
                            PairMetrics pm = ca.pairs().get(k);
                            assertEquals("r" + a, pm.readerA());
                            assertEquals("r" + b, pm.readerB());
                            double[] e = oracle(member(raw.get(a), st), member(raw.get(b), st), nx, ny, nz, sp, tol);
                            String what = "trial " + trial + " " + st.name() + " pair " + a + "," + b;
                            close(e[0], pm.dice(), what + " dice");
                            close(e[1], pm.jaccard(), what + " jaccard");
                            close(e[2], pm.hdMm(), what + " hd");
                            close(e[3], pm.hd95Mm(), what + " hd95");
                            close(e[4], pm.hd95PooledMm(), what + " hd95 pooled");
                            close(e[5], pm.assdMm(), what + " assd");
                            close(e[6], pm.nsd(), what + " nsd");
                            checkedPairs++;
                        }
                    }
                    checkKappaRegion(raw, st, nx, ny, nz, sp, tol, ca);
                }
            }
            assertTrue(checkedPairs > 1000);
        } finally {
            pool.shutdown();
        }
    }

    static LabelVolume intVolume(Geometry g, byte[] lab) {
        // values above 255 force int storage; label 300 belongs to no structure
        int[] v = new int[lab.length];
        for (int i = 0; i < lab.length; i++) {
            v[i] = lab[i] & 0xFF;
        }
        v[0] = v[0] == 0 ? 300 : v[0];
        return LabelVolume.ofInts(g, v);
    }

    /** Oracle for the kappa region and Fleiss' kappa: brute-force distance to the union, formula per voxel. */
    static void checkKappaRegion(List<byte[]> raw, Structure st, int nx, int ny, int nz, double[] sp, double tol,
                                 CaseAgreement ca) {
        int r = raw.size();
        int n = nx * ny * nz;
        boolean[] union = new boolean[n];
        List<boolean[]> m = new ArrayList<>();
        for (byte[] lab : raw) {
            boolean[] mm = member(lab, st);
            m.add(mm);
            for (int i = 0; i < n; i++) {
                union[i] |= mm[i];
            }
        }
        double[] d2 = DistanceTransformTest.bruteForce(union, nx, ny, nz, sp[0], sp[1], sp[2]);
        long region = 0;
        List<long[]> rows = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            if (Math.sqrt(d2[i]) <= tol) {
                region++;
                long in = 0;
                for (boolean[] mm : m) {
                    in += mm[i] ? 1 : 0;
                }
                rows.add(new long[] {in, r - in});
            }
        }
        assertEquals(region, ca.kappaRegionVoxels());
        double expected = Kappa.fleiss(rows.toArray(new long[0][]));
        close(expected, ca.fleissKappa(), "kappa");
    }

    // ------------------------------------------------------------ hand-computed and properties

    @Test
    void boxesOffsetAlongAnAxis() {
        // Hand-computed. Two 4x4x4-voxel boxes in a 20x12x12 grid, B = A shifted by k = 3 voxels along z,
        // spacing s = 2.5 mm along z. A occupies slices 2..5, B slices 5..8. A's bottom face (slice 2)
        // is k slices from B's bottom face (slice 5, same x and y), and no voxel of B is closer to it
        // (every voxel of B has z >= 5), so its directed distance is k*s; every other border voxel of A
        // is at most that far from B's border (same x, y, at most k slices apart). Symmetrically for B's
        // top face. Hence HD = k*s = 7.5 mm.
        int nx = 20;
        int ny = 12;
        int nz = 12;
        Geometry g = Geometry.axisAligned(nx, ny, nz, 0.7, 0.9, 2.5);
        byte[] a = new byte[nx * ny * nz];
        byte[] b = new byte[nx * ny * nz];
        for (int z = 2; z < 6; z++) {
            for (int y = 3; y < 7; y++) {
                for (int x = 5; x < 9; x++) {
                    a[x + nx * (y + ny * z)] = 1;
                    b[x + nx * (y + ny * (z + 3))] = 1;
                }
            }
        }
        CaseAgreement ca = new CaseAgreementEngine(1.0).evaluate("c", ids(2),
            List.of(LabelVolume.ofBytes(g, a), LabelVolume.ofBytes(g, b)), List.of(WHOLE)).get(0);
        PairMetrics p = ca.pairs().get(0);
        assertEquals(7.5, p.hdMm(), 1e-12);
        // overlap: one slice of 16 voxels out of 64 each -> Dice = 2*16/128 = 0.25, Jaccard = 16/112
        assertEquals(0.25, p.dice(), 1e-15);
        assertEquals(16.0 / 112.0, p.jaccard(), 1e-15);
        assertEquals(64 * 0.7 * 0.9 * 2.5 / 1000, p.volumeAMl(), 1e-15);
        assertEquals("", p.flag());
    }

    @Test
    void emptyMasksAreFlaggedNotDropped() {
        Geometry g = Geometry.axisAligned(6, 5, 4, 1, 1, 1);
        byte[] full = new byte[120];
        full[37] = 1;
        full[38] = 1;
        List<LabelVolume> masks = List.of(LabelVolume.ofBytes(g, new byte[120]), LabelVolume.ofBytes(g, new byte[120]),
            LabelVolume.ofBytes(g, full));
        CaseAgreement ca = new CaseAgreementEngine(1.0).evaluate("c", ids(3), masks, List.of(WHOLE)).get(0);
        PairMetrics both = ca.pairs().get(0);
        assertEquals(PairMetrics.FLAG_BOTH_EMPTY, both.flag());
        assertEquals(1.0, both.dice());
        assertEquals(1.0, both.jaccard());
        assertTrue(Double.isNaN(both.hdMm()));
        PairMetrics one = ca.pairs().get(1);
        assertEquals(PairMetrics.FLAG_ONE_EMPTY, one.flag());
        assertEquals(0.0, one.dice());
        assertTrue(Double.isNaN(one.hd95Mm()));
        assertEquals(1, ca.bothEmptyPairs());
        assertEquals(2, ca.oneEmptyPairs());
        assertEquals(0, ca.distancePairs());
        assertTrue(Double.isNaN(ca.meanHd95Mm()));
        assertEquals(1.0 / 3.0, ca.meanDice(), 1e-15);
        assertEquals(0.0, ca.medianDice());

        CaseAgreement none = new CaseAgreementEngine(1.0).evaluate("c", ids(2), masks.subList(0, 2), List.of(WHOLE)).get(0);
        assertTrue(none.unionBox().isEmpty());
        assertEquals(0, none.kappaRegionVoxels());
        assertTrue(Double.isNaN(none.fleissKappa()));
    }

    @Test
    void readerAgainstItselfAndSymmetryAndOrderInvariance() {
        Random rnd = new Random(99);
        int nx = 14;
        int ny = 11;
        int nz = 7;
        Geometry g = Geometry.axisAligned(nx, ny, nz, 0.7, 0.9, 2.5);
        List<byte[]> raw = new ArrayList<>();
        for (int j = 0; j < 4; j++) {
            raw.add(randomLabels(rnd, nx, ny, nz, 2 + j % 2));
        }
        raw.add(raw.get(0).clone()); // reader 4 = reader 0
        List<LabelVolume> masks = new ArrayList<>();
        for (byte[] lab : raw) {
            masks.add(LabelVolume.ofBytes(g, lab));
        }
        CaseAgreementEngine engine = new CaseAgreementEngine(1.5);
        CaseAgreement ca = engine.evaluate("c", ids(5), masks, List.of(WHOLE)).get(0);
        PairMetrics self = ca.pairs().stream().filter(p -> p.readerA().equals("r0") && p.readerB().equals("r4"))
            .findFirst().orElseThrow();
        assertEquals(1.0, self.dice());
        assertEquals(1.0, self.jaccard());
        assertEquals(0.0, self.hdMm());
        assertEquals(0.0, self.hd95Mm());
        assertEquals(0.0, self.assdMm());
        assertEquals(1.0, self.nsd());
        assertEquals(0.0, self.relativeVolumeDifference());

        // reversed reader order: every pair's metrics are the same (relative volume difference changes sign)
        List<LabelVolume> rev = new ArrayList<>(masks);
        List<ReaderId> revIds = new ArrayList<>(ids(5));
        java.util.Collections.reverse(rev);
        java.util.Collections.reverse(revIds);
        CaseAgreement cr = engine.evaluate("c", revIds, rev, List.of(WHOLE)).get(0);
        Map<String, PairMetrics> byKey = new HashMap<>();
        for (PairMetrics p : cr.pairs()) {
            byKey.put(p.readerB() + "|" + p.readerA(), p);
        }
        for (PairMetrics p : ca.pairs()) {
            PairMetrics q = byKey.get(p.readerA() + "|" + p.readerB());
            assertEquals(p.dice(), q.dice());
            assertEquals(p.jaccard(), q.jaccard());
            assertEquals(p.hdMm(), q.hdMm());
            assertEquals(p.hd95Mm(), q.hd95Mm());
            assertEquals(p.hd95PooledMm(), q.hd95PooledMm(), 1e-12);
            assertEquals(p.assdMm(), q.assdMm(), 1e-12);
            assertEquals(p.nsd(), q.nsd(), 1e-15);
            assertEquals(p.volumeAMl(), q.volumeBMl());
            assertEquals(-p.relativeVolumeDifference(), q.relativeVolumeDifference(), 1e-15);
        }
        assertEquals(ca.fleissKappa(), cr.fleissKappa(), 1e-12);
        assertEquals(ca.kappaRegionVoxels(), cr.kappaRegionVoxels());
        assertEquals(ca.meanDice(), cr.meanDice(), 1e-12);
        assertEquals(ca.medianDice(), cr.medianDice(), 1e-15);
    }

    @Test
    void histogramMatchesVoxelCountsAndUnionBox() {
        Random rnd = new Random(5);
        int nx = 23; // not a multiple of 8: exercises the row tail
        int ny = 9;
        int nz = 5;
        Geometry g = Geometry.axisAligned(nx, ny, nz, 1, 1, 1);
        List<byte[]> raw = new ArrayList<>();
        List<LabelVolume> masks = new ArrayList<>();
        for (int j = 0; j < 3; j++) {
            byte[] lab = randomLabels(rnd, nx, ny, nz, 3);
            raw.add(lab);
            masks.add(LabelVolume.ofBytes(g, lab));
        }
        CaseAgreement ca = new CaseAgreementEngine(1.0).evaluate("c", ids(3), masks, List.of(CORE)).get(0);
        long[] dense = new long[8];
        boolean[] union = new boolean[nx * ny * nz];
        for (int i = 0; i < union.length; i++) {
            int p = 0;
            for (int j = 0; j < 3; j++) {
                if (CORE.covers(raw.get(j)[i] & 0xFF)) {
                    p |= 1 << j;
                    union[i] = true;
                }
            }
            dense[p]++;
        }
        assertEquals(PatternHistogram.fromDense(3, dense), ca.histogram());
        assertEquals(Borders.boundingBox(union, nx, ny, nz), ca.unionBox());
    }

    /** Beyond 16 readers (sparse histogram) and with label 0 inside a structure (no block skipping). */
    @Test
    void manyReadersAndBackgroundInStructureUseTheGeneralPath() {
        Random rnd = new Random(17);
        int nx = 9;
        int ny = 6;
        int nz = 4;
        Geometry g = Geometry.axisAligned(nx, ny, nz, 1, 1, 1);
        int r = 18;
        List<byte[]> raw = new ArrayList<>();
        List<LabelVolume> masks = new ArrayList<>();
        for (int j = 0; j < r; j++) {
            byte[] lab = randomLabels(rnd, nx, ny, nz, 2 + j % 2);
            raw.add(lab);
            masks.add(LabelVolume.ofBytes(g, lab));
        }
        // 18 readers (> 16) take the general histogram path; label 0 is no structure value (study.Structure)
        Structure outside = Structure.of("outside", 3);
        List<CaseAgreement> res = new CaseAgreementEngine(1.0).evaluate("c", ids(r), masks, List.of(WHOLE, outside));
        for (int s = 0; s < 2; s++) {
            Structure st = s == 0 ? WHOLE : outside;
            Map<Long, Long> expected = new java.util.TreeMap<>();
            for (int i = 0; i < nx * ny * nz; i++) {
                long p = 0;
                for (int j = 0; j < r; j++) {
                    if (st.covers(raw.get(j)[i] & 0xFF)) {
                        p |= 1L << j;
                    }
                }
                expected.merge(p, 1L, Long::sum);
            }
            PatternHistogram h = res.get(s).histogram();
            assertEquals(expected.size(), h.size());
            int k = 0;
            for (Map.Entry<Long, Long> e : expected.entrySet()) {
                assertEquals(e.getKey(), h.pattern(k));
                assertEquals(e.getValue(), h.count(k++));
            }
            assertEquals(r * (r - 1) / 2, res.get(s).pairs().size());
            // one pair against the oracle
            double[] o = oracle(member(raw.get(3), st), member(raw.get(11), st), nx, ny, nz, new double[] {1, 1, 1}, 1.0);
            PairMetrics pm = res.get(s).pairs().stream()
                .filter(p -> p.readerA().equals("r3") && p.readerB().equals("r11")).findFirst().orElseThrow();
            close(o[0], pm.dice(), "dice");
            close(o[3], pm.hd95Mm(), "hd95");
            close(o[5], pm.assdMm(), "assd");
        }
    }
}
