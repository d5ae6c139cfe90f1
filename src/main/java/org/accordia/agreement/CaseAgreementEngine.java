package org.accordia.agreement;

import org.accordia.stats.Quantiles;
import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.Executor;
import java.util.concurrent.atomic.AtomicInteger;
import org.accordia.grid.Box;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.accordia.study.Protocol;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

/**
 * Agreement of every reader pair of one case, for every structure, in one streaming step.
 *
 * <ol>
 *   <li>One pass over the voxels for all readers and all structures builds, per structure, the
 *       decision-pattern histogram over the whole grid ({@link PatternHistogram}) and the
 *       bounding box of the union of all readers' structure. Byte labels are read eight voxels at
 *       a time and blocks where every reader has label 0 are skipped (their pattern is 0 for
 *       every structure that does not contain label 0).</li>
 *   <li>From the histogram alone: every reader's volume, every pairwise intersection, Dice,
 *       Jaccard, relative volume difference.</li>
 *   <li>Surface distances on the union box grown by one voxel: each reader's border voxels are
 *       extracted (judged on the full grid, {@link Borders}), the exact distance transform of each
 *       reader's border is computed ONCE ({@link DistanceTransform}; exact inside the box because
 *       the box holds every site) and sampled at every other reader's border voxels, giving the
 *       directed distance sets of every pair ({@link SurfaceMetrics}).</li>
 *   <li>Fleiss' kappa over the union of all readers' structure dilated by {@code kappaMarginMm}
 *       (Euclidean, via the distance transform of the union on a box grown by
 *       ⌈margin/spacing⌉ + 1 voxels per axis).</li>
 * </ol>
 *
 * <p>The optional {@link Executor} runs the histogram pass in row chunks and the per-reader
 * transforms in parallel; the caller's thread always works too, so a saturated executor cannot
 * dead-lock. Results do not depend on the executor. Masks are only read.
 */
public final class CaseAgreementEngine {
    private static final VarHandle LONGS = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);
    private static final int DENSE_MAX_READERS = 16;
    private static final int MAX_STRUCTURES = 31;

    private final double toleranceMm;
    private final double kappaMarginMm;
    private final Executor executor;
    private final Protocol.Hd95Mode hd95;

    /** NSD tolerance and kappa margin τ (mm), single-threaded. */
    public CaseAgreementEngine(double toleranceMm) {
        this(toleranceMm, toleranceMm, null);
    }

    /**
     * @param toleranceMm NSD tolerance τ, mm, ≥ 0
     * @param kappaMarginMm dilation radius of the kappa region, mm, ≥ 0
     * @param executor runs parallel parts; {@code null} for the caller's thread only
     */
    public CaseAgreementEngine(double toleranceMm, double kappaMarginMm, Executor executor) {
        this(toleranceMm, kappaMarginMm, Protocol.Hd95Mode.PER_DIRECTION, executor);
    }

    /**
     * @param toleranceMm NSD tolerance τ, mm, ≥ 0
     * @param kappaMarginMm dilation radius of the kappa region, mm, ≥ 0
     * @param hd95 the HD95 variant of every pair's {@code hd95Mm} (protocol {@code agreement.hd95})
     * @param executor runs parallel parts; {@code null} for the caller's thread only
     */
    public CaseAgreementEngine(double toleranceMm, double kappaMarginMm, Protocol.Hd95Mode hd95, Executor executor) {
        if (!(toleranceMm >= 0) || Double.isInfinite(toleranceMm)) {
            throw new IllegalArgumentException("tolerance must be finite and non-negative");
        }
        if (!(kappaMarginMm >= 0) || Double.isInfinite(kappaMarginMm)) {
            throw new IllegalArgumentException("kappa margin must be finite and non-negative");
        }
        this.toleranceMm = toleranceMm;
        this.kappaMarginMm = kappaMarginMm;
        this.executor = executor;
        this.hd95 = java.util.Objects.requireNonNull(hd95, "hd95");
    }

    public double toleranceMm() {
        return toleranceMm;
    }

    public double kappaMarginMm() {
        return kappaMarginMm;
    }

    /**
     * Agreement of all reader pairs of one case for each structure, in the order given.
     *
     * @param readers identity of each mask's reader; reader order (and pair order) as given
     * @param masks one mask per reader, all on the same grid (the study layer checks spacing and
     *     orientation within its tolerance; here the dimensions must match exactly and the first
     *     mask's spacing is used for every distance and volume)
     * @param structures structures to measure, at most 31
     */
    public List<CaseAgreement> evaluate(String caseId, List<ReaderId> readers, List<LabelVolume> masks,
                                        List<Structure> structures) {
        int r = masks.size();
        if (readers.size() != r) {
            throw new IllegalArgumentException(readers.size() + " reader identities for " + r + " masks");
        }
        if (r < 1 || r > PatternHistogram.MAX_READERS) {
            throw new IllegalArgumentException("need 1.." + PatternHistogram.MAX_READERS + " readers, got " + r);
        }
        if (structures.isEmpty() || structures.size() > MAX_STRUCTURES) {
            throw new IllegalArgumentException("need 1.." + MAX_STRUCTURES + " structures, got " + structures.size());
        }
        Geometry g = masks.get(0).geometry();
        for (int j = 1; j < r; j++) {
            Geometry gj = masks.get(j).geometry();
            if (gj.nx() != g.nx() || gj.ny() != g.ny() || gj.nz() != g.nz()) {
                throw new IllegalArgumentException("mask of reader " + readers.get(j).reader() + " has dimensions "
                    + gj.dimsText() + ", the first mask " + g.dimsText());
            }
        }
        Pass pass = histogramPass(masks, structures, g);
        List<CaseAgreement> out = new ArrayList<>(structures.size());
        for (int s = 0; s < structures.size(); s++) {
            out.add(structure(caseId, readers, masks, structures.get(s), pass.histograms[s], pass.boxes[s], g));
        }
        return out;
    }

    // ------------------------------------------------------------------ histogram pass

    private static final class Pass {
        PatternHistogram[] histograms;
        Box[] boxes;
    }

    private Pass histogramPass(List<LabelVolume> masks, List<Structure> structures, Geometry g) {
        int r = masks.size();
        int ns = structures.size();
        boolean allBytes = masks.stream().allMatch(LabelVolume::isCompact);
        boolean zeroInAny = structures.stream().anyMatch(st -> st.covers(0));
        Pass pass = new Pass();
        pass.histograms = new PatternHistogram[ns];
        pass.boxes = new Box[ns];
        int nx = g.nx();
        int ny = g.ny();
        int nz = g.nz();
        int rows = ny * nz;
        int chunks = executor == null ? 1 : Math.max(1, Math.min(16, rows / 32));
        int per = (rows + chunks - 1) / chunks;
        List<Chunk> parts = new ArrayList<>();
        List<Runnable> tasks = new ArrayList<>();
        boolean dense = r <= DENSE_MAX_READERS;
        for (int from = 0; from < rows; from += per) {
            Chunk c = new Chunk(ns, r, dense);
            int a = from;
            int b = Math.min(rows, from + per);
            parts.add(c);
            if (allBytes && dense && !zeroInAny) {
                tasks.add(() -> fastChunk(masks, structures, nx, ny, a, b, c));
            } else {
                tasks.add(() -> generalChunk(masks, structures, nx, ny, a, b, c, allBytes));
            }
        }
        runAll(tasks, executor);
        long total = g.voxelCount();
        for (int s = 0; s < ns; s++) {
            int[] bb = {Integer.MAX_VALUE, Integer.MAX_VALUE, Integer.MAX_VALUE, -1, -1, -1};
            for (Chunk c : parts) {
                for (int d = 0; d < 3; d++) {
                    bb[d] = Math.min(bb[d], c.box[s][d]);
                    bb[3 + d] = Math.max(bb[3 + d], c.box[s][3 + d]);
                }
            }
            pass.boxes[s] = bb[3] < 0 ? Box.EMPTY : new Box(bb[0], bb[1], bb[2], bb[3] + 1, bb[4] + 1, bb[5] + 1);
            if (dense) {
                long[] sum = new long[1 << r];
                for (Chunk c : parts) {
                    long[] cs = c.dense[s];
                    for (int p = 1; p < sum.length; p++) {
                        sum[p] += cs[p];
                    }
                }
                long marked = 0;
                for (int p = 1; p < sum.length; p++) {
                    marked += sum[p];
                }
                sum[0] = total - marked;
                pass.histograms[s] = PatternHistogram.fromDense(r, sum);
            } else {
                Map<Long, long[]> sum = new HashMap<>();
                for (Chunk c : parts) {
                    c.sparse.get(s).forEach((k, v) -> sum.computeIfAbsent(k, kk -> new long[1])[0] += v[0]);
                }
                long marked = 0;
                for (Map.Entry<Long, long[]> e : sum.entrySet()) {
                    if (e.getKey() != 0) {
                        marked += e.getValue()[0];
                    }
                }
                sum.put(0L, new long[] {total - marked});
                long[] keys = sum.keySet().stream().mapToLong(Long::longValue).filter(k -> sum.get(k)[0] > 0)
                    .sorted().toArray();
                long[] counts = new long[keys.length];
                for (int i = 0; i < keys.length; i++) {
                    counts[i] = sum.get(keys[i])[0];
                }
                pass.histograms[s] = new PatternHistogram(r, keys, counts);
            }
        }
        return pass;
    }

    /** Partial results of one range of rows. Pattern 0 is never counted here (derived from the total). */
    private static final class Chunk {
        final long[][] dense;
        final List<Map<Long, long[]>> sparse;
        final int[][] box;

        Chunk(int ns, int r, boolean isDense) {
            dense = isDense ? new long[ns][1 << r] : null;
            sparse = new ArrayList<>();
            if (!isDense) {
                for (int s = 0; s < ns; s++) {
                    sparse.add(new HashMap<>());
                }
            }
            box = new int[ns][];
            for (int s = 0; s < ns; s++) {
                box[s] = new int[] {Integer.MAX_VALUE, Integer.MAX_VALUE, Integer.MAX_VALUE, -1, -1, -1};
            }
        }

        void row(int s, int xmin, int xmax, int y, int z) {
            int[] b = box[s];
            if (xmin < b[0]) {
                b[0] = xmin;
            }
            if (xmax > b[3]) {
                b[3] = xmax;
            }
            if (y < b[1]) {
                b[1] = y;
            }
            if (y > b[4]) {
                b[4] = y;
            }
            if (z < b[2]) {
                b[2] = z;
            }
            if (z > b[5]) {
                b[5] = z;
            }
        }
    }

    /** Byte labels, ≤ 16 readers, label 0 in no structure: skip 8-voxel blocks that are 0 for every reader. */
    private static void fastChunk(List<LabelVolume> masks, List<Structure> structures, int nx, int ny,
                                  int rowFrom, int rowTo, Chunk c) {
        int r = masks.size();
        int ns = structures.size();
        byte[][] lab = new byte[r][];
        for (int j = 0; j < r; j++) {
            lab[j] = masks.get(j).bytes();
        }
        int[] member = new int[256];
        for (int s = 0; s < ns; s++) {
            boolean[] t = structures.get(s).byteTable();
            for (int v = 0; v < 256; v++) {
                if (t[v]) {
                    member[v] |= 1 << s;
                }
            }
        }
        int[] pat = new int[ns];
        int[] rmin = new int[ns];
        int[] rmax = new int[ns];
        long[][] cnt = c.dense;
        for (int row = rowFrom; row < rowTo; row++) {
            int base = row * nx;
            Arrays.fill(rmin, Integer.MAX_VALUE);
            Arrays.fill(rmax, -1);
            boolean rowAny = false;
            int x = 0;
            for (; x + 8 <= nx; x += 8) {
                long any = 0;
                for (int j = 0; j < r; j++) {
                    any |= (long) LONGS.get(lab[j], base + x);
                }
                if (any == 0) {
                    continue;
                }
                for (int k = 0; k < 8; k++) {
                    rowAny |= voxel(lab, member, pat, cnt, rmin, rmax, base + x + k, x + k, r, ns);
                }
            }
            for (; x < nx; x++) {
                rowAny |= voxel(lab, member, pat, cnt, rmin, rmax, base + x, x, r, ns);
            }
            if (rowAny) {
                int y = row % ny;
                int z = row / ny;
                for (int s = 0; s < ns; s++) {
                    if (rmax[s] >= 0) {
                        c.row(s, rmin[s], rmax[s], y, z);
                    }
                }
            }
        }
    }

    private static boolean voxel(byte[][] lab, int[] member, int[] pat, long[][] cnt, int[] rmin, int[] rmax,
                                 int i, int x, int r, int ns) {
        int anyMember = 0;
        for (int s = 0; s < ns; s++) {
            pat[s] = 0;
        }
        for (int j = 0; j < r; j++) {
            int m = member[lab[j][i] & 0xFF];
            if (m != 0) {
                anyMember |= m;
                for (int s = 0; s < ns; s++) {
                    pat[s] |= ((m >>> s) & 1) << j;
                }
            }
        }
        if (anyMember == 0) {
            return false;
        }
        for (int s = 0; s < ns; s++) {
            int p = pat[s];
            if (p != 0) {
                cnt[s][p]++;
                if (x < rmin[s]) {
                    rmin[s] = x;
                }
                if (x > rmax[s]) {
                    rmax[s] = x;
                }
            }
        }
        return true;
    }

    /** Any storage, any reader count, any structure: voxel by voxel. */
    private static void generalChunk(List<LabelVolume> masks, List<Structure> structures, int nx, int ny,
                                     int rowFrom, int rowTo, Chunk c, boolean allBytes) {
        int r = masks.size();
        int ns = structures.size();
        boolean[][] tables = new boolean[ns][];
        int[][] values = new int[ns][];
        for (int s = 0; s < ns; s++) {
            tables[s] = structures.get(s).byteTable();
            values[s] = structures.get(s).labelArray();
        }
        long[] pat = new long[ns];
        for (int row = rowFrom; row < rowTo; row++) {
            int y = row % ny;
            int z = row / ny;
            for (int x = 0; x < nx; x++) {
                int i = row * nx + x;
                Arrays.fill(pat, 0L);
                for (int j = 0; j < r; j++) {
                    LabelVolume m = masks.get(j);
                    int v = m.label(i);
                    for (int s = 0; s < ns; s++) {
                        boolean in = v < 256 ? tables[s][v] : Arrays.binarySearch(values[s], v) >= 0;
                        if (in) {
                            pat[s] |= 1L << j;
                        }
                    }
                }
                for (int s = 0; s < ns; s++) {
                    long p = pat[s];
                    if (p == 0) {
                        continue;
                    }
                    if (c.dense != null) {
                        c.dense[s][(int) p]++;
                    } else {
                        c.sparse.get(s).computeIfAbsent(p, k -> new long[1])[0]++;
                    }
                    c.row(s, x, x, y, z);
                }
            }
        }
    }

    // ------------------------------------------------------------------ per structure

    private CaseAgreement structure(String caseId, List<ReaderId> readers, List<LabelVolume> masks, Structure st,
                                    PatternHistogram h, Box unionBox, Geometry g) {
        int r = readers.size();
        double voxelMl = g.voxelVolumeMl();
        long[] counts = new long[r];
        for (int j = 0; j < r; j++) {
            counts[j] = h.marked(j);
        }
        SurfaceMetrics[][] surface = surfaces(masks, st, counts, unionBox, g);
        List<PairMetrics> pairs = new ArrayList<>();
        for (int a = 0; a < r; a++) {
            for (int b = a + 1; b < r; b++) {
                SurfaceMetrics sm = surface[a][b] != null ? surface[a][b] : SurfaceMetrics.undefined(toleranceMm);
                pairs.add(PairMetrics.of(caseId, st.name(), readers.get(a), readers.get(b), counts[a], counts[b],
                    h.markedByBoth(a, b), voxelMl, sm, toleranceMm, hd95));
            }
        }
        // kappa region: union dilated by the margin
        long unionCount = h.total() - zeroCount(h);
        long bgNear = unionBox.isEmpty() ? 0 : backgroundWithinMargin(masks, st, unionBox, g);
        PatternHistogram region = regionHistogram(h, bgNear);
        double kappa = region == null ? Double.NaN : Kappa.fleiss(region);
        // summaries
        int both = 0;
        int one = 0;
        double[] dice = new double[pairs.size()];
        double sumDice = 0;
        double sumHd95 = 0;
        double sumAssd = 0;
        int defined = 0;
        for (int i = 0; i < pairs.size(); i++) {
            PairMetrics p = pairs.get(i);
            dice[i] = p.dice();
            sumDice += p.dice();
            if (PairMetrics.FLAG_BOTH_EMPTY.equals(p.flag())) {
                both++;
            } else if (PairMetrics.FLAG_ONE_EMPTY.equals(p.flag())) {
                one++;
            } else {
                defined++;
                sumHd95 += p.hd95Mm();
                sumAssd += p.assdMm();
            }
        }
        double meanDice = pairs.isEmpty() ? Double.NaN : sumDice / pairs.size();
        double medianDice = pairs.isEmpty() ? Double.NaN : Quantiles.type7InPlace(dice, dice.length, 0.5);
        List<String> names = new ArrayList<>();
        List<String> centres = new ArrayList<>();
        List<Double> volumes = new ArrayList<>();
        List<Long> voxelCounts = new ArrayList<>();
        for (int j = 0; j < r; j++) {
            names.add(readers.get(j).reader());
            centres.add(readers.get(j).centre());
            volumes.add(counts[j] * voxelMl);
            voxelCounts.add(counts[j]);
        }
        return new CaseAgreement(caseId, st.name(), names, centres, pairs, kappa, unionCount + bgNear, kappaMarginMm,
            meanDice, medianDice, both, one, defined, defined == 0 ? Double.NaN : sumHd95 / defined,
            defined == 0 ? Double.NaN : sumAssd / defined, volumes, voxelCounts, unionBox, toleranceMm, voxelMl, h);
    }

    private static long zeroCount(PatternHistogram h) {
        return h.size() > 0 && h.pattern(0) == 0 ? h.count(0) : 0;
    }

    /** The histogram over the kappa region: pattern 0 counts only background voxels within the margin. */
    private static PatternHistogram regionHistogram(PatternHistogram h, long bgNear) {
        long[] p = h.patterns();
        long[] c = h.counts();
        int start = p.length > 0 && p[0] == 0 ? 1 : 0;
        int extra = bgNear > 0 ? 1 : 0;
        int n = p.length - start + extra;
        if (n == 0) {
            return null;
        }
        long[] np = new long[n];
        long[] nc = new long[n];
        if (extra == 1) {
            np[0] = 0;
            nc[0] = bgNear;
        }
        System.arraycopy(p, start, np, extra, p.length - start);
        System.arraycopy(c, start, nc, extra, c.length - start);
        return new PatternHistogram(h.readers(), np, nc);
    }

    /** Voxels outside the union but within {@code kappaMarginMm} of it (Euclidean, mm). */
    private long backgroundWithinMargin(List<LabelVolume> masks, Structure st, Box unionBox, Geometry g) {
        if (kappaMarginMm == 0) {
            return 0;
        }
        int nx = g.nx();
        int ny = g.ny();
        int nz = g.nz();
        double sx = g.spacing(0);
        double sy = g.spacing(1);
        double sz = g.spacing(2);
        Box box = unionBox.grow(marginVoxels(kappaMarginMm, sx), marginVoxels(kappaMarginMm, sy),
            nz > 1 ? marginVoxels(kappaMarginMm, sz) : 0, nx, ny, nz);
        boolean[] union = new boolean[box.size()];
        for (LabelVolume m : masks) {
            boolean[] fg = member(m, st, box, g);
            for (int i = 0; i < union.length; i++) {
                union[i] |= fg[i];
            }
        }
        double[] d2 = DistanceTransform.squaredDistanceMm2(union, box.nx(), box.ny(), box.nz(), sx, sy, sz, executor);
        long near = 0;
        for (double v : d2) {
            if (v > 0 && Math.sqrt(v) <= kappaMarginMm) {
                near++;
            }
        }
        return near;
    }

    static int marginVoxels(double mm, double spacing) {
        double v = Math.ceil(mm / spacing) + 1;
        if (v > Integer.MAX_VALUE / 4.0) {
            return Integer.MAX_VALUE / 4;
        }
        return (int) v;
    }

    private static boolean[] member(LabelVolume m, Structure st, Box box, Geometry g) {
        return m.isCompact()
            ? Borders.crop(m.bytes(), st.byteTable(), g.nx(), g.ny(), g.nz(), box)
            : Borders.cropInts(m.ints(), st.labelArray(), g.nx(), g.ny(), g.nz(), box);
    }

    /** Border voxels of the structure inside the box, as box linear indices (judged on the full grid). */
    private static int[] borderIndices(LabelVolume m, Structure st, Box box, Geometry g) {
        if (m.isCompact()) {
            return Borders.borderIndicesInBox(m.bytes(), st.byteTable(), g.nx(), g.ny(), g.nz(), box);
        }
        boolean[] b = Borders.borderMaskInBox(m.ints(), st.labelArray(), g.nx(), g.ny(), g.nz(), box);
        int n = 0;
        for (boolean v : b) {
            n += v ? 1 : 0;
        }
        int[] idx = new int[n];
        int k = 0;
        for (int i = 0; i < b.length; i++) {
            if (b[i]) {
                idx[k++] = i;
            }
        }
        return idx;
    }

    /** Surface metrics of every pair a < b with both masks non-empty ({@code null} elsewhere). */
    private SurfaceMetrics[][] surfaces(List<LabelVolume> masks, Structure st, long[] counts, Box unionBox, Geometry g) {
        int r = masks.size();
        SurfaceMetrics[][] out = new SurfaceMetrics[r][r];
        if (r < 2 || unionBox.isEmpty()) {
            return out;
        }
        int nx = g.nx();
        int ny = g.ny();
        int nz = g.nz();
        Box box = unionBox.grow(1, nx, ny, nz);
        int[][] borderIdx = new int[r][];
        List<Runnable> phase1 = new ArrayList<>();
        for (int j = 0; j < r; j++) {
            if (counts[j] == 0) {
                continue;
            }
            int jj = j;
            phase1.add(() -> borderIdx[jj] = borderIndices(masks.get(jj), st, box, g));
        }
        runAll(phase1, executor);
        // sampled[a][b]: squared distances from a's border voxels to b's border (from b's transform)
        double[][][] sampled = new double[r][r][];
        double sx = g.spacing(0);
        double sy = g.spacing(1);
        double sz = g.spacing(2);
        List<Runnable> phase2 = new ArrayList<>();
        for (int b = 0; b < r; b++) {
            if (borderIdx[b] == null) {
                continue;
            }
            int bb = b;
            phase2.add(() -> {
                boolean[] sites = new boolean[box.size()];
                for (int i : borderIdx[bb]) {
                    sites[i] = true;
                }
                double[] d2 = DistanceTransform.squaredDistanceMm2(sites, box.nx(), box.ny(), box.nz(), sx, sy, sz);
                for (int a = 0; a < r; a++) {
                    if (a == bb || borderIdx[a] == null) {
                        continue;
                    }
                    int[] idx = borderIdx[a];
                    double[] s = new double[idx.length];
                    for (int i = 0; i < idx.length; i++) {
                        s[i] = d2[idx[i]];
                    }
                    sampled[a][bb] = s;
                }
            });
        }
        runAll(phase2, executor);
        List<Runnable> phase3 = new ArrayList<>();
        for (int a = 0; a < r; a++) {
            for (int b = a + 1; b < r; b++) {
                if (sampled[a][b] == null || sampled[b][a] == null) {
                    continue;
                }
                int aa = a;
                int bb = b;
                phase3.add(() -> out[aa][bb] = SurfaceMetrics.fromSquared(sampled[aa][bb], sampled[aa][bb].length,
                    sampled[bb][aa], sampled[bb][aa].length, toleranceMm));
            }
        }
        runAll(phase3, executor);
        return out;
    }

    // ------------------------------------------------------------------ parallel helper

    /** Runs every task; the caller works too, helpers are submitted to the executor (if any). */
    static void runAll(List<Runnable> tasks, Executor executor) {
        if (executor == null || tasks.size() <= 1) {
            tasks.forEach(Runnable::run);
            return;
        }
        AtomicInteger next = new AtomicInteger();
        Runnable worker = () -> {
            int i;
            while ((i = next.getAndIncrement()) < tasks.size()) {
                tasks.get(i).run();
            }
        };
        int helpers = Math.min(tasks.size() - 1, Math.max(1, Runtime.getRuntime().availableProcessors() - 1));
        List<CompletableFuture<Void>> futures = new ArrayList<>(helpers);
        for (int h = 0; h < helpers; h++) {
            futures.add(CompletableFuture.runAsync(worker, executor));
        }
        worker.run();
        for (CompletableFuture<Void> f : futures) {
            try {
                f.join();
            } catch (CompletionException e) {
                if (e.getCause() instanceof RuntimeException re) {
                    throw re;
                }
                if (e.getCause() instanceof Error err) {
                    throw err;
                }
                throw e;
            }
        }
    }
}
