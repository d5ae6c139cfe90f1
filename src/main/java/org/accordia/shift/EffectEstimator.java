package org.accordia.shift;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.function.Function;

/**
 * Systematic effects of centres (or readers) with direction: mean signed surface distance (mm)
 * and geometric-mean volume ratio against the others' consensus, with 95 % case-bootstrap
 * percentile intervals (Efron &amp; Tibshirani 1993, An Introduction to the Bootstrap, ch. 13).
 *
 * <p>Aggregation: per case, the group's value is the mean over its readers present on that case
 * (signed distance in mm; log volume ratio); the group's effect is the mean of these case values
 * over the cases where the group has a value, so every case weighs the same however many of the
 * group's readers read it. The volume ratio is exp(mean log ratio), the geometric mean, which
 * treats "twice as large" and "half as large" symmetrically. Non-finite or non-positive ratios and
 * non-finite distances are left out (and so do not count as cases for that measure).
 *
 * <p>Bootstrap: the study's cases are resampled with replacement (the same draw for every group,
 * seeded), the statistic recomputed, and the 2.5 % and 97.5 % percentiles taken with linear
 * interpolation between order statistics (R's type 7, common practice). A replicate in which a
 * group has no case is skipped for that group. Intervals are NaN when the group has fewer than
 * 2 cases.
 */
public final class EffectEstimator {
    private EffectEstimator() {
    }

    /** Effects of each centre (sorted by name). */
    public static List<GroupEffect> byCentre(List<ReaderCaseMeasure> rows, int resamples, long seed) {
        return estimate(rows, ReaderCaseMeasure::centre, resamples, seed);
    }

    /** Effects of each reader (sorted by id). */
    public static List<GroupEffect> byReader(List<ReaderCaseMeasure> rows, int resamples, long seed) {
        return estimate(rows, ReaderCaseMeasure::reader, resamples, seed);
    }

    private static List<GroupEffect> estimate(List<ReaderCaseMeasure> rows, Function<ReaderCaseMeasure, String> key,
            int resamples, long seed) {
        List<String> cases = List.copyOf(new TreeSet<>(rows.stream().map(ReaderCaseMeasure::caseId).toList()));
        List<String> groups = List.copyOf(new TreeSet<>(rows.stream().map(key).toList()));
        int nc = cases.size();
        int ng = groups.size();
        double[][] sSum = new double[ng][nc];
        int[][] sCount = new int[ng][nc];
        double[][] vSum = new double[ng][nc];
        int[][] vCount = new int[ng][nc];
        List<TreeSet<String>> readers = new ArrayList<>();
        List<TreeSet<String>> centres = new ArrayList<>();
        for (int g = 0; g < ng; g++) {
            readers.add(new TreeSet<>());
            centres.add(new TreeSet<>());
        }
        TreeMap<String, Integer> caseIndex = new TreeMap<>();
        for (int c = 0; c < nc; c++) {
            caseIndex.put(cases.get(c), c);
        }
        for (ReaderCaseMeasure r : rows) {
            int g = groups.indexOf(key.apply(r));
            int c = caseIndex.get(r.caseId());
            readers.get(g).add(r.reader());
            centres.get(g).add(r.centre());
            if (Double.isFinite(r.signedSurfaceMm())) {
                sSum[g][c] += r.signedSurfaceMm();
                sCount[g][c]++;
            }
            if (Double.isFinite(r.volumeRatio()) && r.volumeRatio() > 0) {
                vSum[g][c] += Math.log(r.volumeRatio());
                vCount[g][c]++;
            }
        }
        double[][] sCase = caseMeans(sSum, sCount);
        double[][] vCase = caseMeans(vSum, vCount);
        double[][] sBoot = new double[ng][resamples];
        double[][] vBoot = new double[ng][resamples];
        SplittableRandom random = new SplittableRandom(seed);
        int[] draw = new int[nc];
        for (int b = 0; b < resamples; b++) {
            for (int i = 0; i < nc; i++) {
                draw[i] = random.nextInt(nc);
            }
            double[] sb = new double[ng];
            double[] vb = new double[ng];
            for (int g = 0; g < ng; g++) {
                sb[g] = mean(sCase[g], draw);
                vb[g] = mean(vCase[g], draw);
            }
            for (int g = 0; g < ng; g++) {
                sBoot[g][b] = sb[g];
                vBoot[g][b] = vb[g];
            }
        }
        double[] sPoint = new double[ng];
        double[] vPoint = new double[ng];
        for (int g = 0; g < ng; g++) {
            sPoint[g] = mean(sCase[g], null);
            vPoint[g] = mean(vCase[g], null);
        }
        List<GroupEffect> out = new ArrayList<>();
        for (int g = 0; g < ng; g++) {
            int casesWithData = 0;
            for (int c = 0; c < nc; c++) {
                if (!Double.isNaN(sCase[g][c]) || !Double.isNaN(vCase[g][c])) {
                    casesWithData++;
                }
            }
            double s = sPoint[g];
            double v = vPoint[g];
            double[] si = percentileInterval(sBoot[g], count(sCase[g]));
            double[] vi = percentileInterval(vBoot[g], count(vCase[g]));
            out.add(new GroupEffect(groups.get(g), String.join("+", centres.get(g)), readers.get(g).size(),
                    casesWithData, s, si[0], si[1], Math.exp(v), Math.exp(vi[0]), Math.exp(vi[1])));
        }
        return out;
    }

    private static double[][] caseMeans(double[][] sum, int[][] count) {
        double[][] out = new double[sum.length][];
        for (int g = 0; g < sum.length; g++) {
            out[g] = new double[sum[g].length];
            for (int c = 0; c < sum[g].length; c++) {
                out[g][c] = count[g][c] > 0 ? sum[g][c] / count[g][c] : Double.NaN;
            }
        }
        return out;
    }

    private static int count(double[] values) {
        int n = 0;
        for (double v : values) {
            n += Double.isNaN(v) ? 0 : 1;
        }
        return n;
    }

    /** Mean of the non-NaN values at the drawn indices (all indices when draw is null). */
    static double mean(double[] values, int[] draw) {
        double s = 0;
        int n = 0;
        int m = draw == null ? values.length : draw.length;
        for (int i = 0; i < m; i++) {
            double v = values[draw == null ? i : draw[i]];
            if (!Double.isNaN(v)) {
                s += v;
                n++;
            }
        }
        return n == 0 ? Double.NaN : s / n;
    }

    static double[] percentileInterval(double[] replicates, int cases) {
        if (cases < 2) {
            return new double[] {Double.NaN, Double.NaN};
        }
        double[] kept = Arrays.stream(replicates).filter(v -> !Double.isNaN(v)).sorted().toArray();
        if (kept.length == 0) {
            return new double[] {Double.NaN, Double.NaN};
        }
        return new double[] {quantile(kept, 0.025), quantile(kept, 0.975)};
    }

    /** Type-7 quantile of sorted values (linear interpolation between order statistics). */
    static double quantile(double[] sorted, double p) {
        return org.accordia.stats.Quantiles.type7Sorted(sorted, p);
    }
}
