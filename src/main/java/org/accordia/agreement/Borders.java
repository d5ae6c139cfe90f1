package org.accordia.agreement;

import org.accordia.grid.Box;

/**
 * Border voxels of a foreground mask, and boxes to crop a grid to.
 *
 * <p>Convention (docs/metrics.md): a border voxel is a foreground voxel with at least one
 * face-neighbour in background — 6-connectivity in 3-D, 4-connectivity in 2-D ({@code nz = 1}).
 * Outside the grid counts as background, so foreground voxels on the grid's edge are border
 * voxels. When working on a box cropped from a grid, the neighbours of the box's voxels are
 * judged on the FULL grid: a box face inside the grid is not background (the voxel beyond it is
 * read from the full mask); only the grid's own edge is.
 *
 * <p>Empty input gives an empty border (all {@code false}).
 */
public final class Borders {
    private Borders() {
    }


    /** The bounding box of the {@code true} voxels, {@link Box#EMPTY} when there is none. */
    public static Box boundingBox(boolean[] fg, int nx, int ny, int nz) {
        DistanceTransform.checkBox(fg.length, nx, ny, nz);
        int x0 = Integer.MAX_VALUE;
        int y0 = Integer.MAX_VALUE;
        int z0 = Integer.MAX_VALUE;
        int x1 = -1;
        int y1 = -1;
        int z1 = -1;
        int i = 0;
        for (int z = 0; z < nz; z++) {
            for (int y = 0; y < ny; y++) {
                for (int x = 0; x < nx; x++, i++) {
                    if (fg[i]) {
                        x0 = Math.min(x0, x);
                        x1 = Math.max(x1, x);
                        y0 = Math.min(y0, y);
                        y1 = Math.max(y1, y);
                        z0 = Math.min(z0, z);
                        z1 = Math.max(z1, z);
                    }
                }
            }
        }
        if (x1 < 0) {
            return Box.EMPTY;
        }
        return new Box(x0, y0, z0, x1 + 1, y1 + 1, z1 + 1);
    }

    /** Border voxels of a mask covering the whole grid. */
    public static boolean[] borderMask(boolean[] fg, int nx, int ny, int nz) {
        return borderMaskInBox(fg, nx, ny, nz, Box.grid(nx, ny, nz));
    }

    /**
     * Border voxels of the full-grid mask {@code fullFg}, for the voxels of {@code box} only
     * (result indexed within the box, x fastest). Neighbours are read from the full grid, so a
     * box face inside the grid is not treated as background.
     */
    public static boolean[] borderMaskInBox(boolean[] fullFg, int nx, int ny, int nz, Box box) {
        DistanceTransform.checkBox(fullFg.length, nx, ny, nz);
        checkInside(box, nx, ny, nz);
        boolean[] out = new boolean[box.size()];
        if (box.isEmpty()) {
            return out;
        }
        boolean three = nz > 1;
        int plane = nx * ny;
        int o = 0;
        for (int z = box.z0(); z < box.z1(); z++) {
            for (int y = box.y0(); y < box.y1(); y++) {
                int row = nx * (y + ny * z);
                for (int x = box.x0(); x < box.x1(); x++, o++) {
                    int i = row + x;
                    if (!fullFg[i]) {
                        continue;
                    }
                    out[o] = x == 0 || x == nx - 1 || y == 0 || y == ny - 1
                        || (three && (z == 0 || z == nz - 1))
                        || !fullFg[i - 1] || !fullFg[i + 1] || !fullFg[i - nx] || !fullFg[i + nx]
                        || (three && (!fullFg[i - plane] || !fullFg[i + plane]));
                }
            }
        }
        return out;
    }

    /**
     * Border voxels of the structure {@code member[label]} of a byte label grid, for the voxels
     * of {@code box} only (result indexed within the box), neighbours read from the full grid.
     *
     * @param labels full-grid unsigned byte labels (x fastest)
     * @param member 256 flags: which label values belong to the structure
     */
    public static boolean[] borderMaskInBox(byte[] labels, boolean[] member, int nx, int ny, int nz, Box box) {
        int[] idx = borderIndicesInBox(labels, member, nx, ny, nz, box);
        boolean[] out = new boolean[box.size()];
        for (int i : idx) {
            out[i] = true;
        }
        return out;
    }

    /**
     * The border voxels of the structure {@code member[label]} inside {@code box}, as ascending
     * linear indices WITHIN the box (x fastest); same convention as
     * {@link #borderMaskInBox(byte[], boolean[], int, int, int, Box)}.
     */
    public static int[] borderIndicesInBox(byte[] labels, boolean[] member, int nx, int ny, int nz, Box box) {
        DistanceTransform.checkBox(labels.length, nx, ny, nz);
        if (member.length != 256) {
            throw new IllegalArgumentException("member table must have 256 entries");
        }
        checkInside(box, nx, ny, nz);
        int[] idx = new int[Math.max(16, box.size() / 16)];
        int n = 0;
        if (box.isEmpty()) {
            return new int[0];
        }
        boolean three = nz > 1;
        int plane = nx * ny;
        int o = 0;
        for (int z = box.z0(); z < box.z1(); z++) {
            boolean zEdge = three && (z == 0 || z == nz - 1);
            for (int y = box.y0(); y < box.y1(); y++) {
                int row = nx * (y + ny * z);
                boolean yzEdge = zEdge || y == 0 || y == ny - 1;
                for (int x = box.x0(); x < box.x1(); x++, o++) {
                    int i = row + x;
                    if (!member[labels[i] & 0xFF]) {
                        continue;
                    }
                    if (yzEdge || x == 0 || x == nx - 1
                        || !member[labels[i - 1] & 0xFF] || !member[labels[i + 1] & 0xFF]
                        || !member[labels[i - nx] & 0xFF] || !member[labels[i + nx] & 0xFF]
                        || (three && (!member[labels[i - plane] & 0xFF] || !member[labels[i + plane] & 0xFF]))) {
                        if (n == idx.length) {
                            idx = java.util.Arrays.copyOf(idx, idx.length * 2);
                        }
                        idx[n++] = o;
                    }
                }
            }
        }
        return java.util.Arrays.copyOf(idx, n);
    }

    /**
     * As {@link #borderMaskInBox(byte[], boolean[], int, int, int, Box)} for int label storage;
     * {@code labels} values in {@code sortedSet} (ascending) belong to the structure.
     */
    public static boolean[] borderMaskInBox(int[] labels, int[] sortedSet, int nx, int ny, int nz, Box box) {
        DistanceTransform.checkBox(labels.length, nx, ny, nz);
        checkInside(box, nx, ny, nz);
        // Build the membership of the box plus a one-voxel shell (clipped), then judge on the grid.
        Box shell = box.grow(1, nx, ny, nz);
        boolean[] shellFg = cropInts(labels, sortedSet, nx, ny, nz, shell);
        boolean[] borderShell = borderMaskOfShell(shellFg, shell, nx, ny, nz);
        boolean[] out = new boolean[box.size()];
        int o = 0;
        for (int z = box.z0(); z < box.z1(); z++) {
            for (int y = box.y0(); y < box.y1(); y++) {
                int s = (box.x0() - shell.x0()) + shell.nx() * ((y - shell.y0()) + shell.ny() * (z - shell.z0()));
                for (int x = box.x0(); x < box.x1(); x++, o++, s++) {
                    out[o] = borderShell[s];
                }
            }
        }
        return out;
    }

    /** Border flags within a shell box whose own interior-face voxels are only used as neighbours. */
    private static boolean[] borderMaskOfShell(boolean[] fg, Box shell, int nx, int ny, int nz) {
        int bx = shell.nx();
        int by = shell.ny();
        int bz = shell.nz();
        boolean three = nz > 1;
        int plane = bx * by;
        boolean[] out = new boolean[fg.length];
        int o = 0;
        for (int z = 0; z < bz; z++) {
            int gz = shell.z0() + z;
            for (int y = 0; y < by; y++) {
                int gy = shell.y0() + y;
                for (int x = 0; x < bx; x++, o++) {
                    if (!fg[o]) {
                        continue;
                    }
                    int gx = shell.x0() + x;
                    boolean border = gx == 0 || gx == nx - 1 || gy == 0 || gy == ny - 1 || (three && (gz == 0 || gz == nz - 1));
                    if (!border) {
                        // interior of the grid: neighbours exist; those outside the shell are never asked for
                        // by the caller (it reads only voxels at least one voxel inside the shell or on the grid edge)
                        border = (x > 0 && !fg[o - 1]) || (x < bx - 1 && !fg[o + 1])
                            || (y > 0 && !fg[o - bx]) || (y < by - 1 && !fg[o + bx])
                            || (three && ((z > 0 && !fg[o - plane]) || (z < bz - 1 && !fg[o + plane])));
                    }
                    out[o] = border;
                }
            }
        }
        return out;
    }

    /** The voxels of {@code box} of a full-grid mask (x fastest within the box). */
    public static boolean[] crop(boolean[] fullFg, int nx, int ny, int nz, Box box) {
        DistanceTransform.checkBox(fullFg.length, nx, ny, nz);
        checkInside(box, nx, ny, nz);
        boolean[] out = new boolean[box.size()];
        int o = 0;
        for (int z = box.z0(); z < box.z1(); z++) {
            for (int y = box.y0(); y < box.y1(); y++) {
                int row = box.x0() + nx * (y + ny * z);
                System.arraycopy(fullFg, row, out, o, box.nx());
                o += box.nx();
            }
        }
        return out;
    }

    /** Membership of the structure ({@code member[label]}) for the voxels of {@code box}. */
    public static boolean[] crop(byte[] labels, boolean[] member, int nx, int ny, int nz, Box box) {
        DistanceTransform.checkBox(labels.length, nx, ny, nz);
        checkInside(box, nx, ny, nz);
        boolean[] out = new boolean[box.size()];
        int o = 0;
        for (int z = box.z0(); z < box.z1(); z++) {
            for (int y = box.y0(); y < box.y1(); y++) {
                int row = nx * (y + ny * z);
                for (int x = box.x0(); x < box.x1(); x++) {
                    out[o++] = member[labels[row + x] & 0xFF];
                }
            }
        }
        return out;
    }

    /** Membership of the label set {@code sortedSet} (ascending) for the voxels of {@code box}. */
    public static boolean[] cropInts(int[] labels, int[] sortedSet, int nx, int ny, int nz, Box box) {
        DistanceTransform.checkBox(labels.length, nx, ny, nz);
        checkInside(box, nx, ny, nz);
        boolean[] out = new boolean[box.size()];
        int o = 0;
        for (int z = box.z0(); z < box.z1(); z++) {
            for (int y = box.y0(); y < box.y1(); y++) {
                int row = nx * (y + ny * z);
                for (int x = box.x0(); x < box.x1(); x++) {
                    out[o++] = java.util.Arrays.binarySearch(sortedSet, labels[row + x]) >= 0;
                }
            }
        }
        return out;
    }

    private static void checkInside(Box box, int nx, int ny, int nz) {
        if (!box.isEmpty() && (box.x1() > nx || box.y1() > ny || box.z1() > nz)) {
            throw new IllegalArgumentException("box " + box + " exceeds the grid " + nx + "x" + ny + "x" + nz);
        }
    }
}
