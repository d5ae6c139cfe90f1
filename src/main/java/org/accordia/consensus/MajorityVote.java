package org.accordia.consensus;

import org.accordia.agreement.PatternHistogram;

/**
 * Majority vote, binary and multi-label, from the histograms (common practice; e.g. Warfield et
 * al. 2004 use it as the baseline STAPLE is compared with).
 *
 * <p>Binary: a voxel is foreground when strictly more than half of the R readers mark it; a tie
 * (exactly R/2 of an even R) is background by default ({@link BinaryTieRule#TIE_TO_BACKGROUND})
 * or foreground ({@link BinaryTieRule#TIE_TO_FOREGROUND}).
 *
 * <p>Multi-label: the label (background included) with the most votes; when several labels share
 * the top count the voxel gets the undecided value ({@link LabelTieRule#UNDECIDED}, default: see
 * {@link UndecidedLabel}) or the smallest of the tied labels ({@link LabelTieRule#SMALLER_LABEL}).
 */
public final class MajorityVote {
    private MajorityVote() {
    }

    /** Whether a voxel with {@code marks} of {@code readers} readers marking it is foreground. */
    public static boolean foreground(int marks, int readers, BinaryTieRule rule) {
        return rule == BinaryTieRule.TIE_TO_FOREGROUND ? 2 * marks >= readers : 2 * marks > readers;
    }

    /** Foreground flag per distinct pattern of the histogram. */
    public static boolean[] binary(PatternHistogram h, BinaryTieRule rule) {
        boolean[] out = new boolean[h.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = foreground(Long.bitCount(h.pattern(i)), h.readers(), rule);
        }
        return out;
    }

    /** Voxels in the binary majority-vote consensus. */
    public static long binaryCount(PatternHistogram h, BinaryTieRule rule) {
        boolean[] f = binary(h, rule);
        long n = 0;
        for (int i = 0; i < f.length; i++) {
            if (f[i]) {
                n += h.count(i);
            }
        }
        return n;
    }

    /**
     * Label index (0..S−1) with the most votes per tuple, or −1 for a tie between several labels.
     */
    public static int[] labelIndices(LabelTupleHistogram h) {
        int s = h.labelCount();
        int[] votes = new int[s];
        int[] out = new int[h.size()];
        for (int i = 0; i < out.length; i++) {
            java.util.Arrays.fill(votes, 0);
            for (int j = 0; j < h.readers(); j++) {
                votes[h.labelIndex(i, j)]++;
            }
            out[i] = argmaxOrTie(votes);
        }
        return out;
    }

    static int argmaxOrTie(int[] votes) {
        int best = 0;
        boolean tie = false;
        for (int k = 1; k < votes.length; k++) {
            if (votes[k] > votes[best]) {
                best = k;
                tie = false;
            } else if (votes[k] == votes[best]) {
                tie = true;
            }
        }
        return tie ? -1 : best;
    }

    /**
     * Majority label VALUE per tuple under a tie rule.
     *
     * @param undecided value for ties under {@link LabelTieRule#UNDECIDED} (checked against the labels)
     */
    public static int[] labels(LabelTupleHistogram h, LabelTieRule rule, int undecided) {
        int[] lab = h.labels();
        if (rule == LabelTieRule.UNDECIDED) {
            UndecidedLabel.checked(undecided, lab);
        }
        int s = h.labelCount();
        int[] votes = new int[s];
        int[] out = new int[h.size()];
        for (int i = 0; i < out.length; i++) {
            java.util.Arrays.fill(votes, 0);
            for (int j = 0; j < h.readers(); j++) {
                votes[h.labelIndex(i, j)]++;
            }
            int k = argmaxOrTie(votes);
            if (k >= 0) {
                out[i] = lab[k];
            } else if (rule == LabelTieRule.UNDECIDED) {
                out[i] = undecided;
            } else {
                int best = 0;
                for (int t = 1; t < s; t++) {
                    if (votes[t] > votes[best]) {
                        best = t; // first maximum = smallest label (labels ascend)
                    }
                }
                out[i] = lab[best];
            }
        }
        return out;
    }

    /** {@link #labels(LabelTupleHistogram, LabelTieRule, int)} with the default undecided value. */
    public static int[] labels(LabelTupleHistogram h, LabelTieRule rule) {
        return labels(h, rule, UndecidedLabel.defaultFor(h.labels()));
    }
}
