package org.accordia.consensus;

import java.util.Arrays;

/**
 * The outcome of multi-label STAPLE on a {@link LabelTupleHistogram} (Warfield, Zou &amp; Wells
 * 2004, section on multiple labels; Rohlfing, Russakoff &amp; Maurer, IEEE Trans. Med. Imaging
 * 23(8):983-994, 2004).
 *
 * @param histogram the tuple histogram EM ran on
 * @param theta per reader j the confusion matrix θ_j[s'][s] = P(reader says s' | truth s), by
 *     label index; a column s is NaN when no voxel has weight for truth s
 * @param prior f(s): pooled label frequency over readers and voxels
 * @param posterior per tuple i the posterior W_i[s] over label indices (sums to 1)
 * @param iterations EM iterations run (one iteration = M-step then E-step)
 * @param converged whether max |Δθ| fell to the tolerance before the cap
 * @param region what voxels the histogram counts, as stated by the caller
 * @param undecided the value given to voxels whose maximal posterior is shared by several labels;
 *     never a real label
 */
public record MultiLabelStapleResult(LabelTupleHistogram histogram, double[][][] theta, double[] prior,
        double[][] posterior, int iterations, boolean converged, String region, int undecided) {

    public MultiLabelStapleResult {
        UndecidedLabel.checked(undecided, histogram.labels());
        theta = deepCopy(theta);
        prior = prior.clone();
        double[][] p = new double[posterior.length][];
        for (int i = 0; i < p.length; i++) {
            p[i] = posterior[i].clone();
        }
        posterior = p;
    }

    private static double[][][] deepCopy(double[][][] t) {
        double[][][] c = new double[t.length][][];
        for (int j = 0; j < t.length; j++) {
            c[j] = new double[t[j].length][];
            for (int a = 0; a < t[j].length; a++) {
                c[j][a] = t[j][a].clone();
            }
        }
        return c;
    }

    @Override
    public double[][][] theta() {
        return deepCopy(theta);
    }

    @Override
    public double[] prior() {
        return prior.clone();
    }

    @Override
    public double[][] posterior() {
        double[][] p = new double[posterior.length][];
        for (int i = 0; i < p.length; i++) {
            p[i] = posterior[i].clone();
        }
        return p;
    }

    /** θ_j[said][truth] by label index. */
    public double theta(int j, int said, int truth) {
        return theta[j][said][truth];
    }

    /** Posterior of label index s for tuple i. */
    public double posterior(int i, int s) {
        return posterior[i][s];
    }

    /** Label index with the maximal posterior for tuple i, or −1 when several share it exactly. */
    public int consensusIndex(int i) {
        double[] w = posterior[i];
        int best = 0;
        boolean tie = false;
        for (int s = 1; s < w.length; s++) {
            if (w[s] > w[best]) {
                best = s;
                tie = false;
            } else if (w[s] == w[best]) {
                tie = true;
            }
        }
        return tie ? -1 : best;
    }

    /** Consensus label value for tuple i: argmax posterior, {@link #undecided()} on a tie. */
    public int consensusLabel(int i) {
        int k = consensusIndex(i);
        return k < 0 ? undecided : histogram.label(k);
    }

    /**
     * Log-likelihood of the observed labels under the final parameters, Σ_i count_i · log Σ_s
     * f(s) Π_j θ_j[D_ij][s] (natural log); higher is better when comparing EM starts.
     */
    public double logLikelihood() {
        double ll = 0;
        int s = prior.length;
        for (int i = 0; i < posterior.length; i++) {
            double lmax = Double.NEGATIVE_INFINITY;
            double[] l = new double[s];
            for (int k = 0; k < s; k++) {
                double v = Math.log(prior[k]);
                for (int j = 0; j < histogram.readers(); j++) {
                    double t = theta[j][histogram.labelIndex(i, j)][k];
                    v += Double.isNaN(t) ? Double.NEGATIVE_INFINITY : Math.log(t);
                }
                l[k] = v;
                lmax = Math.max(lmax, v);
            }
            double sum = 0;
            for (int k = 0; k < s; k++) {
                sum += Math.exp(l[k] - lmax);
            }
            ll += histogram.count(i) * (lmax + Math.log(sum));
        }
        return ll;
    }

    /** Voxels per consensus value (label values and possibly the undecided value), ascending. */
    public java.util.TreeMap<Integer, Long> consensusCounts() {
        java.util.TreeMap<Integer, Long> m = new java.util.TreeMap<>();
        for (int i = 0; i < posterior.length; i++) {
            m.merge(consensusLabel(i), histogram.count(i), Long::sum);
        }
        return m;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof MultiLabelStapleResult r && histogram.equals(r.histogram)
            && Arrays.deepEquals(theta, r.theta) && Arrays.equals(prior, r.prior)
            && Arrays.deepEquals(posterior, r.posterior) && iterations == r.iterations
            && converged == r.converged && region.equals(r.region) && undecided == r.undecided;
    }

    @Override
    public int hashCode() {
        return Arrays.deepHashCode(posterior) * 31 + iterations;
    }

    @Override
    public String toString() {
        return "MultiLabelStapleResult[readers=" + histogram.readers() + ", labels=" + histogram.labelCount()
            + ", iterations=" + iterations + ", converged=" + converged + ", undecided=" + undecided + "]";
    }
}
