package org.accordia.agreement;

/**
 * Chance-corrected agreement coefficients.
 *
 * <ul>
 *   <li>Fleiss' kappa (Fleiss 1971, "Measuring nominal scale agreement among many raters",
 *       Psychological Bulletin 76:378–382) for N subjects each rated by the same number n ≥ 2 of
 *       raters into k categories: with {@code n_ij} raters putting subject i in category j,
 *       {@code P_i = (Σ_j n_ij² − n) / (n(n − 1))}, {@code P̄ = mean P_i},
 *       {@code p_j = Σ_i n_ij / (N n)}, {@code P̄e = Σ_j p_j²}, {@code κ = (P̄ − P̄e) / (1 − P̄e)}.</li>
 *   <li>Cohen's kappa (Cohen 1960, Educational and Psychological Measurement 20:37–46) for two
 *       raters from a k × k table of counts: {@code κ = (p_o − p_e) / (1 − p_e)}.</li>
 * </ul>
 * Dimensionless, at most 1. Degenerate input — no subjects, fewer than two raters, or chance
 * agreement equal to 1 (every rating in one category) — gives NaN: kappa is undefined there.
 */
public final class Kappa {
    private Kappa() {
    }

    /**
     * Fleiss' kappa from a subjects × categories table of rater counts; every row must sum to the
     * same number of raters n ≥ 2.
     */
    public static double fleiss(long[][] counts) {
        int subjects = counts.length;
        if (subjects == 0) {
            return Double.NaN;
        }
        int k = counts[0].length;
        long n = -1;
        double sumP = 0;
        double[] colSum = new double[k];
        for (long[] row : counts) {
            if (row.length != k) {
                throw new IllegalArgumentException("every row needs " + k + " categories");
            }
            long rowSum = 0;
            double sq = 0;
            for (int j = 0; j < k; j++) {
                if (row[j] < 0) {
                    throw new IllegalArgumentException("negative count");
                }
                rowSum += row[j];
                sq += (double) row[j] * row[j];
                colSum[j] += row[j];
            }
            if (n < 0) {
                n = rowSum;
            } else if (rowSum != n) {
                throw new IllegalArgumentException("every subject needs the same number of ratings");
            }
            if (n >= 2) {
                sumP += (sq - n) / ((double) n * (n - 1));
            }
        }
        if (n < 2) {
            return Double.NaN;
        }
        double pBar = sumP / subjects;
        double pe = 0;
        for (int j = 0; j < k; j++) {
            double pj = colSum[j] / ((double) subjects * n);
            pe += pj * pj;
        }
        return ratio(pBar, pe);
    }

    /**
     * Fleiss' kappa over the voxels of a decision-pattern histogram, two categories (marked / not
     * marked); each voxel is a subject rated by all {@code h.readers()} readers. The histogram
     * should already be restricted to the region of interest (see docs/metrics.md).
     */
    public static double fleiss(PatternHistogram h) {
        int n = h.readers();
        long total = h.total();
        if (n < 2 || total == 0) {
            return Double.NaN;
        }
        double sumP = 0;
        double ones = 0;
        for (int i = 0; i < h.size(); i++) {
            int in = Long.bitCount(h.pattern(i));
            int out = n - in;
            double c = h.count(i);
            sumP += c * ((double) in * (in - 1) + (double) out * (out - 1));
            ones += c * in;
        }
        double pBar = sumP / ((double) total * n * (n - 1));
        double p1 = ones / ((double) total * n);
        double pe = p1 * p1 + (1 - p1) * (1 - p1);
        return ratio(pBar, pe);
    }

    /** Cohen's kappa from a k × k table: {@code table[i][j]} = subjects put in i by rater 1 and j by rater 2. */
    public static double cohen(long[][] table) {
        int k = table.length;
        double total = 0;
        double agree = 0;
        double[] rows = new double[k];
        double[] cols = new double[k];
        for (int i = 0; i < k; i++) {
            if (table[i].length != k) {
                throw new IllegalArgumentException("table must be square");
            }
            for (int j = 0; j < k; j++) {
                if (table[i][j] < 0) {
                    throw new IllegalArgumentException("negative count");
                }
                total += table[i][j];
                rows[i] += table[i][j];
                cols[j] += table[i][j];
            }
            agree += table[i][i];
        }
        if (total == 0) {
            return Double.NaN;
        }
        double pe = 0;
        for (int i = 0; i < k; i++) {
            pe += (rows[i] / total) * (cols[i] / total);
        }
        return ratio(agree / total, pe);
    }

    private static double ratio(double observed, double chance) {
        if (!(chance < 1)) {
            return Double.NaN;
        }
        return (observed - chance) / (1 - chance);
    }
}
