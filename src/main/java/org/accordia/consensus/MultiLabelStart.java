package org.accordia.consensus;

/**
 * How multi-label STAPLE starts. Both run the M-step first from initial weights W built from the
 * majority vote; they differ only on voxels where several labels tie for most votes.
 */
public enum MultiLabelStart {
    /**
     * Default: W = indicator of the majority label; on a tie the weight is split equally between
     * the tied labels.
     */
    MAJORITY_WEIGHTS,
    /**
     * W = indicator of the majority label, tied voxels left out of the first M-step (W = 0). The
     * first M-step then gives θ_j[s'][s] = P(reader j says s' | unique majority label s) counted
     * over voxels with a unique majority — the same as starting with an E-step from confusion
     * matrices initialised from the majority vote, as ITK's MultiLabelSTAPLEImageFilter does.
     */
    MAJORITY_CONFUSION
}
