package org.accordia.shift;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.TreeMap;
import java.util.stream.IntStream;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;

/**
 * Variance components of a per-reader measure: y = μ + case + centre + reader(centre) + residual,
 * case crossed with readers, all effects random except μ, unbalanced data allowed. Fitted by REML
 * with {@link RemlFit} (Patterson &amp; Thompson 1971; lme4's formulation, Bates et al. 2015).
 *
 * <p>Intervals: parametric bootstrap percentile intervals (Efron &amp; Tibshirani 1993): data are
 * simulated from the fitted model, refitted by REML, and the 2.5 % and 97.5 % percentiles of
 * each σ² are reported. The residual component is named {@code residual}.
 *
 * <p>Test of σ²_centre = 0: the REML likelihood-ratio statistic between the model with and
 * without the centre term (same fixed effects, so REML criteria are comparable). Reference
 * distribution either ½χ²₀ + ½χ²₁ for a single variance on the boundary (Self &amp; Liang 1987,
 * JASA 82:605–610; Stram &amp; Lee 1994, Biometrics 50:1171–1177) or, when resamples are requested,
 * a parametric bootstrap of the statistic under the fitted null model, p = (1 + #{LRT* ≥ LRT})/(1 + B).
 * With only a few centres the asymptotic mixture is a rough guide; the bootstrap is calibrated for
 * the design at hand.
 *
 * <p>Degenerate input: a factor with fewer than two levels (for example a single centre) is left out
 * of the model with a note; fewer than 3 usable observations give an empty result.
 */
public final class VarianceComponents {
    public static final String CASE = "case";
    public static final String CENTRE = "centre";
    public static final String READER = "reader";
    public static final String RESIDUAL = "residual";

    private VarianceComponents() {
    }

    /** One variance component with its interval. */
    public record Component(String name, double estimate, double lower, double upper) {
    }

    /** The test of σ²_centre = 0. */
    public record CentreTest(double statistic, double pValue, String method, int resamples) {
    }

    /**
     * @param components      case, centre, reader, residual (those in the model), in that order
     * @param intervalMethod  how the intervals were made, in words
     * @param centreTest      null when the centre term is not in the model
     * @param observations    rows used
     * @param notes           what was left out and why
     */
    public record Result(List<Component> components, String intervalMethod, CentreTest centreTest,
            int observations, List<String> notes) {
        public Result {
            components = List.copyOf(components);
            notes = List.copyOf(notes);
        }
    }

    /**
     * Fits the model.
     *
     * @param rows            measurements (NaN values are skipped)
     * @param resamples       parametric-bootstrap resamples for the intervals (0: no intervals)
     * @param testResamples   parametric-bootstrap resamples for the centre test (0: χ² mixture)
     * @param seed            seed of the simulations
     */
    public static Result fit(List<ReaderMeasure> rows, int resamples, int testResamples, long seed) {
        List<ReaderMeasure> used = rows.stream().filter(r -> Double.isFinite(r.value())).sorted((a, b) -> {
            int c = a.caseId().compareTo(b.caseId());
            if (c != 0) {
                return c;
            }
            c = a.centre().compareTo(b.centre());
            return c != 0 ? c : a.reader().compareTo(b.reader());
        }).toList();
        List<String> notes = new ArrayList<>();
        if (used.size() < rows.size()) {
            notes.add((rows.size() - used.size()) + " measurement(s) undefined and left out");
        }
        if (used.size() < 3) {
            notes.add("fewer than 3 usable measurements; no variance components");
            return new Result(List.of(), "none", null, used.size(), notes);
        }
        double[] y = used.stream().mapToDouble(ReaderMeasure::value).toArray();
        List<String> names = new ArrayList<>();
        List<int[]> factors = new ArrayList<>();
        addFactor(names, factors, notes, CASE, used.stream().map(ReaderMeasure::caseId).toList());
        addFactor(names, factors, notes, CENTRE, used.stream().map(ReaderMeasure::centre).toList());
        addFactor(names, factors, notes, READER, used.stream().map(r -> r.centre() + "\u0000" + r.reader()).toList());
        if (factors.isEmpty()) {
            notes.add("no grouping factor has two levels; no variance components");
            return new Result(List.of(), "none", null, used.size(), notes);
        }
        try {
            return fitModel(y, names, factors, resamples, testResamples, seed, used.size(), notes);
        } catch (IllegalStateException | ArithmeticException e) {
            // last line of defence: an optimiser failure must never end the analysis
            notes.add("the REML fit failed (" + e.getMessage() + "); the variance components are undefined");
            return undefined(names, used.size(), notes);
        }
    }

    private static Result undefined(List<String> names, int observations, List<String> notes) {
        List<Component> components = new ArrayList<>();
        for (String name : names) {
            components.add(new Component(name, Double.NaN, Double.NaN, Double.NaN));
        }
        components.add(new Component(RESIDUAL, Double.NaN, Double.NaN, Double.NaN));
        return new Result(components, "none", null, observations, notes);
    }

    private static Result fitModel(double[] y, List<String> names, List<int[]> factors, int resamples,
            int testResamples, long seed, int observations, List<String> notes) {
        RemlFit model = new RemlFit(names, factors, null);
        RemlResult fit = model.fit(y);
        fit.notes().forEach(n -> notes.add("REML fit: " + n));
        if (!fit.converged()) {
            return undefined(names, observations, notes);
        }
        int k = names.size();
        int failedRefits = 0;
        double[][] boot = new double[k + 1][resamples];
        Random random = RemlFit.random(seed);
        double[][] simulated = new double[resamples][];
        for (int b = 0; b < resamples; b++) {
            simulated[b] = model.simulate(fit, random); // one seeded stream, in resample order
        }
        RemlResult[] refits = new RemlResult[resamples];
        inParallel(resamples, b -> refits[b] = model.fit(simulated[b], fit.theta()));
        for (int b = 0; b < resamples; b++) {
            RemlResult refit = refits[b];
            failedRefits += refit.converged() ? 0 : 1;
            double[] v = refit.variances();
            for (int j = 0; j < k; j++) {
                boot[j][b] = v[j];
            }
            boot[k][b] = refit.residualVariance();
        }
        List<Component> components = new ArrayList<>();
        double[] est = fit.variances();
        for (int j = 0; j <= k; j++) {
            double e = j < k ? est[j] : fit.residualVariance();
            double lo = Double.NaN;
            double hi = Double.NaN;
            double[] sorted = Arrays.stream(boot[j]).filter(Double::isFinite).sorted().toArray();
            if (sorted.length > 0) {
                lo = EffectEstimator.quantile(sorted, 0.025);
                hi = EffectEstimator.quantile(sorted, 0.975);
            }
            components.add(new Component(j < k ? names.get(j) : RESIDUAL, e, lo, hi));
        }
        if (failedRefits > 0) {
            notes.add(failedRefits + " of " + resamples + " bootstrap refits failed and were left out of the intervals");
        }
        String intervalMethod = resamples > 0
                ? "parametric bootstrap percentile, " + resamples + " resamples"
                : "none";
        CentreTest test = null;
        int centreIndex = names.indexOf(CENTRE);
        if (centreIndex >= 0 && names.size() > 1) {
            List<String> reducedNames = new ArrayList<>(names);
            List<int[]> reducedFactors = new ArrayList<>(factors);
            reducedNames.remove(centreIndex);
            reducedFactors.remove(centreIndex);
            RemlFit reduced = new RemlFit(reducedNames, reducedFactors, null);
            RemlResult fit0 = reduced.fit(y);
            fit0.notes().forEach(n -> notes.add("REML fit without the centre term: " + n));
            if (!fit0.converged()) {
                notes.add("the fit without the centre term failed; no test of sigma2_centre = 0");
                return new Result(components, intervalMethod, null, observations, notes);
            }
            double lrt = Math.max(0, fit0.remlCriterion() - fit.remlCriterion());
            if (testResamples > 0) {
                Random nullRandom = RemlFit.random(seed ^ 0x5DEECE66DL);
                double[][] nullData = new double[testResamples][];
                for (int b = 0; b < testResamples; b++) {
                    nullData[b] = reduced.simulate(fit0, nullRandom);
                }
                double[] fullCriterion = new double[testResamples];
                double[] nullCriterion = new double[testResamples];
                double[] altStart = withCentre(reducedTheta(fit0.theta(), centreIndex));
                inParallel(testResamples, b -> {
                    double[] ys = nullData[b];
                    fullCriterion[b] = finiteMin(model.fit(ys, fit.theta()).remlCriterion(),
                            model.fit(ys, altStart).remlCriterion());
                    nullCriterion[b] = reduced.fit(ys, fit0.theta()).remlCriterion();
                });
                int exceed = 0;
                int used = 0;
                for (int b = 0; b < testResamples; b++) {
                    double full = fullCriterion[b];
                    double stat = Math.max(0, nullCriterion[b] - full);
                    if (Double.isNaN(stat) || Double.isNaN(full)) {
                        continue; // both full-model refits or the null refit failed: left out
                    }
                    used++;
                    if (stat >= lrt - 1e-9 * Math.max(1, lrt)) {
                        exceed++;
                    }
                }
                if (used < testResamples) {
                    notes.add((testResamples - used) + " of " + testResamples
                            + " likelihood-ratio resamples failed to fit and were left out");
                }
                test = new CentreTest(lrt, (1.0 + exceed) / (1.0 + used),
                        "parametric bootstrap of the REML likelihood-ratio statistic under the null, "
                                + testResamples + " resamples",
                        testResamples);
            } else {
                double p = lrt <= 0 ? 1.0
                        : 0.5 * (1 - new ChiSquaredDistribution(null, 1).cumulativeProbability(lrt));
                test = new CentreTest(lrt, p,
                        "REML likelihood-ratio test with the boundary-corrected reference 1/2 chi2(0) + 1/2 chi2(1)",
                        0);
            }
        } else if (centreIndex >= 0) {
            notes.add("the centre term is the only grouping factor; no test of sigma2_centre = 0");
        }
        return new Result(components, intervalMethod, test, observations, notes);
    }

    /**
     * Runs {@code body} for 0 ≤ b &lt; count as a parallel stream. Every resample's data were
     * simulated beforehand from one seeded stream and each refit writes only its own slot, so the
     * result does not depend on the scheduling. Called from a worker of a {@link
     * java.util.concurrent.ForkJoinPool} (as the study-level analysis does), the work stays in that
     * pool and its parallelism bounds the threads; from any other thread it runs in the common pool.
     */
    private static void inParallel(int count, java.util.function.IntConsumer body) {
        IntStream.range(0, count).parallel().forEach(body);
    }

    /** The smaller finite value (NaN stands for a failed fit); NaN when both are NaN. */
    private static double finiteMin(double a, double b) {
        return Double.isNaN(a) ? b : Double.isNaN(b) ? a : Math.min(a, b);
    }

    /** The null fit's θ with a slot for the centre term re-inserted (set to 0). */
    private static double[] reducedTheta(double[] theta0, int centreIndex) {
        double[] t = new double[theta0.length + 1];
        for (int i = 0, j = 0; i < t.length; i++) {
            t[i] = i == centreIndex ? 0 : theta0[j++];
        }
        return t;
    }

    /** Starts the alternative fit with a modest centre term (θ_centre = 0.3) from the null's θ. */
    private static double[] withCentre(double[] theta) {
        double[] t = theta.clone();
        for (int i = 0; i < t.length; i++) {
            if (t[i] == 0) {
                t[i] = 0.3;
            }
        }
        return t;
    }

    private static void addFactor(List<String> names, List<int[]> factors, List<String> notes, String name,
            List<String> keys) {
        TreeMap<String, Integer> index = new TreeMap<>();
        for (String key : keys) {
            index.put(key, 0);
        }
        if (index.size() < 2) {
            notes.add("only one " + name + " level; the " + name + " component is not estimable and left out");
            return;
        }
        int i = 0;
        for (var e : index.entrySet()) {
            e.setValue(i++);
        }
        names.add(name);
        factors.add(keys.stream().mapToInt(index::get).toArray());
    }
}
