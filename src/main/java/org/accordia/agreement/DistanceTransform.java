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
    /** Lines per task when an executor is used (keeps scheduling overhead small). */
    private static final int MIN_LINES_PER_TASK = 64;

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
     * Completes an exact transform in place from values that are already exact along x (for
     * example, {@code 0} at sites and {@code +∞} elsewhere for a 1-voxel-wide x extent, or the
     * output of the x pass): runs the y and z envelope passes.
     */
    static void envelopePasses(double[] g, int nx, int ny, int nz, double wy, double wz, Executor executor) {
        if (ny > 1) {
            runLines(nx * nz, executor, (from, to) -> {
                Scratch s = new Scratch(ny);
                for (int line = from; line < to; line++) {
                    int z = line / nx;
                    int x = line - z * nx;
                    int base = x + z * nx * ny;
                    transformStrided(g, base, nx, ny, wy, s);
                }
            });
        }
        if (nz > 1) {
            int plane = nx * ny;
            runLines(plane, executor, (from, to) -> {
                Scratch s = new Scratch(nz);
                for (int line = from; line < to; line++) {
                    transformStrided(g, line, plane, nz, wz, s);
                }
            });
        }
    }

    /** Per-task line buffers. */
    private static final class Scratch {
        final double[] f;
        final double[] d;
        final int[] v;
        final double[] z;

        Scratch(int n) {
            f = new double[n];
            d = new double[n];
            v = new int[n];
            z = new double[n + 1];
        }
    }

    private static void transformStrided(double[] g, int base, int stride, int n, double w, Scratch s) {
        double[] f = s.f;
        boolean any = false;
        for (int q = 0, i = base; q < n; q++, i += stride) {
            double val = g[i];
            f[q] = val;
            any |= val != Double.POSITIVE_INFINITY;
        }
        if (!any) {
            return; // all infinite: stays infinite
        }
        lowerEnvelope(f, s.d, n, w, s.v, s.z);
        double[] d = s.d;
        for (int q = 0, i = base; q < n; q++, i += stride) {
            g[i] = d[q];
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
        int k = -1;
        for (int q = 0; q < n; q++) {
            double fq = f[q];
            if (fq == Double.POSITIVE_INFINITY) {
                continue;
            }
            double hq = fq / w + (double) q * q;
            double s = Double.NEGATIVE_INFINITY;
            while (k >= 0) {
                int p = v[k];
                double hp = f[p] / w + (double) p * p;
                s = (hq - hp) / (2.0 * (q - p));
                if (s <= z[k]) {
                    k--;
                } else {
                    break;
                }
            }
            if (k < 0) {
                s = Double.NEGATIVE_INFINITY;
            }
            k++;
            v[k] = q;
            z[k] = s;
        }
        if (k < 0) {
            for (int q = 0; q < n; q++) {
                d[q] = Double.POSITIVE_INFINITY;
            }
            return;
        }
        z[k + 1] = Double.POSITIVE_INFINITY;
        int j = 0;
        for (int q = 0; q < n; q++) {
            while (z[j + 1] < q) {
                j++;
            }
            int p = v[j];
            double diff = q - p;
            d[q] = w * diff * diff + f[p];
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
