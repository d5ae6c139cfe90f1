package org.accordia.grid;

/**
 * An axis-aligned box of voxels, inclusive lower and exclusive upper corner, in grid indices.
 * An empty box has some {@code x1 <= x0} (etc.); {@link #EMPTY} is the canonical one.
 */
public record Box(int x0, int y0, int z0, int x1, int y1, int z1) {
    /** The canonical empty box. */
    public static final Box EMPTY = new Box(0, 0, 0, 0, 0, 0);

    public Box {
        if (x0 < 0 || y0 < 0 || z0 < 0) {
            throw new IllegalArgumentException("box lower corner must be non-negative");
        }
    }

    /** The whole grid. */
    public static Box grid(int nx, int ny, int nz) {
        return new Box(0, 0, 0, nx, ny, nz);
    }

    public int nx() {
        return Math.max(0, x1 - x0);
    }

    public int ny() {
        return Math.max(0, y1 - y0);
    }

    public int nz() {
        return Math.max(0, z1 - z0);
    }

    /** Number of voxels in the box (0 when empty). */
    public int size() {
        return Math.toIntExact((long) nx() * ny() * nz());
    }

    public boolean isEmpty() {
        return size() == 0;
    }

    /** True when voxel (x, y, z) of the grid lies in the box. */
    public boolean contains(int x, int y, int z) {
        return x >= x0 && x < x1 && y >= y0 && y < y1 && z >= z0 && z < z1;
    }

    /** Grows by {@code margin} voxels on every side, clipped to the grid; empty stays empty. */
    public Box grow(int margin, int nx, int ny, int nz) {
        return grow(margin, margin, margin, nx, ny, nz);
    }

    /** Grows by a margin per axis (voxels), clipped to the grid; empty stays empty. */
    public Box grow(int mx, int my, int mz, int nx, int ny, int nz) {
        if (isEmpty()) {
            return EMPTY;
        }
        return new Box(Math.max(0, x0 - mx), Math.max(0, y0 - my), Math.max(0, z0 - mz),
            Math.min(nx, x1 + mx), Math.min(ny, y1 + my), Math.min(nz, z1 + mz));
    }

    /** The smallest box holding both (an empty box is neutral). */
    public Box union(Box o) {
        if (isEmpty()) {
            return o;
        }
        if (o.isEmpty()) {
            return this;
        }
        return new Box(Math.min(x0, o.x0), Math.min(y0, o.y0), Math.min(z0, o.z0),
            Math.max(x1, o.x1), Math.max(y1, o.y1), Math.max(z1, o.z1));
    }

    /** Linear index in the full grid of box voxel {@code i} (x fastest within the box). */
    public int gridIndex(int i, int gridNx, int gridNy) {
        int bx = nx();
        int by = ny();
        int x = i % bx;
        int r = i / bx;
        int y = r % by;
        int z = r / by;
        return (x0 + x) + gridNx * ((y0 + y) + gridNy * (z0 + z));
    }
}
