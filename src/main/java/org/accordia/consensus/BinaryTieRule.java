package org.accordia.consensus;

/**
 * What a binary majority vote does with a tie (exactly half of an even number of readers mark the
 * voxel).
 */
public enum BinaryTieRule {
    /** Default: foreground only when strictly more than half of the readers mark the voxel. */
    TIE_TO_BACKGROUND,
    /** Foreground when at least half of the readers mark the voxel. */
    TIE_TO_FOREGROUND
}
