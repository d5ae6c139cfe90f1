package org.accordia.demo;

import java.util.SplittableRandom;

/**
 * A smooth random scalar field in millimetre space: independent Gaussian values on a coarse
 * regular grid, clamped to +-2.5 standard deviations, interpolated trilinearly. Low-frequency by
 * construction (nothing varies faster than the grid step), bounded by {@link #bound()}, and cheap
 * to evaluate. Values outside the grid are those of the nearest grid cell (clamped indices).
 */
final class SmoothField {
    private final double ox;
    private final double oy;
    private final double oz;
    private final double step;
    private final int nx;
    private final int ny;
    private final int nz;
    private final float[] values;
    private final double bound;

    /**
     * @param min lower corner of the region in mm (x, y, z)
     * @param max upper corner in mm
     * @param stepMm grid step in mm
     * @param sigma standard deviation of the grid values
     */
    SmoothField(double[] min, double[] max, double stepMm, double sigma, SplittableRandom rng) {
        this.step = stepMm;
        this.ox = min[0] - stepMm;
        this.oy = min[1] - stepMm;
        this.oz = min[2] - stepMm;
        this.nx = (int) Math.ceil((max[0] - min[0]) / stepMm) + 3;
        this.ny = (int) Math.ceil((max[1] - min[1]) / stepMm) + 3;
        this.nz = (int) Math.ceil((max[2] - min[2]) / stepMm) + 3;
        this.values = new float[nx * ny * nz];
        this.bound = 2.5 * sigma;
        for (int i = 0; i < values.length; i++) {
            double g = gaussian(rng) * sigma;
            values[i] = (float) Math.max(-bound, Math.min(bound, g));
        }
    }

    /** Largest absolute value the field can take. */
    double bound() {
        return bound;
    }

    double value(double x, double y, double z) {
        double fx = (x - ox) / step;
        double fy = (y - oy) / step;
        double fz = (z - oz) / step;
        int ix = clamp((int) Math.floor(fx), nx - 2);
        int iy = clamp((int) Math.floor(fy), ny - 2);
        int iz = clamp((int) Math.floor(fz), nz - 2);
        double tx = Math.max(0, Math.min(1, fx - ix));
        double ty = Math.max(0, Math.min(1, fy - iy));
        double tz = Math.max(0, Math.min(1, fz - iz));
        int base = ix + nx * (iy + ny * iz);
        int sy = nx;
        int sz = nx * ny;
        double c00 = values[base] * (1 - tx) + values[base + 1] * tx;
        double c10 = values[base + sy] * (1 - tx) + values[base + sy + 1] * tx;
        double c01 = values[base + sz] * (1 - tx) + values[base + sz + 1] * tx;
        double c11 = values[base + sy + sz] * (1 - tx) + values[base + sy + sz + 1] * tx;
        double c0 = c00 * (1 - ty) + c10 * ty;
        double c1 = c01 * (1 - ty) + c11 * ty;
        return c0 * (1 - tz) + c1 * tz;
    }

    /**
     * Values along one grid row: {@code out[i] = field(x0 + i * dx, y, z)} for i in [0, n),
     * interpolating in y and z once per coarse column and then linearly along x (the same
     * trilinear interpolant, evaluated in another order; equal up to rounding).
     */
    void row(double x0, double dx, int n, double y, double z, double[] out) {
        double fy = (y - oy) / step;
        double fz = (z - oz) / step;
        int iy = clamp((int) Math.floor(fy), ny - 2);
        int iz = clamp((int) Math.floor(fz), nz - 2);
        double ty = Math.max(0, Math.min(1, fy - iy));
        double tz = Math.max(0, Math.min(1, fz - iz));
        double[] column = new double[nx];
        for (int ix = 0; ix < nx; ix++) {
            int base = ix + nx * (iy + ny * iz);
            double c0 = values[base] * (1 - ty) + values[base + nx] * ty;
            double c1 = values[base + nx * ny] * (1 - ty) + values[base + nx * ny + nx] * ty;
            column[ix] = c0 * (1 - tz) + c1 * tz;
        }
        for (int i = 0; i < n; i++) {
            double fx = (x0 + i * dx - ox) / step;
            int ix = clamp((int) Math.floor(fx), nx - 2);
            double tx = Math.max(0, Math.min(1, fx - ix));
            out[i] = column[ix] * (1 - tx) + column[ix + 1] * tx;
        }
    }

    private static int clamp(int i, int hi) {
        return i < 0 ? 0 : Math.min(i, hi);
    }

    /** A standard normal deviate (Box-Muller with StrictMath, so identical on every JVM). */
    static double gaussian(SplittableRandom rng) {
        double u1 = rng.nextDouble();
        double u2 = rng.nextDouble();
        if (u1 < 1e-300) {
            u1 = 1e-300;
        }
        return StrictMath.sqrt(-2 * StrictMath.log(u1)) * StrictMath.cos(2 * Math.PI * u2);
    }
}
