package org.accordia.report;

import java.util.List;

/**
 * The axial slice to show for a case: the slice {@code z} with the most voxels where the readers
 * disagree (marked by at least one reader and not by all: 0 &lt; votes &lt; readers), ties going to
 * the smallest z. When no voxel is disputed, the slice with the most voxels marked by every reader
 * is chosen instead (again ties to the smallest z; z = the first slice when all masks are empty);
 * {@link #disagreementVoxels()} is then 0, so the caller can say so.
 *
 * <p>Arrays use the x-fastest linear index {@code x + nx*(y + ny*z)} of {@code org.accordia.io.Geometry}.
 * The per-case step can work on a crop (e.g. the union bounding box of all readers): pass the
 * crop's dimensions and the z of its first slice as {@code zOffset}; the returned z is then in the
 * full volume. Cost: one pass over the (cropped) voxels, O(nx·ny·nz), and nz longs of memory.
 *
 * @param z the chosen slice (0-based, in the full volume)
 * @param disagreementVoxels number of disputed voxels in that slice (0 when none in the whole case)
 */
public record DisagreementSlice(int z, long disagreementVoxels) {

    /**
     * From a vote count per voxel (number of readers marking the voxel, read as an unsigned byte).
     *
     * @param readers number of readers (1..255)
     * @param zOffset z of the crop's first slice in the full volume (0 without a crop)
     * @throws IllegalArgumentException sizes disagree, or a vote exceeds {@code readers}
     */
    public static DisagreementSlice fromVotes(byte[] votes, int readers, int nx, int ny, int nz, int zOffset) {
        checkDims(votes.length, nx, ny, nz);
        if (readers < 1 || readers > 255) {
            throw new IllegalArgumentException("readers must be 1..255, was " + readers);
        }
        long[] disputed = new long[nz];
        long[] unanimous = new long[nz];
        int slice = nx * ny;
        for (int z = 0; z < nz; z++) {
            long d = 0;
            long u = 0;
            int base = z * slice;
            for (int i = base; i < base + slice; i++) {
                int v = votes[i] & 0xff;
                if (v > readers) {
                    throw new IllegalArgumentException("vote count " + v + " exceeds " + readers + " readers at index " + i);
                }
                if (v == readers) {
                    u++;
                } else if (v > 0) {
                    d++;
                }
            }
            disputed[z] = d;
            unanimous[z] = u;
        }
        return choose(disputed, unanimous, zOffset);
    }

    /** From a vote count per voxel over the whole volume (no crop). */
    public static DisagreementSlice fromVotes(byte[] votes, int readers, int nx, int ny, int nz) {
        return fromVotes(votes, readers, nx, ny, nz, 0);
    }

    /**
     * From one boolean mask per reader (all of length nx·ny·nz, optionally a crop starting at
     * slice {@code zOffset}).
     */
    public static DisagreementSlice find(List<boolean[]> readerMasks, int nx, int ny, int nz, int zOffset) {
        int r = readerMasks.size();
        if (r < 1 || r > 255) {
            throw new IllegalArgumentException("need 1..255 reader masks, got " + r);
        }
        int n = checkDims(readerMasks.get(0).length, nx, ny, nz);
        byte[] votes = new byte[n];
        for (boolean[] m : readerMasks) {
            if (m.length != n) {
                throw new IllegalArgumentException("reader masks differ in size");
            }
            for (int i = 0; i < n; i++) {
                if (m[i]) {
                    votes[i]++;
                }
            }
        }
        return fromVotes(votes, r, nx, ny, nz, zOffset);
    }

    /** From one boolean mask per reader over the whole volume (no crop). */
    public static DisagreementSlice find(List<boolean[]> readerMasks, int nx, int ny, int nz) {
        return find(readerMasks, nx, ny, nz, 0);
    }

    /** Extracts slice z (in the array's own indexing) of an x-fastest volume. */
    public static boolean[] slice(boolean[] volume, int nx, int ny, int z) {
        boolean[] s = new boolean[nx * ny];
        System.arraycopy(volume, z * nx * ny, s, 0, nx * ny);
        return s;
    }

    /** Extracts slice z (in the array's own indexing) of an x-fastest volume. */
    public static float[] slice(float[] volume, int nx, int ny, int z) {
        float[] s = new float[nx * ny];
        System.arraycopy(volume, z * nx * ny, s, 0, nx * ny);
        return s;
    }

    private static DisagreementSlice choose(long[] disputed, long[] unanimous, int zOffset) {
        int best = 0;
        for (int z = 1; z < disputed.length; z++) {
            if (disputed[z] > disputed[best]) {
                best = z;
            }
        }
        if (disputed[best] == 0) {
            for (int z = 1; z < unanimous.length; z++) {
                if (unanimous[z] > unanimous[best]) {
                    best = z;
                }
            }
        }
        return new DisagreementSlice(best + zOffset, disputed[best]);
    }

    private static int checkDims(int length, int nx, int ny, int nz) {
        if (nx < 1 || ny < 1 || nz < 1 || (long) nx * ny * nz != length) {
            throw new IllegalArgumentException("dimensions " + nx + "x" + ny + "x" + nz + " do not match " + length + " voxels");
        }
        return length;
    }
}
