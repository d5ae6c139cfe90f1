package org.accordia.shift;

import java.util.List;

import org.apache.commons.math3.distribution.FDistribution;

/**
 * The six intraclass correlations of Shrout &amp; Fleiss (1979, Psychological Bulletin 86:420–428)
 * for a complete targets × judges matrix (for example case volumes in mL × readers), with the
 * F-based confidence intervals of Shrout &amp; Fleiss and McGraw &amp; Wong (1996, Psychological
 * Methods 1:30–46).
 *
 * <p>From the two-way ANOVA with n targets and k judges: BMS (targets), WMS (within targets),
 * JMS (judges), EMS (residual).
 * ICC(1,1) = (BMS − WMS)/(BMS + (k−1)WMS); ICC(2,1) = (BMS − EMS)/(BMS + (k−1)EMS + k(JMS − EMS)/n);
 * ICC(3,1) = (BMS − EMS)/(BMS + (k−1)EMS); ICC(1,k) = (BMS − WMS)/BMS;
 * ICC(2,k) = (BMS − EMS)/(BMS + (JMS − EMS)/n); ICC(3,k) = (BMS − EMS)/BMS.
 * Intervals: F_L = F/F_{1−α/2}(df1, df2), F_U = F·F_{1−α/2}(df2, df1) for forms 1 and 3;
 * Satterthwaite degrees of freedom for form 2 (McGraw &amp; Wong, Table 7), and the average-measure
 * form-2 bounds by the Spearman–Brown step-up of the single-measure bounds (as psych::ICC does).
 *
 * <p>Unitless. Degenerate input: fewer than 2 targets or judges, a ragged matrix or a non-finite
 * value is an error; when a mean square in a denominator is 0 the coefficient is NaN.
 *
 * <p>Example (Shrout &amp; Fleiss 1979, 6 targets × 4 judges): ICC(1,1) 0.1657, ICC(2,1) 0.2898,
 * ICC(3,1) 0.7148, ICC(1,4) 0.4428, ICC(2,4) 0.6201, ICC(3,4) 0.9093.
 */
public final class Icc {
    private Icc() {
    }

    /** One coefficient with its interval and F test. */
    public record Estimate(String form, double value, double lower, double upper, double f, double df1,
            double df2, double pValue) {
    }

    /** All six forms, in the order ICC(1,1), ICC(2,1), ICC(3,1), ICC(1,k), ICC(2,k), ICC(3,k). */
    public record Result(int targets, int judges, double bms, double wms, double jms, double ems,
            List<Estimate> estimates) {
        public Result {
            estimates = List.copyOf(estimates);
        }

        public Estimate get(String form) {
            return estimates.stream().filter(e -> e.form().equals(form)).findFirst()
                    .orElseThrow(() -> new IllegalArgumentException("no form " + form));
        }
    }

    /** The six forms with 1 − α intervals. {@code ratings[target][judge]}. */
    public static Result compute(double[][] ratings, double alpha) {
        int n = ratings.length;
        if (n < 2) {
            throw new IllegalArgumentException("need at least 2 targets");
        }
        int k = ratings[0].length;
        if (k < 2) {
            throw new IllegalArgumentException("need at least 2 judges");
        }
        double grand = 0;
        double[] rowMean = new double[n];
        double[] colMean = new double[k];
        for (double[] row : ratings) {
            if (row.length != k) {
                throw new IllegalArgumentException("the ratings matrix is ragged");
            }
            for (double v : row) {
                if (!Double.isFinite(v)) {
                    throw new IllegalArgumentException("ratings must be complete and finite");
                }
            }
        }
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                rowMean[i] += ratings[i][j] / k;
                colMean[j] += ratings[i][j] / n;
                grand += ratings[i][j] / (n * k);
            }
        }
        double ssRows = 0;
        double ssCols = 0;
        double ssTotal = 0;
        for (int i = 0; i < n; i++) {
            ssRows += k * sq(rowMean[i] - grand);
            for (int j = 0; j < k; j++) {
                ssTotal += sq(ratings[i][j] - grand);
            }
        }
        for (int j = 0; j < k; j++) {
            ssCols += n * sq(colMean[j] - grand);
        }
        double ssError = ssTotal - ssRows - ssCols;
        double bms = ssRows / (n - 1);
        double wms = (ssTotal - ssRows) / (n * (k - 1.0));
        double jms = ssCols / (k - 1);
        double ems = ssError / ((n - 1.0) * (k - 1.0));

        double icc1 = (bms - wms) / (bms + (k - 1) * wms);
        double icc2 = (bms - ems) / (bms + (k - 1) * ems + k * (jms - ems) / n);
        double icc3 = (bms - ems) / (bms + (k - 1) * ems);
        double icc1k = (bms - wms) / bms;
        double icc2k = (bms - ems) / (bms + (jms - ems) / n);
        double icc3k = (bms - ems) / bms;

        double q = 1 - alpha / 2;
        double f1 = bms / wms;
        double df11n = n - 1;
        double df11d = n * (k - 1.0);
        double f1l = f1 / quantile(q, df11n, df11d);
        double f1u = f1 * quantile(q, df11d, df11n);
        double f3 = bms / ems;
        double df3n = n - 1;
        double df3d = (n - 1.0) * (k - 1.0);
        double f3l = f3 / quantile(q, df3n, df3d);
        double f3u = f3 * quantile(q, df3d, df3n);
        double p1 = upper(f1, df11n, df11d);
        double p3 = upper(f3, df3n, df3d);

        // Form 2: Satterthwaite approximation (McGraw & Wong 1996; Shrout & Fleiss 1979 eq. 11-12).
        double fj = jms / ems;
        double vNumerator = (k - 1.0) * (n - 1.0) * sq(k * icc2 * fj + n * (1 + (k - 1) * icc2) - k * icc2);
        double vDenominator = (n - 1.0) * k * k * icc2 * icc2 * fj * fj + sq(n * (1 + (k - 1) * icc2) - k * icc2);
        double v = vNumerator / vDenominator;
        double fStar = quantile(q, n - 1, v);
        double fStarStar = quantile(q, v, n - 1);
        double l2 = n * (bms - fStar * ems) / (fStar * (k * jms + (k * n - k - n) * ems) + n * bms);
        double u2 = n * (fStarStar * bms - ems) / (k * jms + (k * n - k - n) * ems + n * fStarStar * bms);
        double l2k = l2 * k / (1 + l2 * (k - 1));
        double u2k = u2 * k / (1 + u2 * (k - 1));

        List<Estimate> estimates = List.of(
                new Estimate("ICC(1,1)", icc1, (f1l - 1) / (f1l + k - 1), (f1u - 1) / (f1u + k - 1), f1, df11n,
                        df11d, p1),
                new Estimate("ICC(2,1)", icc2, l2, u2, f3, df3n, df3d, p3),
                new Estimate("ICC(3,1)", icc3, (f3l - 1) / (f3l + k - 1), (f3u - 1) / (f3u + k - 1), f3, df3n,
                        df3d, p3),
                new Estimate("ICC(1,k)", icc1k, 1 - 1 / f1l, 1 - 1 / f1u, f1, df11n, df11d, p1),
                new Estimate("ICC(2,k)", icc2k, l2k, u2k, f3, df3n, df3d, p3),
                new Estimate("ICC(3,k)", icc3k, 1 - 1 / f3l, 1 - 1 / f3u, f3, df3n, df3d, p3));
        return new Result(n, k, bms, wms, jms, ems, estimates);
    }

    private static double quantile(double p, double df1, double df2) {
        if (!(df1 > 0 && df2 > 0) || Double.isNaN(df1) || Double.isNaN(df2)) {
            return Double.NaN;
        }
        return new FDistribution(df1, df2).inverseCumulativeProbability(p);
    }

    private static double upper(double f, double df1, double df2) {
        if (!Double.isFinite(f)) {
            return Double.NaN;
        }
        return 1 - new FDistribution(df1, df2).cumulativeProbability(f);
    }

    private static double sq(double v) {
        return v * v;
    }
}
