package org.accordia.shift;

import java.util.List;

/**
 * A REML fit of a linear mixed model with independent random intercepts.
 *
 * @param names             grouping factors, in the order given to {@link RemlFit}
 * @param variances         σ²_k of each grouping factor (same order; exactly 0 on the boundary)
 * @param residualVariance  σ²_e
 * @param theta             relative standard deviations θ_k = σ_k/σ_e
 * @param beta              fixed effects (GLS estimate at the optimum)
 * @param remlCriterion     −2 × REML log-likelihood, same constant as lme4's REML criterion
 * @param observations      n
 * @param evaluations       objective evaluations used
 * @param converged         false when every optimisation attempt failed (then every number is NaN)
 * @param notes             optimiser fallbacks used, in words (empty when BOBYQA/Brent succeeded)
 */
public record RemlResult(
        List<String> names,
        double[] variances,
        double residualVariance,
        double[] theta,
        double[] beta,
        double remlCriterion,
        int observations,
        int evaluations,
        boolean converged,
        List<String> notes) {

    public RemlResult {
        notes = List.copyOf(notes);
        names = List.copyOf(names);
        variances = variances.clone();
        theta = theta.clone();
        beta = beta.clone();
    }

    @Override
    public double[] variances() {
        return variances.clone();
    }

    @Override
    public double[] theta() {
        return theta.clone();
    }

    @Override
    public double[] beta() {
        return beta.clone();
    }

    /** σ² of the named grouping factor. */
    public double variance(String name) {
        int k = names.indexOf(name);
        if (k < 0) {
            throw new IllegalArgumentException("no grouping factor " + name);
        }
        return variances[k];
    }
}
