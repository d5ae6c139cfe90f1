package org.accordia.shift;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.TreeSet;
import org.accordia.consensus.BorderProfile;

/**
 * Per-centre shares of border beyond the structure's tolerance (see {@link LocalEffect}) from the
 * per-case border profiles against the other centres' consensus; no voxels.
 *
 * <p>Per case, a centre's share is Σ(border voxels beyond τ outside)/Σ(border voxels) over its
 * readers present with a border (a ratio of sums, so each reader's border counts by its size); the
 * centre's share is the mean over its cases (every case weighs the same). The <em>excess</em> is the
 * centre's share minus the median share over the centres with a value (G ≥ 3), or minus the other
 * centre's share (G = 2, the pair judged once). Why the median: one centre adding a part makes
 * the other centres look "inside" against a consensus that partly contains the part (the mirror),
 * never "outside", so the median of the outside shares stays at the innocent level when most
 * centres draw alike; the inside shares of the innocent centres rise together and their excess over
 * the median stays near 0. Intervals: 95 % case-bootstrap percentiles (type 7), cases resampled with
 * replacement, the same draw for every centre, the excess recomputed in every resample (Efron &amp;
 * Tibshirani 1993).
 */
public final class LocalEffects {
    /**
     * Smallest relevant excess share of border beyond tolerance (0.10 = 10 percentage points of the
     * centre's border more than the typical centre's); see docs/shift.md for the calibration.
     */
    public static final double MINIMUM_EXCESS = 0.10;
    private LocalEffects() {
    }

    /** The centres' local effects (sorted by name); empty when no row carries a border profile. */
    public static List<LocalEffect> byCentre(List<ReaderCaseMeasure> rows, int resamples, long seed) {
        List<ReaderCaseMeasure> withProfile = rows.stream().filter(r -> r.border() != null).toList();
        if (withProfile.isEmpty()) {
            return List.of();
        }
        double tolerance = withProfile.get(0).border().toleranceMm();
        List<String> cases = List.copyOf(new TreeSet<>(withProfile.stream().map(ReaderCaseMeasure::caseId).toList()));
        List<String> centres = List.copyOf(new TreeSet<>(withProfile.stream().map(ReaderCaseMeasure::centre).toList()));
        int nc = cases.size();
        int ng = centres.size();
        long[][] border = new long[ng][nc];
        long[][] out = new long[ng][nc];
        long[][] in = new long[ng][nc];
        long[][] dirBorder = new long[ng][BorderProfile.DIRECTIONS];
        long[][] dirOut = new long[ng][BorderProfile.DIRECTIONS];
        List<TreeSet<String>> readers = new ArrayList<>();
        for (int g = 0; g < ng; g++) {
            readers.add(new TreeSet<>());
        }
        TreeMap<String, Integer> caseIndex = new TreeMap<>();
        for (int c = 0; c < nc; c++) {
            caseIndex.put(cases.get(c), c);
        }
        for (ReaderCaseMeasure r : withProfile) {
            int g = centres.indexOf(r.centre());
            int c = caseIndex.get(r.caseId());
            BorderProfile p = r.border();
            readers.get(g).add(r.reader());
            border[g][c] += p.border();
            out[g][c] += p.outside();
            in[g][c] += p.inside();
            long[] bd = p.borderByDirection();
            long[] od = p.outsideByDirection();
            for (int d = 0; d < BorderProfile.DIRECTIONS; d++) {
                dirBorder[g][d] += bd[d];
                dirOut[g][d] += od[d];
            }
        }
        double[][] outShare = ratio(out, border);
        double[][] inShare = ratio(in, border);
        double[] outPoint = new double[ng];
        double[] inPoint = new double[ng];
        for (int g = 0; g < ng; g++) {
            outPoint[g] = EffectEstimator.mean(outShare[g], null);
            inPoint[g] = EffectEstimator.mean(inShare[g], null);
        }
        double[] outExcess = excess(outPoint);
        double[] inExcess = excess(inPoint);
        double[][] outBoot = new double[ng][resamples];
        double[][] inBoot = new double[ng][resamples];
        SplittableRandom random = new SplittableRandom(seed);
        int[] draw = new int[nc];
        for (int b = 0; b < resamples; b++) {
            for (int i = 0; i < nc; i++) {
                draw[i] = random.nextInt(nc);
            }
            double[] ob = new double[ng];
            double[] ib = new double[ng];
            for (int g = 0; g < ng; g++) {
                ob[g] = EffectEstimator.mean(outShare[g], draw);
                ib[g] = EffectEstimator.mean(inShare[g], draw);
            }
            ob = excess(ob);
            ib = excess(ib);
            for (int g = 0; g < ng; g++) {
                outBoot[g][b] = ob[g];
                inBoot[g][b] = ib[g];
            }
        }
        List<LocalEffect> result = new ArrayList<>();
        for (int g = 0; g < ng; g++) {
            int withBorder = 0;
            for (int c = 0; c < nc; c++) {
                withBorder += Double.isNaN(outShare[g][c]) ? 0 : 1;
            }
            double[] oi = EffectEstimator.percentileInterval(outBoot[g], withBorder);
            double[] ii = EffectEstimator.percentileInterval(inBoot[g], withBorder);
            List<Double> byDir = new ArrayList<>();
            for (int d = 0; d < BorderProfile.DIRECTIONS; d++) {
                byDir.add(dirBorder[g][d] == 0 ? Double.NaN : (double) dirOut[g][d] / dirBorder[g][d]);
            }
            result.add(new LocalEffect(centres.get(g), readers.get(g).size(), withBorder, tolerance, outPoint[g],
                outExcess[g], oi[0], oi[1], inPoint[g], inExcess[g], ii[0], ii[1], byDir));
        }
        return result;
    }

    /** Each finite value minus the median of the finite values (G ≥ 3) or minus the other one (G = 2). */
    static double[] excess(double[] v) {
        double[] finite = Arrays.stream(v).filter(x -> !Double.isNaN(x)).sorted().toArray();
        double[] r = new double[v.length];
        int g = finite.length;
        for (int i = 0; i < v.length; i++) {
            if (Double.isNaN(v[i]) || g < 2) {
                r[i] = Double.NaN;
            } else if (g == 2) {
                r[i] = v[i] - (finite[0] + finite[1] - v[i]);
            } else {
                double median = g % 2 == 1 ? finite[g / 2] : 0.5 * (finite[g / 2 - 1] + finite[g / 2]);
                r[i] = v[i] - median;
            }
        }
        return r;
    }

    private static double[][] ratio(long[][] num, long[][] den) {
        double[][] r = new double[num.length][];
        for (int g = 0; g < num.length; g++) {
            r[g] = new double[num[g].length];
            for (int c = 0; c < num[g].length; c++) {
                r[g][c] = den[g][c] == 0 ? Double.NaN : (double) num[g][c] / den[g][c];
            }
        }
        return r;
    }
}
