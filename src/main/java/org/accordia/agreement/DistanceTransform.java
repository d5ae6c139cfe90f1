package org.accordia.agreement;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.Executor;

/**
 * Exact Euclidean distance transform of a set of site voxels on a box with a spacing per axis.
 *
 * <p>What it measures: for every voxel of an {@code nx × ny × nz} box (x fastest, 2-D when
 * {@code nz = 1}), the squared Euclidean distance in mm² between its centre and the centre of the
 * nearest site voxel, where voxel {@code (i, j, k)} sits at {@code (i·sx, j·sy, k·sz)} mm. Where the
 * box holds no site at all the result is {@link Double#POSITIVE_INFINITY}. Squared distances are
 * returned so that callers compare and select without square roots; take {@code Math.sqrt} for mm.
 *
 * <p>Algorithm: the separable method of Felzenszwalb &amp; Huttenlocher (2012, "Distance
 * Transforms of Sampled Functions", Theory of Computing 8:415–428): one pass per axis; the pass
 * along x computes the 1-D distance to the nearest site on each line directly, the passes along y
 * and z compute, per line, the lower envelope of the parabolas {@code w·(q − p)² + f(p)} (with
 * {@code w} the squared spacing of the axis) and sample it at every integer {@code q}. Each pass
 * is exact, so the result is exact up to floating-point rounding of the sums (a few ulps).
 *
 * <p>The 1-D algorithm ({@link #lowerEnvelope}) works on a plain line buffer and knows nothing of
 * storage; the grid driver gathers each line into a buffer, transforms it and scatters it back.
 * The lines of each axis pass are independent and are optionally handed to an {@link Executor}.
 *
 * <p>Note for cropping: the transform of a site set restricted to a box that contains all sites
 * equals, inside the box, the transform over the whole grid (distances are measured to sites, and
 * all of them are inside).
 */
public final class DistanceTransform {
    /** Work units (lines in the x pass, blocks of lines in the others) per task when an executor is used. */
    private static final int MIN_LINES_PER_TASK = 8;

    private DistanceTransform() {
    }

    /**
     * Squared distance in mm² from every voxel to the nearest site voxel, single-threaded.
     *
     * @param sites one flag per voxel of the box (x fastest), {@code true} for a site
     * @return a new array, {@code +∞} everywhere when there is no site
     */
    public static double[] squaredDistanceMm2(boolean[] sites, int nx, int ny, int nz,
                                              double sx, double sy, double sz) {
        return squaredDistanceMm2(sites, nx, ny, nz, sx, sy, sz, null);
    }

    /**
     * As {@link #squaredDistanceMm2(boolean[], int, int, int, double, double, double)}, handing
     * the lines of each axis pass to {@code executor} in chunks ({@code null}: caller's thread).
     */
    public static double[] squaredDistanceMm2(boolean[] sites, int nx, int ny, int nz,
                                              double sx, double sy, double sz, Executor executor) {
        checkBox(sites.length, nx, ny, nz);
        checkSpacing(sx, sy, sz);
        double[] out = new double[sites.length];
        // pass 1 (x): exact 1-D distance to the nearest site on the line
        double wx = sx * sx;
        runLines(ny * nz, executor, (from, to) -> {
            for (int line = from; line < to; line++) {
                siteLineX(sites, out, line * nx, nx, wx);
            }
        });
        envelopePasses(out, nx, ny, nz, sy * sy, sz * sz, executor);
        return out;
    }

    /**
     * The y and z passes, in place: {@code g} holds, per voxel, a function that is already
     * minimised along x (the output of the x pass); afterwards it holds the full transform.
     */
    static void envelopePasses(double[] g, int nx, int ny, int nz, double wy, double wz, Executor executor) {
        int blocks = (nx + BLOCK - 1) / BLOCK;
        if (ny > 1) {
            // lines along y: for slice z, x-adjacent lines are handled BLOCK at a time
            runLines(blocks * nz, executor, (from, to) -> {
                Scratch s = new Scratch(ny);
                for (int unit = from; unit < to; unit++) {
                    int z = unit / blocks;
                    int x0 = (unit - z * blocks) * BLOCK;
                    transformBlock(g, x0 + z * nx * ny, nx, ny, Math.min(BLOCK, nx - x0), wy, s);
                }
            });
        }
        if (nz > 1) {
            int plane = nx * ny;
            runLines(blocks * ny, executor, (from, to) -> {
                Scratch s = new Scratch(nz);
                for (int unit = from; unit < to; unit++) {
                    int y = unit / blocks;
                    int x0 = (unit - y * blocks) * BLOCK;
                    transformBlock(g, x0 + y * nx, plane, nz, Math.min(BLOCK, nx - x0), wz, s);
                }
            });
        }
    }

    /** Lines transformed together in a strided pass (their elements are adjacent in memory). */
    private static final int BLOCK = 16;

    /** Per-task line buffers. */
    private static final class Scratch {
        final double[] block;
        final double[] f;
        final double[] d;
        final int[] v;
        final double[] z;
        final double[] h;

        Scratch(int n) {
            block = new double[BLOCK * n];
            f = new double[n];
            d = new double[n];
            v = new int[n];
            z = new double[n + 1];
            h = new double[n];
        }
    }

    /**
     * Transforms {@code count} lines of length {@code n} starting at {@code base + b} (b &lt; count),
     * element {@code q} at offset {@code q·stride}: gathered row by row (contiguous reads), each line
     * transformed, scattered back row by row.
     */
    private static void transformBlock(double[] g, int base, int stride, int n, int count, double w, Scratch s) {
        double[] blk = s.block;
        for (int q = 0, i = base; q < n; q++, i += stride) {
            System.arraycopy(g, i, blk, q * count, count);
        }
        double[] f = s.f;
        double[] d = s.d;
        boolean changed = false;
        for (int b = 0; b < count; b++) {
            boolean any = false;
            for (int q = 0, o = b; q < n; q++, o += count) {
                double val = blk[o];
                f[q] = val;
                any |= val != Double.POSITIVE_INFINITY;
            }
            if (!any) {
                continue; // all infinite: stays infinite
            }
            lowerEnvelope(f, d, n, w, s.v, s.z, s.h);
            for (int q = 0, o = b; q < n; q++, o += count) {
                blk[o] = d[q];
            }
            changed = true;
        }
        if (changed) {
            for (int q = 0, i = base; q < n; q++, i += stride) {
                System.arraycopy(blk, q * count, g, i, count);
            }
        }
    }

    /** Exact 1-D distance along x: (k·sx)² where k is the index distance to the nearest site. */
    private static void siteLineX(boolean[] sites, double[] out, int base, int nx, double wx) {
        int last = -1;
        for (int q = 0; q < nx; q++) {
            if (sites[base + q]) {
                last = q;
                out[base + q] = 0.0;
            } else if (last >= 0) {
                double k = q - last;
                out[base + q] = k * k * wx;
            } else {
                out[base + q] = Double.POSITIVE_INFINITY;
            }
        }
        last = -1;
        for (int q = nx - 1; q >= 0; q--) {
            if (sites[base + q]) {
                last = q;
            } else if (last >= 0) {
                double k = last - q;
                double cand = k * k * wx;
                if (cand < out[base + q]) {
                    out[base + q] = cand;
                }
            }
        }
    }

    /**
     * The 1-D transform of a sampled function (Felzenszwalb &amp; Huttenlocher 2012, algorithm
     * DT(f)): {@code d[q] = min_p ( w·(q − p)² + f[p] )} over the {@code p} with finite
     * {@code f[p]}; {@code +∞} when every {@code f[p]} is infinite.
     *
     * @param f input values (length ≥ n), {@code +∞} allowed
     * @param d output (length ≥ n)
     * @param w weight of the squared index difference (the squared spacing, mm²)
     * @param v scratch, length ≥ n
     * @param z scratch, length ≥ n + 1
     */
    public static void lowerEnvelope(double[] f, double[] d, int n, double w, int[] v, double[] z) {
        double[] h = new double[n];
        lowerEnvelope(f, d, n, w, v, z, h);
    }

    /** As {@link #lowerEnvelope(double[], double[], int, double, int[], double[])} with a scratch {@code h} (length ≥ n). */
    static void lowerEnvelope(double[] f, double[] d, int n, double w, int[] v, double[] z, double[] h) {
        double invW = 1.0 / w;
        int k = -1;
        double hk = 0; // h of the parabola on top of the stack
        for (int q = 0; q < n; q++) {
            double fq = f[q];
            if (fq == Double.POSITIVE_INFINITY) {
                continue;
            }
            double hq = fq * invW + (double) q * q;
            // pop while the new parabola's intersection with the top one, (hq - hk) / (2 (q - v[k])),
            // lies at or left of z[k]; compared multiplied out (2 (q - v[k]) > 0), divided only once
            while (k >= 0 && hq - hk <= z[k] * (2.0 * (q - v[k]))) {
                k--;
                if (k >= 0) {
                    hk = h[k];
                }
            }
            double s = k < 0 ? Double.NEGATIVE_INFINITY : (hq - hk) / (2.0 * (q - v[k]));
            k++;
            v[k] = q;
            z[k] = s;
            h[k] = hq;
            hk = hq;
        }
        if (k < 0) {
            for (int q = 0; q < n; q++) {
                d[q] = Double.POSITIVE_INFINITY;
            }
            return;
        }
        z[k + 1] = Double.POSITIVE_INFINITY;
        // parabola j is lowest for the q with z[j] < q <= z[j + 1] (z strictly increasing)
        int q = 0;
        for (int j = 0; j <= k && q < n; j++) {
            double right = z[j + 1];
            int qEnd = right >= n - 1 ? n - 1 : (int) Math.floor(right);
            int p = v[j];
            double fp = f[p];
            for (; q <= qEnd; q++) {
                double diff = q - p;
                d[q] = w * diff * diff + fp;
            }
        }
    }

    /** A range of line numbers to process, {@code [from, to)}. */
    @FunctionalInterface
    interface LineRange {
        void run(int from, int to);
    }

    static void runLines(int lines, Executor executor, LineRange body) {
        if (executor == null || lines < 2 * MIN_LINES_PER_TASK) {
            body.run(0, lines);
            return;
        }
        int tasks = Math.min(8, lines / MIN_LINES_PER_TASK);
        int per = (lines + tasks - 1) / tasks;
        List<CompletableFuture<Void>> futures = new ArrayList<>(tasks);
        for (int from = per; from < lines; from += per) {
            int a = from;
            int b = Math.min(lines, from + per);
            futures.add(CompletableFuture.runAsync(() -> body.run(a, b), executor));
        }
        body.run(0, Math.min(lines, per)); // the caller works too
        for (CompletableFuture<Void> f : futures) {
            f.join();
        }
    }

    static void checkBox(int length, int nx, int ny, int nz) {
        if (nx <= 0 || ny <= 0 || nz <= 0) {
            throw new IllegalArgumentException("box dimensions must be positive: " + nx + "x" + ny + "x" + nz);
        }
        if ((long) nx * ny * nz != length) {
            throw new IllegalArgumentException("mask has " + length + " voxels, box " + nx + "x" + ny + "x" + nz
                + " needs " + (long) nx * ny * nz);
        }
    }

    static void checkSpacing(double sx, double sy, double sz) {
        if (!(sx > 0) || !(sy > 0) || !(sz > 0) || Double.isInfinite(sx) || Double.isInfinite(sy) || Double.isInfinite(sz)) {
            throw new IllegalArgumentException("spacing must be positive and finite");
        }
    }
}
