package org.accordia.shift;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;

import org.apache.commons.math3.distribution.TDistribution;

/**
 * Centre effects with readers and cases both random: the estimand, its estimate and a 95 %
 * model-based interval.
 *
 * <p><b>Estimand.</b> Δ_c = μ_c − mean_{d≠c} μ_d, where μ_c is the population mean (over centre c's
 * readers, as random, and over cases) of a reader's signed surface distance in mm (positive =
 * outside) from ONE common reference surface per case (the consensus of all readers), measured as
 * the antisymmetric border offset ½ (d(reader → reference) − d(reference → reader)) so that it
 * changes sign exactly when two surfaces swap (one directed distance does not, on a voxel lattice).
 * A common reference moves every reader of a case alike, so it cancels from Δ_c: Δ_c is the same whichever
 * common reference is used, and equals the centre's offset against the true boundary minus the
 * other centres' mean offset. The same contrast of the mean log volume ratio gives the volume
 * effect exp(Δ). Note: Δ_c keeps the mirror of another centre's shift by definition (one of G
 * centres drawing Δ wider gives the others −Δ/(G−1)); which centre departs is the business of the
 * per-centre test ({@link CentreVsRest}), not of the estimand.
 *
 * <p><b>Estimate.</b> Per case k, the cell mean Ȳ_gk of each centre over its readers present;
 * δ_ck = Ȳ_ck − mean_{d≠c} Ȳ_dk over the other centres present; Δ̂_c = mean_k δ_ck over the C_c
 * cases where c and another centre are present.
 *
 * <p><b>Interval.</b> Model y_rk = case_k + α_g + b_r + γ_gk + e_rk (reader b_r, centre-by-case
 * γ_gk and residual e_rk random; the common reference is part of case_k). With L_c = 1 and
 * L_d = −1/(G − 1), Var(Δ̂_c) = Σ_g L_g² (σ²_b/n_g + σ²_γ/C + σ²_e/(n_g C)), estimated from three
 * mean squares in the manner of the Dorfman–Berbaum–Metz / Obuchowski–Rockette analyses of
 * reader studies with readers and cases random (Hillis 2007, Stat Med 26:596–619):
 * <ul>
 * <li>s²_m, the pooled within-centre variance of the readers' mean deviations from their centre
 * (u_r = mean_k (y_rk − Ȳ_gk)), df Σ_g (n_g − 1): estimates σ²_b + σ²_e/C;</li>
 * <li>σ̂²_e, the residual mean square of y_rk − Ȳ_gk − u_r, df Σ_g (n_g − 1)(C − 1);</li>
 * <li>s²_δ, the sample variance of δ_ck over cases, df C_c − 1: estimates
 * Σ_g L_g² (σ²_γ + σ²_e/n_g).</li>
 * </ul>
 * With K_c = Σ_g L_g²/n_g: V = s²_m K_c + max(0, s²_δ/C_c − σ̂²_e K_c/C_c); the interval is
 * Δ̂_c ± t_{0.975, ν} √V with Satterthwaite's ν (Satterthwaite 1946). Readers count as random
 * through s²_m: one wide reader widens its centre's interval instead of moving it past the
 * minimum. When no centre has two readers (Σ_g (n_g − 1) = 0) a centre's effect cannot be told
 * apart from its readers' biases and the interval is NaN; a one-reader centre in a study with
 * other multi-reader centres borrows their pooled reader variance.
 */
public final class CentreContrasts {
    private CentreContrasts() {
    }

    /**
     * A centre's contrast with its interval details.
     *
     * @param effect          Δ_c (signed surface, mm) and exp(Δ_c) of the log volume ratio, with 95 % intervals
     * @param surfaceSeMm     standard error of the signed-surface contrast, mm
     * @param surfaceDf       Satterthwaite degrees of freedom of the signed-surface interval
     * @param logVolumeSe     standard error of the log-volume contrast
     * @param logVolumeDf     its degrees of freedom
     */
    public record Contrast(GroupEffect effect, double surfaceSeMm, double surfaceDf, double logVolumeSe,
            double logVolumeDf) {
    }

    /**
     * The contrasts of every centre (sorted by name) from measures against one common reference per
     * case; empty with fewer than two centres.
     */
    public static List<Contrast> estimate(List<ReaderCaseMeasure> rows) {
        List<String> cases = List.copyOf(new TreeSet<>(rows.stream().map(ReaderCaseMeasure::caseId).toList()));
        List<String> centres = List.copyOf(new TreeSet<>(rows.stream().map(ReaderCaseMeasure::centre).toList()));
        List<String> readers = List.copyOf(new TreeSet<>(rows.stream().map(ReaderCaseMeasure::reader).toList()));
        if (centres.size() < 2) {
            return List.of(); // one centre: nothing to contrast with (as the raw effects)
        }
        Map<String, Integer> caseIndex = index(cases);
        Map<String, Integer> readerIndex = index(readers);
        int nr = readers.size();
        int nc = cases.size();
        int[] centreOf = new int[nr];
        double[][] s = new double[nr][nc];
        double[][] v = new double[nr][nc];
        for (double[] row : s) {
            java.util.Arrays.fill(row, Double.NaN);
        }
        for (double[] row : v) {
            java.util.Arrays.fill(row, Double.NaN);
        }
        for (ReaderCaseMeasure m : rows) {
            int r = readerIndex.get(m.reader());
            int k = caseIndex.get(m.caseId());
            centreOf[r] = centres.indexOf(m.centre());
            if (Double.isFinite(m.signedSurfaceMm())) {
                s[r][k] = m.signedSurfaceMm();
            }
            if (Double.isFinite(m.volumeRatio()) && m.volumeRatio() > 0) {
                v[r][k] = Math.log(m.volumeRatio());
            }
        }
        Measure surface = new Measure(s, centreOf, centres.size());
        Measure volume = new Measure(v, centreOf, centres.size());
        List<Contrast> out = new ArrayList<>();
        for (int c = 0; c < centres.size(); c++) {
            double[] a = surface.contrast(c);
            double[] b = volume.contrast(c);
            int readersHere = 0;
            for (int r = 0; r < nr; r++) {
                readersHere += centreOf[r] == c ? 1 : 0;
            }
            int casesHere = (int) Math.max(a[4], b[4]);
            GroupEffect e = new GroupEffect(centres.get(c), centres.get(c), readersHere, casesHere, a[0], a[1], a[2],
                    Math.exp(b[0]), Math.exp(b[1]), Math.exp(b[2]));
            out.add(new Contrast(e, a[3], a[5], b[3], b[5]));
        }
        return out;
    }

    /** The effects alone. */
    public static List<GroupEffect> effects(List<Contrast> contrasts) {
        return contrasts.stream().map(Contrast::effect).toList();
    }

    private static Map<String, Integer> index(List<String> keys) {
        Map<String, Integer> m = new TreeMap<>();
        for (int i = 0; i < keys.size(); i++) {
            m.put(keys.get(i), i);
        }
        return m;
    }

    /** One measure (reader × case matrix, NaN = missing) prepared for the contrasts. */
    private static final class Measure {
        final int groups;
        final int cases;
        final double[][] cell;        // [g][k] centre cell mean, NaN when absent
        final int[] readersPerGroup;  // readers with at least one value
        final double s2m;             // pooled variance of reader mean deviations
        final int dfm;
        final double s2e;             // residual mean square
        final int dfe;

        Measure(double[][] y, int[] centreOf, int groups) {
            this.groups = groups;
            int nr = y.length;
            this.cases = nr == 0 ? 0 : y[0].length;
            cell = new double[groups][cases];
            int[][] count = new int[groups][cases];
            for (int r = 0; r < nr; r++) {
                for (int k = 0; k < cases; k++) {
                    if (!Double.isNaN(y[r][k])) {
                        cell[centreOf[r]][k] += y[r][k];
                        count[centreOf[r]][k]++;
                    }
                }
            }
            for (int g = 0; g < groups; g++) {
                for (int k = 0; k < cases; k++) {
                    cell[g][k] = count[g][k] > 0 ? cell[g][k] / count[g][k] : Double.NaN;
                }
            }
            readersPerGroup = new int[groups];
            double[] u = new double[nr];
            int[] valuesOf = new int[nr];
            for (int r = 0; r < nr; r++) {
                double sum = 0;
                for (int k = 0; k < cases; k++) {
                    if (!Double.isNaN(y[r][k])) {
                        sum += y[r][k] - cell[centreOf[r]][k];
                        valuesOf[r]++;
                    }
                }
                u[r] = valuesOf[r] > 0 ? sum / valuesOf[r] : Double.NaN;
                readersPerGroup[centreOf[r]] += valuesOf[r] > 0 ? 1 : 0;
            }
            double ssm = 0;
            double sse = 0;
            int dfM = 0;
            int dfE = 0;
            for (int g = 0; g < groups; g++) {
                dfM += Math.max(0, readersPerGroup[g] - 1);
            }
            int cellsWithTwo = 0;
            for (int g = 0; g < groups; g++) {
                for (int k = 0; k < cases; k++) {
                    cellsWithTwo += count[g][k] >= 2 ? count[g][k] - 1 : 0;
                }
            }
            for (int r = 0; r < nr; r++) {
                if (valuesOf[r] == 0 || readersPerGroup[centreOf[r]] < 2) {
                    continue;
                }
                ssm += u[r] * u[r];
                for (int k = 0; k < cases; k++) {
                    if (!Double.isNaN(y[r][k])) {
                        double e = y[r][k] - cell[centreOf[r]][k] - u[r];
                        sse += e * e;
                    }
                }
            }
            // residual df: within-cell deviations minus the reader means fitted (balanced: Σ(n_g − 1)(C − 1))
            dfE = Math.max(0, cellsWithTwo - dfM);
            this.dfm = dfM;
            this.s2m = dfM > 0 ? ssm / dfM : Double.NaN;
            this.dfe = dfE;
            this.s2e = dfE > 0 ? sse / dfE : 0.0;
        }

        /** {estimate, lo, hi, se, cases, df} of centre c's contrast. */
        double[] contrast(int c) {
            double sum = 0;
            double sumSq = 0;
            int n = 0;
            int othersSeen = 0;
            for (int k = 0; k < cases; k++) {
                if (Double.isNaN(cell[c][k])) {
                    continue;
                }
                double o = 0;
                int m = 0;
                for (int d = 0; d < groups; d++) {
                    if (d != c && !Double.isNaN(cell[d][k])) {
                        o += cell[d][k];
                        m++;
                    }
                }
                if (m == 0) {
                    continue;
                }
                othersSeen = Math.max(othersSeen, m);
                double delta = cell[c][k] - o / m;
                sum += delta;
                sumSq += delta * delta;
                n++;
            }
            double nan = Double.NaN;
            if (n == 0) {
                return new double[] {nan, nan, nan, nan, 0, nan};
            }
            double est = sum / n;
            if (n < 2 || dfm == 0 || Double.isNaN(s2m) || readersPerGroup[c] == 0) {
                return new double[] {est, nan, nan, nan, n, nan};
            }
            double s2d = Math.max(0, (sumSq - n * est * est) / (n - 1));
            double k = 1.0 / readersPerGroup[c];
            double w = 1.0 / othersSeen;
            for (int d = 0; d < groups; d++) {
                if (d != c && readersPerGroup[d] > 0) {
                    k += w * w / readersPerGroup[d];
                }
            }
            double a1 = s2m * k;
            double a2 = s2d / n;
            double a3 = s2e * k / n;
            double var;
            double df;
            if (a2 > a3) {
                var = a1 + a2 - a3;
                double denom = a1 * a1 / dfm + a2 * a2 / (n - 1) + (dfe > 0 ? a3 * a3 / dfe : 0);
                df = denom > 0 ? var * var / denom : dfm;
            } else {
                var = a1;
                df = dfm;
            }
            double se = Math.sqrt(var);
            double t = new TDistribution(null, Math.max(df, 1.0)).inverseCumulativeProbability(0.975);
            return new double[] {est, est - t * se, est + t * se, se, n, df};
        }
    }
}
