package org.accordia.consensus;

import java.util.Arrays;

/**
 * Multi-label STAPLE (Warfield, Zou &amp; Wells, IEEE Trans. Med. Imaging 23(7):903-921, 2004,
 * section on multiple labels; Rohlfing, Russakoff &amp; Maurer, IEEE Trans. Med. Imaging
 * 23(8):983-994, 2004) on a {@link LabelTupleHistogram}: per reader a confusion matrix θ_j[s'][s] =
 * P(reader j says s' | truth s) and per voxel the posterior over the S labels.
 *
 * <ul>
 *   <li>E-step: W_i[s] ∝ f(s)·Π_j θ_j[D_ij][s], normalised over s (log space, log-sum-exp).</li>
 *   <li>M-step: θ_j[s'][s] = Σ_i W_i[s]·[D_ij = s'] / Σ_i W_i[s].</li>
 *   <li>Prior f(s): pooled frequency of label s over all readers and voxels of the region
 *       (fixed during EM).</li>
 *   <li>Start ({@link MultiLabelStart}): W is the majority-vote indicator (1 for the label with
 *       most votes) and the M-step runs first. By default, when several labels tie for most votes
 *       the weight is split equally between them; {@link MultiLabelStart#MAJORITY_CONFUSION}
 *       leaves tied voxels out of the first M-step instead, which equals an E-step from confusion
 *       matrices initialised from the majority vote (the start of ITK's
 *       MultiLabelSTAPLEImageFilter). EM finds a local optimum: the two starts can end at
 *       different fixed points; compare them with
 *       {@link MultiLabelStapleResult#logLikelihood()}.</li>
 *   <li>Converged when max |Δθ| over all readers and entries between two consecutive iterations
 *       is at most the tolerance (default 1e-10; the first iteration never counts), or after the
 *       iteration cap (default 10,000).</li>
 * </ul>
 * Degenerate cases: a truth label s with Σ_i W_i[s] = 0 has an undefined column θ_j[·][s] (NaN)
 * and posterior 0 thereafter; a tuple impossible under every label (all terms −∞) gets the prior
 * f as its posterior. Consensus: argmax posterior; exact ties get the undecided value
 * ({@link UndecidedLabel}: default max label + 1, or a caller value checked against the labels).
 * Cost per iteration: O(distinct tuples × readers × labels).
 */
public final class MultiLabelStaple {
    private MultiLabelStaple() {
    }

    public static MultiLabelStapleResult run(LabelTupleHistogram h) {
        return run(h, StapleOptions.defaults(), UndecidedLabel.defaultFor(h.labels()));
    }

    /**
     * @param options tolerance, iteration cap and region (the fixed prior is not used)
     * @param undecided value for ties; must not be a real label
     */
    public static MultiLabelStapleResult run(LabelTupleHistogram h, StapleOptions options, int undecided) {
        return run(h, options, undecided, MultiLabelStart.MAJORITY_WEIGHTS);
    }

    /**
     * @param options tolerance, iteration cap and region (the fixed prior is not used)
     * @param undecided value for ties; must not be a real label
     * @param start how ties of the initial majority vote enter the first M-step
     */
    public static MultiLabelStapleResult run(LabelTupleHistogram h, StapleOptions options, int undecided,
            MultiLabelStart start) {
        UndecidedLabel.checked(undecided, h.labels());
        final int r = h.readers();
        final int s = h.labelCount();
        final int n = h.size();
        final int[][] d = new int[n][r];
        final double[] cnt = new double[n];
        double[] f = new double[s];
        double total = 0;
        for (int i = 0; i < n; i++) {
            cnt[i] = h.count(i);
            total += cnt[i];
            for (int j = 0; j < r; j++) {
                d[i][j] = h.labelIndex(i, j);
                f[d[i][j]] += cnt[i];
            }
        }
        for (int k = 0; k < s; k++) {
            f[k] = total == 0 ? 0 : f[k] / (total * r);
        }
        double[] logF = new double[s];
        for (int k = 0; k < s; k++) {
            logF[k] = Math.log(f[k]);
        }
        // start: majority-vote indicator, ties split equally
        double[][] w = new double[n][s];
        int[] votes = new int[s];
        for (int i = 0; i < n; i++) {
            Arrays.fill(votes, 0);
            for (int j = 0; j < r; j++) {
                votes[d[i][j]]++;
            }
            int max = 0;
            for (int v : votes) {
                max = Math.max(max, v);
            }
            int ties = 0;
            for (int v : votes) {
                ties += v == max ? 1 : 0;
            }
            boolean skip = ties > 1 && start == MultiLabelStart.MAJORITY_CONFUSION;
            for (int k = 0; k < s; k++) {
                w[i][k] = votes[k] == max && !skip ? 1.0 / ties : 0.0;
            }
        }
        double[][][] theta = new double[r][s][s];
        double[][][] last = new double[r][s][s];
        double[][][] logTheta = new double[r][s][s];
        double[] colSum = new double[s];
        double[] lw = new double[s];
        boolean converged = false;
        int iter = 0;
        while (iter < options.maxIterations()) {
            iter++;
            // M-step
            Arrays.fill(colSum, 0);
            for (double[][] t : theta) {
                for (double[] row : t) {
                    Arrays.fill(row, 0);
                }
            }
            for (int i = 0; i < n; i++) {
                for (int k = 0; k < s; k++) {
                    double cw = cnt[i] * w[i][k];
                    colSum[k] += cw;
                    for (int j = 0; j < r; j++) {
                        theta[j][d[i][j]][k] += cw;
                    }
                }
            }
            for (int j = 0; j < r; j++) {
                for (int a = 0; a < s; a++) {
                    for (int k = 0; k < s; k++) {
                        theta[j][a][k] = colSum[k] > 0 ? theta[j][a][k] / colSum[k] : Double.NaN;
                        logTheta[j][a][k] = Double.isNaN(theta[j][a][k]) ? Double.NEGATIVE_INFINITY
                            : Math.log(theta[j][a][k]);
                    }
                }
            }
            // E-step
            for (int i = 0; i < n; i++) {
                double max = Double.NEGATIVE_INFINITY;
                for (int k = 0; k < s; k++) {
                    double v = logF[k];
                    for (int j = 0; j < r && v != Double.NEGATIVE_INFINITY; j++) {
                        v += logTheta[j][d[i][j]][k];
                    }
                    lw[k] = v;
                    max = Math.max(max, v);
                }
                if (max == Double.NEGATIVE_INFINITY) {
                    System.arraycopy(f, 0, w[i], 0, s);
                    continue;
                }
                double sum = 0;
                for (int k = 0; k < s; k++) {
                    sum += Math.exp(lw[k] - max);
                }
                for (int k = 0; k < s; k++) {
                    w[i][k] = Math.exp(lw[k] - max) / sum;
                }
            }
            if (iter > 1) {
                converged = true;
                outer:
                for (int j = 0; j < r; j++) {
                    for (int a = 0; a < s; a++) {
                        for (int k = 0; k < s; k++) {
                            double x = theta[j][a][k];
                            double y = last[j][a][k];
                            boolean ok = Double.isNaN(x) || Double.isNaN(y) ? Double.isNaN(x) && Double.isNaN(y)
                                : Math.abs(x - y) <= options.tolerance();
                            if (!ok) {
                                converged = false;
                                break outer;
                            }
                        }
                    }
                }
            }
            for (int j = 0; j < r; j++) {
                for (int a = 0; a < s; a++) {
                    System.arraycopy(theta[j][a], 0, last[j][a], 0, s);
                }
            }
            if (converged) {
                break;
            }
        }
        return new MultiLabelStapleResult(h, theta, f, w, iter, converged, options.region(), undecided);
    }
}
