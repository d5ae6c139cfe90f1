package org.accordia.shift;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

import org.apache.commons.math3.optim.InitialGuess;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.PointValuePair;
import org.apache.commons.math3.optim.SimpleBounds;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.nonlinear.scalar.ObjectiveFunction;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.BOBYQAOptimizer;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.NelderMeadSimplex;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.SimplexOptimizer;
import org.apache.commons.math3.optim.univariate.BrentOptimizer;
import org.apache.commons.math3.optim.univariate.SearchInterval;
import org.apache.commons.math3.optim.univariate.UnivariateObjectiveFunction;
import org.apache.commons.math3.optim.univariate.UnivariatePointValuePair;
import org.apache.commons.math3.random.Well19937c;

/**
 * Restricted maximum likelihood (REML; Patterson &amp; Thompson 1971, Biometrika 58:545–554) for
 * y = Xβ + Σ_k Z_k u_k + e, u_k ~ N(0, σ²_k I), e ~ N(0, σ²_e I), where each Z_k is the indicator
 * matrix of one grouping factor (random intercepts; crossed or nested, balanced or not).
 *
 * <p>Formulation as in lme4 (Bates, Mächler, Bolker &amp; Walker 2015, J Stat Softw 67(1), eq. 41–42):
 * relative standard deviations θ_k = σ_k/σ_e ≥ 0, Λ = diag(θ), and σ²_e profiled out. With
 * A = [ΛZ'ZΛ + I, ΛZ'X; X'ZΛ, X'X] = LL' (dense Cholesky, size q + p where q = Σ levels) and
 * c = [ΛZ'y; X'y], the penalised residual sum of squares is r² = y'y − |L⁻¹c|² and the profiled
 * REML criterion is log|A| + (n − p)(1 + log(2π r²/(n − p))), which equals −2 × the REML
 * log-likelihood −½[log|V| + log|X'V⁻¹X| + (y − Xβ̂)'V⁻¹(y − Xβ̂)] up to the same constant lme4 uses.
 * Z'Z, Z'X, X'X are formed once; each evaluation costs one Cholesky of a (q + p)² matrix.
 *
 * <p>Optimisation over θ in the box [0, 10³]^K: Brent's method on θ/(1 + θ) for one factor, BOBYQA
 * (Powell 2009) from three starts (θ = 1, 0.25, 4) for several; afterwards each small θ_k is set to
 * exactly 0 when that does not increase the criterion, so boundary estimates are exact zeros.
 * Refits from a given start (the parametric bootstraps, hundreds of fits per analysis) use
 * Nelder–Mead (Nelder &amp; Mead 1965; commons-math {@code SimplexOptimizer}) on θ = u² instead of
 * BOBYQA: commons-math's BOBYQA spends about 85 % of a refit in its own bookkeeping (matrix objects
 * per step) against 10 µs per criterion evaluation, so the simplex, with more but far cheaper steps,
 * refits about 2.5 times faster; its optimum is checked against the multi-start BOBYQA fit in the
 * tests ({@code RemlRefitTest}).
 *
 * <p>Robustness: BOBYQA can stop with an exception ("trust region step has failed to reduce Q")
 * on some data sets (seen on a simulated null study whose optimum lies on the boundary). Such a
 * start is then continued with derivative-free fallbacks that cannot fail that way: Nelder–Mead
 * (Nelder &amp; Mead 1965) on θ = u², followed by a coordinate-wise Brent search over the bounded
 * θ; the best criterion over all starts and methods is kept and each fallback is listed in
 * {@link RemlResult#notes()}. When no attempt yields a finite criterion the result has
 * {@code converged = false} and NaN estimates; the fit never throws because the optimiser failed.
 *
 * <p>Degenerate input: NaN responses or negative level indices are errors; X must have full column
 * rank; n must exceed p. Levels that never occur are allowed (their effect is 0).
 */
public final class RemlFit {
    private static final double THETA_MAX = 1e3;
    private static final double[] STARTS = {1.0, 0.25, 4.0};

    private final List<String> names;
    private final int n;
    private final int p;
    private final int q;
    private final int factors;
    private final int[] offset;
    private final int[] levels;
    private final int[][] columns;   // per observation: the q-index of each factor's level
    private final double[][] x;
    private final double[][] ztz;
    private final double[][] ztx;
    private final double[][] xtx;
    private final int[] rowStart;    // per row of A: its first structurally non-zero column (envelope)

    /**
     * @param names   one name per grouping factor
     * @param factors per factor, the level index (0-based) of every observation
     * @param x       n × p fixed-effect design, or {@code null} for an intercept only
     */
    public RemlFit(List<String> names, List<int[]> factors, double[][] x) {
        if (names.size() != factors.size() || factors.isEmpty()) {
            throw new IllegalArgumentException("need one name per grouping factor and at least one factor");
        }
        this.names = List.copyOf(names);
        this.factors = factors.size();
        this.n = factors.get(0).length;
        if (x == null) {
            x = new double[n][1];
            for (double[] row : x) {
                row[0] = 1;
            }
        }
        if (x.length != n) {
            throw new IllegalArgumentException("X has " + x.length + " rows for " + n + " observations");
        }
        this.p = x[0].length;
        if (n <= p) {
            throw new IllegalArgumentException("need more observations than fixed effects");
        }
        this.x = new double[n][];
        for (int i = 0; i < n; i++) {
            if (x[i].length != p) {
                throw new IllegalArgumentException("X is ragged");
            }
            this.x[i] = x[i].clone();
        }
        this.offset = new int[this.factors];
        this.levels = new int[this.factors];
        int total = 0;
        for (int k = 0; k < this.factors; k++) {
            int[] f = factors.get(k);
            if (f.length != n) {
                throw new IllegalArgumentException("factor " + names.get(k) + " has the wrong length");
            }
            int max = -1;
            for (int v : f) {
                if (v < 0) {
                    throw new IllegalArgumentException("factor " + names.get(k) + " has a negative level");
                }
                max = Math.max(max, v);
            }
            offset[k] = total;
            levels[k] = max + 1;
            total += max + 1;
        }
        this.q = total;
        this.columns = new int[n][this.factors];
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < this.factors; k++) {
                columns[i][k] = offset[k] + factors.get(k)[i];
            }
        }
        ztz = new double[q][q];
        ztx = new double[q][p];
        xtx = new double[p][p];
        for (int i = 0; i < n; i++) {
            int[] cols = columns[i];
            for (int a : cols) {
                for (int b : cols) {
                    ztz[a][b] += 1;
                }
                for (int j = 0; j < p; j++) {
                    ztx[a][j] += this.x[i][j];
                }
            }
            for (int j = 0; j < p; j++) {
                for (int l = 0; l < p; l++) {
                    xtx[j][l] += this.x[i][j] * this.x[i][l];
                }
            }
        }
        rowStart = envelope();
    }

    public List<String> names() {
        return names;
    }

    public int observations() {
        return n;
    }

    /** Levels of each factor (max index + 1). */
    public int[] levels() {
        return levels.clone();
    }

    /** The REML fit for response y (multi-start). */
    public RemlResult fit(double[] y) {
        return fit(y, null);
    }

    /**
     * The REML fit for response y. With {@code startTheta} non-null, optimisation starts there
     * only (used by bootstrap refits); otherwise from the default starts.
     */
    public RemlResult fit(double[] y, double[] startTheta) {
        Response r = response(y);
        int[] evaluations = new int[1];
        List<String> notes = new ArrayList<>();
        java.util.function.ToDoubleFunction<double[]> objective = t -> {
            evaluations[0]++;
            return criterion(r, t);
        };
        double[] best = null;
        double bestValue = Double.POSITIVE_INFINITY;
        if (factors == 1) {
            try {
                BrentOptimizer brent = new BrentOptimizer(1e-12, 1e-14);
                UnivariatePointValuePair opt = brent.optimize(new MaxEval(10_000), GoalType.MINIMIZE,
                        new SearchInterval(0, 1 - 1e-9, 0.5),
                        new UnivariateObjectiveFunction(t -> objective.applyAsDouble(new double[] {t / (1 - t)})));
                if (Double.isFinite(opt.getValue())) {
                    best = new double[] {opt.getPoint() / (1 - opt.getPoint())};
                    bestValue = opt.getValue();
                }
            } catch (IllegalStateException | ArithmeticException e) {
                notes.add("Brent's method failed (" + e.getMessage() + "); a grid search over theta was used instead");
                double[] fallback = coordinateSearch(objective, new double[] {1.0});
                if (fallback != null) {
                    best = fallback;
                    bestValue = objective.applyAsDouble(best);
                }
            }
        } else {
            List<double[]> starts = new ArrayList<>();
            if (startTheta != null) {
                double[] s = startTheta.clone();
                for (int k = 0; k < s.length; k++) {
                    s[k] = Math.min(THETA_MAX / 2, Math.max(s[k], 0.05));
                }
                starts.add(s);
            } else {
                for (double s : STARTS) {
                    double[] start = new double[factors];
                    Arrays.fill(start, s);
                    starts.add(start);
                }
            }
            double[] lower = new double[factors];
            double[] upper = new double[factors];
            Arrays.fill(upper, THETA_MAX);
            for (double[] start : starts) {
                double[] point;
                if (startTheta != null) {
                    point = refitSimplex(objective, start);
                    if (point != null) {
                        double value = objective.applyAsDouble(point);
                        if (value < bestValue) {
                            bestValue = value;
                            best = point.clone();
                        }
                        continue;
                    }
                    notes.add(String.format(java.util.Locale.ROOT, "Nelder-Mead refit from start theta = %s found no "
                            + "finite criterion; the fallback searches were used", Arrays.toString(start)));
                }
                try {
                    // refits from a given start (bootstrap) stop earlier: 1e-7 in θ is far below resampling noise
                    BOBYQAOptimizer bobyqa = new BOBYQAOptimizer(2 * factors + 1, startTheta == null ? 0.2 : 0.1,
                            startTheta == null ? 1e-10 : 1e-7);
                    point = bobyqa.optimize(new MaxEval(50_000), GoalType.MINIMIZE,
                            new InitialGuess(start), new SimpleBounds(lower, upper),
                            new ObjectiveFunction(objective::applyAsDouble)).getPoint();
                } catch (IllegalStateException | ArithmeticException e) {
                    // BOBYQA can stop with "trust region step has failed to reduce Q" on nearly flat or
                    // boundary optima; the fit must go on: derivative-free fallbacks from the same start
                    notes.add(String.format(java.util.Locale.ROOT,
                            "BOBYQA failed from start theta = %s (%s); Nelder-Mead and a coordinate-wise Brent "
                                    + "search were used from that start", Arrays.toString(start), e.getMessage()));
                    point = fallback(objective, start);
                }
                if (point == null) {
                    continue;
                }
                double value = objective.applyAsDouble(point);
                if (value < bestValue) {
                    bestValue = value;
                    best = point.clone();
                }
            }
        }
        if (best == null) {
            notes.add("every optimisation attempt failed; the variance components are undefined");
            double[] nan = new double[factors];
            Arrays.fill(nan, Double.NaN);
            double[] beta = new double[p];
            Arrays.fill(beta, Double.NaN);
            return new RemlResult(names, nan, Double.NaN, nan, beta, Double.NaN, n, evaluations[0], false, notes);
        }
        // exact zeros on the boundary
        double atZero = criterion(r, zero(best, -1));
        for (int k = 0; k < factors; k++) {
            if (best[k] < 1e-3 && best[k] > 0) {
                double[] trial = zero(best, k);
                double v = criterion(r, trial);
                evaluations[0]++;
                if (v <= bestValue + 1e-12 * Math.abs(bestValue)) {
                    best = trial;
                    bestValue = Math.min(v, bestValue);
                }
            }
        }
        if (atZero < bestValue) {
            best = zero(best, -1);
            bestValue = atZero;
        }
        return finish(r, best, evaluations[0], notes);
    }

    /**
     * Derivative-free fallback from one start: Nelder–Mead (Nelder &amp; Mead 1965; commons-math
     * {@code SimplexOptimizer}) on u with θ = min(u², 10³), so the box needs no constraint handling,
     * then cycles of a coordinate-wise Brent search (each θ_k over [0, 10³] via θ/(1 + θ)) from the
     * better of the start and the Nelder–Mead point. Returns the best point found, or null when no
     * finite criterion value was seen.
     */
    private double[] fallback(java.util.function.ToDoubleFunction<double[]> objective, double[] start) {
        double[] best = null;
        double bestValue = Double.POSITIVE_INFINITY;
        double startValue = safe(objective, start);
        if (Double.isFinite(startValue)) {
            best = start.clone();
            bestValue = startValue;
        }
        try {
            double[] t = simplexInU(objective, start, 1e-12, 1e-14, 0.2);
            double v = safe(objective, t);
            if (v < bestValue) {
                best = t;
                bestValue = v;
            }
        } catch (IllegalStateException | ArithmeticException e) {
            // Nelder–Mead ran out of evaluations or failed: the coordinate search below still runs
        }
        double[] polished = coordinateSearch(objective, best != null ? best : start);
        if (polished != null && safe(objective, polished) < bestValue) {
            best = polished;
        }
        return best;
    }

    /** Relative and absolute change of the criterion below which a refit's simplex has converged. */
    static final double REFIT_RELATIVE_TOLERANCE = 1e-11;
    static final double REFIT_ABSOLUTE_TOLERANCE = 1e-14;
    /** Initial simplex step in u = √θ for refits (the start is the original fit's θ, close to the optimum). */
    static final double REFIT_STEP = 0.05;

    /**
     * A bootstrap refit: Nelder–Mead on u with θ = min(u², 10³) from √start, step {@link #REFIT_STEP};
     * null when it fails or ends on a non-finite criterion (the caller then uses the fallbacks).
     */
    private double[] refitSimplex(java.util.function.ToDoubleFunction<double[]> objective, double[] start) {
        try {
            double[] t = simplexInU(objective, start, REFIT_RELATIVE_TOLERANCE, REFIT_ABSOLUTE_TOLERANCE, REFIT_STEP);
            return Double.isFinite(safe(objective, t)) ? t : null;
        } catch (IllegalStateException | ArithmeticException e) {
            return null;
        }
    }

    /**
     * Nelder–Mead (commons-math {@code SimplexOptimizer}, at most 20,000 evaluations) on u with
     * θ = min(u², 10³) from u = √start, initial step {@code step} in u; returns θ of the point found.
     * Throws what the optimiser throws (evaluations exhausted, arithmetic failure).
     */
    private double[] simplexInU(java.util.function.ToDoubleFunction<double[]> objective, double[] start,
            double relativeTolerance, double absoluteTolerance, double step) {
        double[] u0 = new double[factors];
        for (int k = 0; k < factors; k++) {
            u0[k] = Math.sqrt(start[k]);
        }
        PointValuePair opt = new SimplexOptimizer(relativeTolerance, absoluteTolerance)
                .optimize(new MaxEval(20_000), GoalType.MINIMIZE, new InitialGuess(u0),
                        new NelderMeadSimplex(factors, step),
                        new ObjectiveFunction(u -> safe(objective, fromU(u))));
        return fromU(opt.getPoint());
    }

    private static double[] fromU(double[] u) {
        double[] t = new double[u.length];
        for (int k = 0; k < u.length; k++) {
            t[k] = Math.min(u[k] * u[k], THETA_MAX);
        }
        return t;
    }

    /** The criterion, or +∞ when it cannot be evaluated (so a search never stops on it). */
    private static double safe(java.util.function.ToDoubleFunction<double[]> objective, double[] theta) {
        try {
            double v = objective.applyAsDouble(theta);
            return Double.isNaN(v) ? Double.POSITIVE_INFINITY : v;
        } catch (ArithmeticException e) {
            return Double.POSITIVE_INFINITY;
        }
    }

    /**
     * Cyclic coordinate descent: each θ_k in turn minimised by Brent's method on θ/(1 + θ) ∈ [0, 1)
     * with the others fixed, until a full cycle improves the criterion by less than 1e-10 (at most
     * 200 cycles). Every step keeps the best value, so the criterion never increases. Null when no
     * finite value was found.
     */
    private double[] coordinateSearch(java.util.function.ToDoubleFunction<double[]> objective, double[] start) {
        double[] t = start.clone();
        double value = safe(objective, t);
        for (int cycle = 0; cycle < 200; cycle++) {
            double before = value;
            for (int k = 0; k < factors; k++) {
                final int kk = k;
                final double[] base = t.clone();
                try {
                    UnivariatePointValuePair opt = new BrentOptimizer(1e-10, 1e-14).optimize(new MaxEval(2_000),
                            GoalType.MINIMIZE, new SearchInterval(0, 1 - 1e-6, base[k] / (1 + base[k])),
                            new UnivariateObjectiveFunction(s -> {
                                double[] trial = base.clone();
                                trial[kk] = Math.min(s / (1 - s), THETA_MAX);
                                return safe(objective, trial);
                            }));
                    if (opt.getValue() < value) {
                        t[k] = Math.min(opt.getPoint() / (1 - opt.getPoint()), THETA_MAX);
                        value = opt.getValue();
                    }
                } catch (IllegalStateException | ArithmeticException e) {
                    // keep the current θ_k
                }
            }
            if (!(before - value > 1e-10 * Math.max(1, Math.abs(value)))) {
                break;
            }
        }
        return Double.isFinite(value) ? t : null;
    }

    /** The REML criterion (−2 REML log-likelihood) at given relative standard deviations. */
    public double criterion(double[] y, double[] theta) {
        return criterion(response(y), theta);
    }

    /**
     * Draws a response from the fitted model: Xβ + Σ_k σ_k z_k[level] + σ_e ε with standard normal
     * z and ε.
     */
    public double[] simulate(RemlResult fit, Random random) {
        double[][] effects = new double[factors][];
        double[] variances = fit.variances();
        for (int k = 0; k < factors; k++) {
            effects[k] = new double[levels[k]];
            double sd = Math.sqrt(variances[k]);
            for (int l = 0; l < levels[k]; l++) {
                effects[k][l] = sd * random.nextGaussian();
            }
        }
        double sdE = Math.sqrt(fit.residualVariance());
        double[] beta = fit.beta();
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            double v = 0;
            for (int j = 0; j < p; j++) {
                v += x[i][j] * beta[j];
            }
            for (int k = 0; k < factors; k++) {
                v += effects[k][columns[i][k] - offset[k]];
            }
            y[i] = v + sdE * random.nextGaussian();
        }
        return y;
    }

    /** A seeded generator for {@link #simulate}. */
    public static Random random(long seed) {
        return new Random(new Well19937c(seed).nextLong());
    }

    private static double[] zero(double[] theta, int k) {
        double[] t = theta.clone();
        if (k < 0) {
            Arrays.fill(t, 0);
        } else {
            t[k] = 0;
        }
        return t;
    }

    private record Response(double[] zty, double[] xty, double yty) {
    }

    private Response response(double[] y) {
        if (y.length != n) {
            throw new IllegalArgumentException("response has " + y.length + " values for " + n + " observations");
        }
        double[] zty = new double[q];
        double[] xty = new double[p];
        double yty = 0;
        for (int i = 0; i < n; i++) {
            double v = y[i];
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("response " + i + " is not finite");
            }
            for (int a : columns[i]) {
                zty[a] += v;
            }
            for (int j = 0; j < p; j++) {
                xty[j] += x[i][j] * v;
            }
            yty += v * v;
        }
        return new Response(zty, xty, yty);
    }

    private double[] lambda(double[] theta) {
        double[] lambda = new double[q];
        for (int k = 0; k < factors; k++) {
            Arrays.fill(lambda, offset[k], offset[k] + levels[k], theta[k]);
        }
        return lambda;
    }

    /**
     * Envelope of A: per row, the first column whose entry can be non-zero (Z'Z, Z'X, X'X non-zero
     * there, or the diagonal). The Cholesky factor keeps the envelope of A (no fill-in before a row's
     * first non-zero; George &amp; Liu 1981, Computer Solution of Large Sparse Positive Definite Systems,
     * ch. 4, from memory), so products left of it are exact zeros and are
     * skipped. A factor's own block of Z'Z is diagonal (each observation has one level), so the rows
     * of the first factor cost nothing; the skipped terms are all zero, so the factor is the same.
     */
    private int[] envelope() {
        int m = q + p;
        int[] start = new int[m];
        for (int i = 0; i < m; i++) {
            start[i] = i;
            for (int j = 0; j < i; j++) {
                boolean nonZero = i < q ? ztz[i][j] != 0 : j < q ? ztx[j][i - q] != 0 : xtx[i - q][j - q] != 0;
                if (nonZero) {
                    start[i] = j;
                    break;
                }
            }
        }
        return start;
    }

    /** Lower Cholesky factor of A(θ), in place; returns null when A is not positive definite. */
    private double[][] factor(double[] lambda) {
        int m = q + p;
        double[][] a = new double[m][m];
        for (int i = 0; i < q; i++) {
            for (int j = rowStart[i]; j <= i; j++) {
                a[i][j] = lambda[i] * lambda[j] * ztz[i][j];
            }
            a[i][i] += 1;
        }
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < q; j++) {
                a[q + i][j] = lambda[j] * ztx[j][i];
            }
            for (int j = 0; j <= i; j++) {
                a[q + i][q + j] = xtx[i][j];
            }
        }
        for (int j = 0; j < m; j++) {
            double[] rj = a[j];
            int sj = rowStart[j];
            double d = rj[j];
            for (int k = sj; k < j; k++) {
                d -= rj[k] * rj[k];
            }
            if (!(d > 0)) {
                return null;
            }
            d = Math.sqrt(d);
            rj[j] = d;
            for (int i = j + 1; i < m; i++) {
                if (rowStart[i] > j) {
                    continue; // left of row i's envelope: stays 0
                }
                double[] ri = a[i];
                double s = ri[j];
                for (int k = Math.max(sj, rowStart[i]); k < j; k++) {
                    s -= ri[k] * rj[k];
                }
                ri[j] = s / d;
            }
        }
        return a;
    }

    private double[] rhs(Response r, double[] lambda) {
        double[] c = new double[q + p];
        for (int i = 0; i < q; i++) {
            c[i] = lambda[i] * r.zty[i];
        }
        System.arraycopy(r.xty, 0, c, q, p);
        return c;
    }

    /** L⁻¹c by forward substitution, within the envelope of L. */
    private double[] forward(double[][] l, double[] c) {
        int m = c.length;
        double[] w = new double[m];
        for (int i = 0; i < m; i++) {
            double s = c[i];
            double[] li = l[i];
            for (int k = rowStart[i]; k < i; k++) {
                s -= li[k] * w[k];
            }
            w[i] = s / li[i];
        }
        return w;
    }

    private double criterion(Response r, double[] theta) {
        double[] lambda = lambda(theta);
        double[][] l = factor(lambda);
        if (l == null) {
            throw new IllegalArgumentException("the fixed-effect design does not have full column rank");
        }
        double[] w = forward(l, rhs(r, lambda));
        double logDet = 0;
        for (int i = 0; i < q + p; i++) {
            logDet += 2 * Math.log(l[i][i]);
        }
        double r2 = r.yty;
        for (double v : w) {
            r2 -= v * v;
        }
        r2 = Math.max(r2, 1e-300);
        int dof = n - p;
        return logDet + dof * (1 + Math.log(2 * Math.PI * r2 / dof));
    }

    private RemlResult finish(Response r, double[] theta, int evaluations, List<String> notes) {
        double[] lambda = lambda(theta);
        double[][] l = factor(lambda);
        double[] w = forward(l, rhs(r, lambda));
        int m = q + p;
        double[] sol = new double[m];
        for (int i = m - 1; i >= 0; i--) {
            double s = w[i];
            for (int k = i + 1; k < m; k++) {
                s -= l[k][i] * sol[k];
            }
            sol[i] = s / l[i][i];
        }
        double r2 = r.yty;
        for (double v : w) {
            r2 -= v * v;
        }
        double sigma2 = Math.max(r2, 0) / (n - p);
        double[] variances = new double[factors];
        for (int k = 0; k < factors; k++) {
            variances[k] = theta[k] * theta[k] * sigma2;
        }
        double[] beta = Arrays.copyOfRange(sol, q, m);
        return new RemlResult(names, variances, sigma2, theta, beta, criterion(r, theta), n, evaluations, true, notes);
    }
}
