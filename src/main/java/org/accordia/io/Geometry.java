package org.accordia.io;

import java.util.Arrays;

/**
 * Where a volume's voxels lie in the patient's space.
 *
 * <p>Conventions (stated in docs/formats.md):
 * <ul>
 *   <li>{@code dims} has exactly three entries (nx, ny, nz); a 2-D image has {@code nz = 1}.</li>
 *   <li>Voxel index {@code (i, j, k)} is stored at linear offset {@code i + nx * (j + ny * k)}
 *       (x fastest), the order of NIfTI, NRRD and MetaImage alike.</li>
 *   <li>{@code spacingMm} is the distance between neighbouring voxel centres along each index
 *       axis, in millimetres, always positive.</li>
 *   <li>{@code affine} is the 4x4 matrix (row-major) taking {@code (i, j, k, 1)} to world
 *       coordinates in millimetres in the RAS+ convention of NIfTI. Readers of LPS formats (NRRD,
 *       MetaImage) negate the first two world axes so that all formats compare alike.</li>
 * </ul>
 */
public record Geometry(int[] dims, double[] spacingMm, double[][] affine) {

    public Geometry {
        if (dims == null || dims.length != 3) {
            throw new IllegalArgumentException("dims must have 3 entries");
        }
        if (spacingMm == null || spacingMm.length != 3) {
            throw new IllegalArgumentException("spacing must have 3 entries");
        }
        if (affine == null || affine.length != 4) {
            throw new IllegalArgumentException("affine must be 4x4");
        }
        dims = dims.clone();
        spacingMm = spacingMm.clone();
        double[][] copy = new double[4][];
        for (int r = 0; r < 4; r++) {
            if (affine[r] == null || affine[r].length != 4) {
                throw new IllegalArgumentException("affine must be 4x4");
            }
            copy[r] = affine[r].clone();
        }
        affine = copy;
        for (int d = 0; d < 3; d++) {
            if (dims[d] <= 0) {
                throw new IllegalArgumentException("dimension " + d + " must be positive");
            }
            if (!(spacingMm[d] > 0) || Double.isInfinite(spacingMm[d])) {
                throw new IllegalArgumentException("spacing " + d + " must be positive and finite");
            }
        }
    }

    /** A grid with the given spacing, axis-aligned, origin at world zero (no rotation, RAS+). */
    public static Geometry axisAligned(int nx, int ny, int nz, double sx, double sy, double sz) {
        double[][] a = {
            {sx, 0, 0, 0},
            {0, sy, 0, 0},
            {0, 0, sz, 0},
            {0, 0, 0, 1}
        };
        return new Geometry(new int[] {nx, ny, nz}, new double[] {sx, sy, sz}, a);
    }

    public int nx() {
        return dims[0];
    }

    public int ny() {
        return dims[1];
    }

    public int nz() {
        return dims[2];
    }

    /** Number of voxels as a long (never overflows for valid dims). */
    public long voxelCount() {
        return (long) dims[0] * dims[1] * dims[2];
    }

    /** Volume of one voxel in millilitres (1 ml = 1000 mm^3). */
    public double voxelVolumeMl() {
        return spacingMm[0] * spacingMm[1] * spacingMm[2] / 1000.0;
    }

    public boolean is2d() {
        return dims[2] == 1;
    }

    /** Accessor returning a defensive copy. */
    @Override
    public int[] dims() {
        return dims.clone();
    }

    /** Accessor returning a defensive copy. */
    @Override
    public double[] spacingMm() {
        return spacingMm.clone();
    }

    /** Accessor returning a defensive copy. */
    @Override
    public double[][] affine() {
        double[][] copy = new double[4][];
        for (int r = 0; r < 4; r++) {
            copy[r] = affine[r].clone();
        }
        return copy;
    }

    public double spacing(int axis) {
        return spacingMm[axis];
    }

    public double affine(int row, int col) {
        return affine[row][col];
    }

    /**
     * The first difference between this grid and another beyond {@code toleranceMm}, in words, or
     * {@code null} when they agree: dimensions must match exactly, spacing and every affine entry
     * within the tolerance.
     */
    public String differenceFrom(Geometry other, double toleranceMm) {
        if (!Arrays.equals(dims, other.dims)) {
            return "dimensions " + dimsText() + " vs " + other.dimsText();
        }
        for (int d = 0; d < 3; d++) {
            double diff = Math.abs(spacingMm[d] - other.spacingMm[d]);
            if (!(diff <= toleranceMm)) {
                return String.format(java.util.Locale.ROOT,
                    "spacing along axis %d differs by %.6g mm (%.6g vs %.6g)",
                    d, diff, spacingMm[d], other.spacingMm[d]);
            }
        }
        for (int r = 0; r < 3; r++) {
            for (int c = 0; c < 4; c++) {
                double diff = Math.abs(affine[r][c] - other.affine[r][c]);
                if (!(diff <= toleranceMm)) {
                    return String.format(java.util.Locale.ROOT,
                        "affine entry [%d][%d] differs by %.6g mm (%.6g vs %.6g)",
                        r, c, diff, affine[r][c], other.affine[r][c]);
                }
            }
        }
        return null;
    }

    public String dimsText() {
        return dims[0] + "x" + dims[1] + "x" + dims[2];
    }

    public String spacingText() {
        return String.format(java.util.Locale.ROOT, "%.4gx%.4gx%.4g mm", spacingMm[0], spacingMm[1], spacingMm[2]);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Geometry g
            && Arrays.equals(dims, g.dims)
            && Arrays.equals(spacingMm, g.spacingMm)
            && Arrays.deepEquals(affine, g.affine);
    }

    @Override
    public int hashCode() {
        return 31 * (31 * Arrays.hashCode(dims) + Arrays.hashCode(spacingMm)) + Arrays.deepHashCode(affine);
    }

    @Override
    public String toString() {
        return "Geometry[" + dimsText() + ", " + spacingText() + "]";
    }
}
