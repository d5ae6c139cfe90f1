package org.accordia.consensus;

import org.accordia.agreement.PatternHistogram;

/**
 * Binary STAPLE (Simultaneous Truth And Performance Level Estimation; Warfield, Zou &amp; Wells,
 * IEEE Trans. Med. Imaging 23(7):903-921, 2004) on a decision-pattern histogram: estimates each
 * reader's sensitivity p_j and specificity q_j and the posterior probability W that a voxel is
 * truly foreground, by expectation-maximisation.
 *
 * <p>Equations (voxel i, reader j, D_ij = 1 when reader j marks voxel i):
 * <ul>
 *   <li>E-step: a_i = g·Π_j p_j^D_ij (1−p_j)^(1−D_ij); b_i = (1−g)·Π_j q_j^(1−D_ij)
 *       (1−q_j)^D_ij; W_i = a_i/(a_i+b_i).</li>
 *   <li>M-step: p_j = Σ_i W_i D_ij / Σ_i W_i; q_j = Σ_i (1−W_i)(1−D_ij) / Σ_i (1−W_i).</li>
 * </ul>
 * Voxels with the same pattern share W, so the sums run over distinct patterns weighted by their
 * counts: one iteration costs O(distinct patterns × readers).
 *
 * <p>Start (common practice, as in general-purpose toolkits): W starts as the fraction of readers
 * marking the voxel and the M-step runs first. Prior g: the mean foreground fraction over readers
 * and voxels of the region, unless the caller fixes it. Converged when every |Δp_j| and |Δq_j|
 * between two consecutive iterations is at most the tolerance (1e-10 by default; the first
 * iteration never counts as converged); at most 10,000 iterations by default.
 *
 * <p>Numerics: a_i and b_i are formed as sums of logarithms and W_i = 1/(1+exp(log b_i − log
 * a_i)), so products over many readers never underflow. log 0 = −∞ is exact: a reader with p_j = 1
 * and D_ij = 0 makes a_i exactly 0 and W_i exactly 0.
 *
 * <p>Degenerate cases:
 * <ul>
 *   <li>Σ W = 0 in an M-step (e.g. no reader marks any voxel of the region): every p_j is
 *       undefined and reported as NaN; the E-step then keeps W = 0 everywhere (there is no
 *       foreground mass to explain). With all readers empty: p = NaN, q = 1, W = 0, g = 0.</li>
 *   <li>Σ (1−W) = 0 (e.g. every reader marks every voxel of the region): every q_j is NaN and W =
 *       1 everywhere.</li>
 *   <li>a_i = b_i = 0 (the pattern is impossible under both hypotheses; only reachable with a
 *       fixed prior of 0 or 1 or contradictory perfect readers): W_i = g.</li>
 * </ul>
 */
public final class BinaryStaple {
    private BinaryStaple() {
    }

    /** STAPLE with {@link StapleOptions#defaults()}. */
    public static StapleResult run(PatternHistogram h) {
        return run(h, StapleOptions.defaults());
    }

    public static StapleResult run(PatternHistogram h, StapleOptions options) {
        final int r = h.readers();
        final int n = h.size();
        final long[] pat = h.patterns();
        final double[] cnt = new double[n];
        double total = 0;
        double marks = 0;
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            cnt[i] = h.count(i);
            total += cnt[i];
            int k = Long.bitCount(pat[i]);
            marks += k * cnt[i];
            w[i] = (double) k / r;
        }
        final double g = options.priorIsFixed() ? options.fixedPrior() : (total == 0 ? 0 : marks / (r * total));
        double[] p = new double[r];
        double[] q = new double[r];
        double[] lastP = new double[r];
        double[] lastQ = new double[r];
        double[] sumWD = new double[r];
        double[] sumVND = new double[r];
        boolean converged = false;
        int iter = 0;
        while (iter < options.maxIterations()) {
            iter++;
            // M-step
            double sumW = 0;
            double sumV = 0;
            java.util.Arrays.fill(sumWD, 0);
            java.util.Arrays.fill(sumVND, 0);
            for (int i = 0; i < n; i++) {
                double cw = cnt[i] * w[i];
                double cv = cnt[i] * (1 - w[i]);
                sumW += cw;
                sumV += cv;
                long bits = pat[i];
                for (int j = 0; j < r; j++) {
                    if ((bits >>> j & 1L) != 0) {
                        sumWD[j] += cw;
                    } else {
                        sumVND[j] += cv;
                    }
                }
            }
            for (int j = 0; j < r; j++) {
                p[j] = sumW > 0 ? sumWD[j] / sumW : Double.NaN;
                q[j] = sumV > 0 ? sumVND[j] / sumV : Double.NaN;
            }
            // E-step
            double[][] lt = logTerms(p, q);
            for (int i = 0; i < n; i++) {
                w[i] = posterior(pat[i], r, lt, g);
            }
            if (iter > 1) {
                converged = true;
                for (int j = 0; j < r && converged; j++) {
                    converged = close(p[j], lastP[j], options.tolerance()) && close(q[j], lastQ[j], options.tolerance());
                }
            }
            System.arraycopy(p, 0, lastP, 0, r);
            System.arraycopy(q, 0, lastQ, 0, r);
            if (converged) {
                break;
            }
        }
        return new StapleResult(h, p, q, g, w, iter, converged, options.region());
    }

    private static boolean close(double a, double b, double tol) {
        if (Double.isNaN(a) || Double.isNaN(b)) {
            return Double.isNaN(a) && Double.isNaN(b);
        }
        return Math.abs(a - b) <= tol;
    }

    /** Rows: log p, log(1−p), log q, log(1−q); a NaN p or q (undefined) is kept as NaN. */
    static double[][] logTerms(double[] p, double[] q) {
        int r = p.length;
        double[][] t = new double[4][r];
        for (int j = 0; j < r; j++) {
            t[0][j] = Math.log(p[j]);
            t[1][j] = Math.log1p(-p[j]);
            t[2][j] = Math.log(q[j]);
            t[3][j] = Math.log1p(-q[j]);
        }
        return t;
    }

    /** The E-step for one pattern in log space; see the class notes for the degenerate rules. */
    static double posterior(long bits, int r, double[][] lt, double g) {
        if (Double.isNaN(lt[0][0])) {
            return 0; // Σ W = 0: no foreground mass (all p undefined)
        }
        if (Double.isNaN(lt[2][0])) {
            return 1; // Σ (1−W) = 0: no background mass (all q undefined)
        }
        double la = Math.log(g);
        double lb = Math.log1p(-g);
        for (int j = 0; j < r; j++) {
            if ((bits >>> j & 1L) != 0) {
                la += lt[0][j];
                lb += lt[3][j];
            } else {
                la += lt[1][j];
                lb += lt[2][j];
            }
        }
        if (la == Double.NEGATIVE_INFINITY && lb == Double.NEGATIVE_INFINITY) {
            return g;
        }
        if (la == Double.NEGATIVE_INFINITY) {
            return 0;
        }
        if (lb == Double.NEGATIVE_INFINITY) {
            return 1;
        }
        return 1.0 / (1.0 + Math.exp(lb - la));
    }
}
