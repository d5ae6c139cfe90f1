package org.accordia.consensus;

import java.util.Arrays;

/**
 * Where one reader's border lies relative to a consensus boundary, as counts of border voxels:
 * in all, more than the structure's tolerance outside the consensus, and more than the tolerance
 * inside; the same per direction from the consensus centre. Counts add up over readers and cases,
 * so a centre's share is a ratio of sums. No voxels are kept.
 *
 * <p>Definitions (the conventions of {@link SignedSurface}): for each border voxel v of the reader,
 * s(v) = +d(v) when v is outside the consensus and −d(v) inside, d(v) the Euclidean distance (mm,
 * between voxel centres) to the nearest consensus border voxel. v is <em>beyond outside</em> when
 * s(v) &gt; τ and <em>beyond inside</em> when s(v) &lt; −τ (τ = the structure's tolerance in mm).
 * The direction of v is the axis and sign of the largest component, in mm, of v − m, m the centroid
 * (mm) of the consensus mask: 0 = +x (increasing first array index), 1 = −x, 2 = +y, 3 = −y,
 * 4 = +z, 5 = −z; ties go to the lower axis. A uniform margin shifts every direction alike; a part
 * added on one side raises the share beyond outside in that direction only.
 *
 * @param toleranceMm τ
 * @param border      border voxels of the reader (0 when the reader or the consensus is empty)
 * @param outside     of those, beyond outside
 * @param inside      of those, beyond inside
 * @param borderByDirection  border voxels per direction (6)
 * @param outsideByDirection beyond outside per direction (6)
 */
public record BorderProfile(double toleranceMm, long border, long outside, long inside, long[] borderByDirection,
        long[] outsideByDirection) {
    /** Number of directions: ±x, ±y, ±z. */
    public static final int DIRECTIONS = 6;
    /** Names of the directions in array axes, index order. */
    public static final java.util.List<String> DIRECTION_NAMES = java.util.List.of("+x", "-x", "+y", "-y", "+z", "-z");

    public BorderProfile {
        if (borderByDirection.length != DIRECTIONS || outsideByDirection.length != DIRECTIONS) {
            throw new IllegalArgumentException("six directions expected");
        }
        borderByDirection = borderByDirection.clone();
        outsideByDirection = outsideByDirection.clone();
    }

    /** An empty profile (no border, or no consensus). */
    public static BorderProfile empty(double toleranceMm) {
        return new BorderProfile(toleranceMm, 0, 0, 0, new long[DIRECTIONS], new long[DIRECTIONS]);
    }

    /** Share of the border beyond the tolerance outside; NaN without border. */
    public double outsideShare() {
        return border == 0 ? Double.NaN : (double) outside / border;
    }

    /** Share of the border beyond the tolerance inside; NaN without border. */
    public double insideShare() {
        return border == 0 ? Double.NaN : (double) inside / border;
    }

    @Override
    public long[] borderByDirection() {
        return borderByDirection.clone();
    }

    @Override
    public long[] outsideByDirection() {
        return outsideByDirection.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof BorderProfile p && Double.compare(p.toleranceMm, toleranceMm) == 0 && p.border == border
            && p.outside == outside && p.inside == inside && Arrays.equals(p.borderByDirection, borderByDirection)
            && Arrays.equals(p.outsideByDirection, outsideByDirection);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(new long[] {border, outside, inside}) * 31 + Arrays.hashCode(outsideByDirection);
    }

    /**
     * The profile by the plain definition on full masks (brute force: for every reader border voxel
     * the distance to every consensus border voxel); the oracle of the tests.
     */
    public static BorderProfile bruteForce(boolean[] reader, boolean[] consensus, int nx, int ny, int nz,
            double sx, double sy, double sz, double toleranceMm) {
        boolean[] rb = org.accordia.agreement.Borders.borderMask(reader, nx, ny, nz);
        boolean[] cb = org.accordia.agreement.Borders.borderMask(consensus, nx, ny, nz);
        double[] m = centroidMm(consensus, nx, ny, sx, sy, sz);
        long[] bd = new long[DIRECTIONS];
        long[] od = new long[DIRECTIONS];
        long border = 0;
        long out = 0;
        long in = 0;
        if (m == null) {
            return empty(toleranceMm);
        }
        int nxy = nx * ny;
        for (int i = 0; i < rb.length; i++) {
            if (!rb[i]) {
                continue;
            }
            double best = Double.POSITIVE_INFINITY;
            for (int k = 0; k < cb.length; k++) {
                if (cb[k]) {
                    double dx = (i % nx - k % nx) * sx;
                    double dy = (i / nx % ny - k / nx % ny) * sy;
                    double dz = (i / nxy - k / nxy) * sz;
                    best = Math.min(best, dx * dx + dy * dy + dz * dz);
                }
            }
            double s = consensus[i] ? -Math.sqrt(best) : Math.sqrt(best);
            int dir = direction(i % nx * sx - m[0], i / nx % ny * sy - m[1], i / nxy * sz - m[2]);
            border++;
            bd[dir]++;
            if (s > toleranceMm) {
                out++;
                od[dir]++;
            } else if (s < -toleranceMm) {
                in++;
            }
        }
        return new BorderProfile(toleranceMm, border, out, in, bd, od);
    }

    /** Centroid in mm (voxel centres at index × spacing) of a mask, or null when it is empty. */
    static double[] centroidMm(boolean[] mask, int nx, int ny, double sx, double sy, double sz) {
        double x = 0;
        double y = 0;
        double z = 0;
        long n = 0;
        int nxy = nx * ny;
        for (int i = 0; i < mask.length; i++) {
            if (mask[i]) {
                x += i % nx;
                y += i / nx % ny;
                z += i / nxy;
                n++;
            }
        }
        return n == 0 ? null : new double[] {x / n * sx, y / n * sy, z / n * sz};
    }

    /** Direction index of an offset in mm: the axis of the largest |component|, ties to the lower axis. */
    static int direction(double dx, double dy, double dz) {
        double ax = Math.abs(dx);
        double ay = Math.abs(dy);
        double az = Math.abs(dz);
        if (ax >= ay && ax >= az) {
            return dx >= 0 ? 0 : 1;
        }
        if (ay >= az) {
            return dy >= 0 ? 2 : 3;
        }
        return dz >= 0 ? 4 : 5;
    }
}
