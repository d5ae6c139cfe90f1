package org.accordia.io;

/**
 * Bounds applied before any allocation driven by a file header.
 *
 * @param maxVoxels the largest voxel count one volume may declare (default 2^31 - 16, the most a
 *     Java array holds); a larger declaration is refused with a clear message
 * @param allowPathEscape whether paths given in a manifest or detached header may point outside
 *     the study root
 */
public record ReadLimits(long maxVoxels, boolean allowPathEscape) {
    /** The most elements a Java array can hold on common JVMs. */
    public static final long ARRAY_LIMIT = Integer.MAX_VALUE - 16L;

    public static final ReadLimits DEFAULT = new ReadLimits(ARRAY_LIMIT, false);

    public ReadLimits {
        if (maxVoxels <= 0) {
            throw new IllegalArgumentException("maxVoxels must be positive");
        }
        maxVoxels = Math.min(maxVoxels, ARRAY_LIMIT);
    }

    public ReadLimits withMaxVoxels(long max) {
        return new ReadLimits(max, allowPathEscape);
    }
}
