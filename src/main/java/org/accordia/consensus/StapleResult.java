package org.accordia.consensus;

import java.util.Arrays;
import org.accordia.agreement.PatternHistogram;

/**
 * The outcome of binary STAPLE on one decision-pattern histogram (Warfield, Zou &amp; Wells, IEEE
 * Trans. Med. Imaging 23(7):903-921, 2004).
 *
 * <p>{@code weights[i]} is the posterior probability W that a voxel showing
 * {@code histogram.pattern(i)} is truly foreground. The thresholded consensus is
 * {@code W >= 0.5} ({@link #CONSENSUS_THRESHOLD}; a voxel with W exactly 0.5 is foreground).
 *
 * @param histogram the histogram STAPLE ran on (its patterns align with {@code weights})
 * @param sensitivity p_j per reader, in [0, 1]; NaN when undefined (no foreground weight at all)
 * @param specificity q_j per reader, in [0, 1]; NaN when undefined (no background weight at all)
 * @param prior the prior g used
 * @param weights W per distinct pattern, aligned with the histogram's patterns
 * @param iterations EM iterations run (one iteration = M-step then E-step)
 * @param converged whether every parameter change fell to the tolerance before the cap
 * @param region what voxels the histogram counts, as stated by the caller
 */
public record StapleResult(PatternHistogram histogram, double[] sensitivity, double[] specificity, double prior,
        double[] weights, int iterations, boolean converged, String region) {

    /** Consensus threshold: a pattern is in the consensus when {@code W >= 0.5}. */
    public static final double CONSENSUS_THRESHOLD = 0.5;

    public StapleResult {
        sensitivity = sensitivity.clone();
        specificity = specificity.clone();
        weights = weights.clone();
        if (weights.length != histogram.size()) {
            throw new IllegalArgumentException("one weight per pattern expected");
        }
        if (sensitivity.length != histogram.readers() || specificity.length != histogram.readers()) {
            throw new IllegalArgumentException("one sensitivity and specificity per reader expected");
        }
    }

    @Override
    public double[] sensitivity() {
        return sensitivity.clone();
    }

    @Override
    public double[] specificity() {
        return specificity.clone();
    }

    @Override
    public double[] weights() {
        return weights.clone();
    }

    public int readers() {
        return histogram.readers();
    }

    public double sensitivity(int j) {
        return sensitivity[j];
    }

    public double specificity(int j) {
        return specificity[j];
    }

    /** W of the i-th distinct pattern. */
    public double weight(int i) {
        return weights[i];
    }

    /**
     * W of an arbitrary pattern (bit j = reader j). A pattern absent from the histogram gets the
     * posterior the final parameters give it (same E-step formula), so every voxel of a grid can
     * be mapped even when the histogram covered only part of it.
     */
    public double weightOfPattern(long pattern) {
        int i = Arrays.binarySearch(histogram.patterns(), pattern);
        if (i >= 0) {
            return weights[i];
        }
        return BinaryStaple.posterior(pattern, readers(), logTerms(), prior);
    }

    /** Whether the i-th distinct pattern is in the thresholded consensus ({@code W >= 0.5}). */
    public boolean inConsensus(int i) {
        return weights[i] >= CONSENSUS_THRESHOLD;
    }

    /** Whether an arbitrary pattern is in the thresholded consensus (see {@link #weightOfPattern}). */
    public boolean patternInConsensus(long pattern) {
        return weightOfPattern(pattern) >= CONSENSUS_THRESHOLD;
    }

    /** Voxels of the region in the thresholded consensus (W ≥ 0.5). */
    public long consensusCount() {
        long n = 0;
        for (int i = 0; i < weights.length; i++) {
            if (inConsensus(i)) {
                n += histogram.count(i);
            }
        }
        return n;
    }

    /** Expected foreground volume in voxels: Σ W·count. */
    public double expectedForegroundVoxels() {
        double s = 0;
        for (int i = 0; i < weights.length; i++) {
            s += weights[i] * histogram.count(i);
        }
        return s;
    }

    /** Expected foreground volume in millilitres: Σ W·count × voxel volume. */
    public double expectedForegroundMl(double voxelVolumeMl) {
        return expectedForegroundVoxels() * voxelVolumeMl;
    }

    /**
     * Dice of reader j against the thresholded consensus, 2|R∩C|/(|R|+|C|), from the histogram
     * only. NaN when both the reader's mask and the consensus are empty (undefined).
     */
    public double diceVsConsensus(int j) {
        long both = 0;
        long reader = 0;
        long cons = 0;
        for (int i = 0; i < weights.length; i++) {
            boolean r = (histogram.pattern(i) >>> j & 1L) != 0;
            boolean c = inConsensus(i);
            long n = histogram.count(i);
            if (r) {
                reader += n;
            }
            if (c) {
                cons += n;
            }
            if (r && c) {
                both += n;
            }
        }
        return reader + cons == 0 ? Double.NaN : 2.0 * both / (reader + cons);
    }

    /** Log-space E-step terms of the final parameters: [log p, log(1-p), log q, log(1-q)] per reader. */
    double[][] logTerms() {
        return BinaryStaple.logTerms(sensitivity, specificity);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof StapleResult r && histogram.equals(r.histogram)
            && Arrays.equals(sensitivity, r.sensitivity) && Arrays.equals(specificity, r.specificity)
            && Double.compare(prior, r.prior) == 0 && Arrays.equals(weights, r.weights)
            && iterations == r.iterations && converged == r.converged && region.equals(r.region);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(weights) * 31 + histogram.hashCode();
    }

    @Override
    public String toString() {
        return "StapleResult[readers=" + readers() + ", prior=" + prior + ", iterations=" + iterations
            + ", converged=" + converged + ", region=" + region + "]";
    }
}
