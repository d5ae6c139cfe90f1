package org.accordia.consensus;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.function.ToDoubleFunction;
import org.accordia.stats.Quantiles;

/**
 * One reader's performance across cases, for one structure and one reference, with 95%
 * case-bootstrap percentile intervals.
 *
 * <p>Means: arithmetic mean over the cases where the metric is defined (NaN cells skipped) for
 * sensitivity, specificity, Dice and signed surface distance; the volume ratio is summarised by
 * its geometric mean exp(mean log ratio) over cases with a finite positive ratio, because a ratio
 * of 2 and one of 0.5 should balance (a reader who is empty, ratio 0, or a case with an empty
 * reference, ratio +∞, is skipped; {@code cases} counts all rows).
 *
 * <p>Intervals: nonparametric bootstrap over cases (Efron &amp; Tibshirani, An Introduction to the
 * Bootstrap, 1993, ch. 13, percentile interval): {@code resamples} resamples of the cases with
 * replacement from {@code new SplittableRandom(seed)} (one generator per summary, so a summary
 * does not depend on which others are computed), the statistic recomputed on each, and the 2.5th
 * and 97.5th percentiles of the resampled statistics (linear interpolation between order
 * statistics, Hyndman-Fan type 7) as the bounds. With a single case the interval collapses to the
 * estimate. NaN everywhere when no case defines the metric.
 */
public record ReaderSummary(String label, String reader, String centre, String reference, int cases, int resamples,
        double meanSensitivity, double sensitivityLo, double sensitivityHi,
        double meanSpecificity, double specificityLo, double specificityHi,
        double meanDice, double diceLo, double diceHi,
        double meanSignedSurfaceMm, double signedSurfaceLoMm, double signedSurfaceHiMm,
        double geoMeanVolumeRatio, double volumeRatioLo, double volumeRatioHi) {

    public static final int DEFAULT_RESAMPLES = 2000;

    /**
     * Summaries per (label, reader, centre, reference), sorted by those keys.
     *
     * @param rows per-case rows (any order; one row per case per key expected)
     * @param resamples bootstrap resamples (at least 1)
     * @param seed seed of the bootstrap generator
     */
    public static List<ReaderSummary> summarise(List<ReaderPerformance> rows, int resamples, long seed) {
        if (resamples < 1) {
            throw new IllegalArgumentException("resamples must be >= 1");
        }
        TreeMap<List<String>, List<ReaderPerformance>> groups = new TreeMap<>(ReaderSummary::compareKeys);
        for (ReaderPerformance r : rows) {
            groups.computeIfAbsent(List.of(r.label(), r.reader(), r.centre(), r.reference()), k -> new ArrayList<>())
                .add(r);
        }
        List<ReaderSummary> out = new ArrayList<>();
        for (var e : groups.entrySet()) {
            List<ReaderPerformance> g = new ArrayList<>(e.getValue());
            g.sort(Comparator.comparing(ReaderPerformance::caseId));
            out.add(summariseGroup(e.getKey(), g, resamples, seed));
        }
        return out;
    }

    private static int compareKeys(List<String> a, List<String> b) {
        for (int i = 0; i < a.size(); i++) {
            int c = a.get(i).compareTo(b.get(i));
            if (c != 0) {
                return c;
            }
        }
        return 0;
    }

    private static ReaderSummary summariseGroup(List<String> key, List<ReaderPerformance> g, int resamples, long seed) {
        int n = g.size();
        double[] sens = values(g, ReaderPerformance::sensitivity);
        double[] spec = values(g, ReaderPerformance::specificity);
        double[] dice = values(g, ReaderPerformance::diceVsConsensus);
        double[] ssd = values(g, ReaderPerformance::signedSurfaceMm);
        double[] logRatio = values(g, r -> r.volumeRatio() > 0 && Double.isFinite(r.volumeRatio())
            ? Math.log(r.volumeRatio()) : Double.NaN);
        double[][] metrics = {sens, spec, dice, ssd, logRatio};
        double[][] boot = new double[metrics.length][resamples];
        SplittableRandom rnd = new SplittableRandom(seed);
        int[] idx = new int[n];
        for (int b = 0; b < resamples; b++) {
            for (int i = 0; i < n; i++) {
                idx[i] = rnd.nextInt(n);
            }
            for (int m = 0; m < metrics.length; m++) {
                boot[m][b] = mean(metrics[m], idx);
            }
        }
        double[] est = new double[metrics.length];
        double[] lo = new double[metrics.length];
        double[] hi = new double[metrics.length];
        int[] all = new int[n];
        for (int i = 0; i < n; i++) {
            all[i] = i;
        }
        for (int m = 0; m < metrics.length; m++) {
            est[m] = mean(metrics[m], all);
            if (Double.isNaN(est[m])) {
                lo[m] = Double.NaN;
                hi[m] = Double.NaN;
            } else {
                lo[m] = percentile(boot[m], 0.025);
                hi[m] = percentile(boot[m], 0.975);
            }
        }
        return new ReaderSummary(key.get(0), key.get(1), key.get(2), key.get(3), n, resamples,
            est[0], lo[0], hi[0], est[1], lo[1], hi[1], est[2], lo[2], hi[2], est[3], lo[3], hi[3],
            Math.exp(est[4]), Math.exp(lo[4]), Math.exp(hi[4]));
    }

    private static double[] values(List<ReaderPerformance> g, ToDoubleFunction<ReaderPerformance> f) {
        double[] v = new double[g.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = f.applyAsDouble(g.get(i));
        }
        return v;
    }

    /** Mean of the non-NaN values at the given indices; NaN when there is none. */
    static double mean(double[] v, int[] idx) {
        double s = 0;
        int k = 0;
        for (int i : idx) {
            if (!Double.isNaN(v[i])) {
                s += v[i];
                k++;
            }
        }
        return k == 0 ? Double.NaN : s / k;
    }

    /** Type-7 percentile of the non-NaN values (NaN when none). */
    static double percentile(double[] v, double prob) {
        return Quantiles.type7Sorted(Arrays.stream(v).filter(d -> !Double.isNaN(d)).sorted().toArray(), prob);
    }
}
