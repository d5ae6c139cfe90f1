package org.accordia.consensus;

/** What a multi-label consensus does when several labels share the top vote or posterior. */
public enum LabelTieRule {
    /** Default: the voxel gets the undecided value (never a real label). */
    UNDECIDED,
    /** The smallest of the tied label values. */
    SMALLER_LABEL
}
