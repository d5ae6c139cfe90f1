package org.accordia.consensus;

/**
 * Settings of a STAPLE run (binary or multi-label).
 *
 * <p>Defaults ({@link #defaults()}): the prior is estimated from the data ({@code fixedPrior} is
 * NaN), tolerance {@code 1e-10} on every parameter change between consecutive iterations, at most
 * 10,000 iterations, region "whole grid". See docs/consensus.md.
 *
 * @param fixedPrior binary STAPLE only: the prior probability g that a voxel of the region is
 *     foreground, in [0, 1]; NaN (the default) estimates g as the mean foreground fraction over
 *     readers and voxels of the region. Ignored by multi-label STAPLE.
 * @param tolerance convergence when every |Δ| of the reader parameters between consecutive
 *     iterations is at most this (non-negative)
 * @param maxIterations iteration cap (at least 1); one iteration = one M-step and one E-step
 * @param region what voxels the histogram counts, in words (e.g. "whole grid", "union bounding
 *     box"); reported in the result because the specificities depend on it
 */
public record StapleOptions(double fixedPrior, double tolerance, int maxIterations, String region) {
    public static final double DEFAULT_TOLERANCE = 1e-10;
    public static final int DEFAULT_MAX_ITERATIONS = 10_000;
    public static final String WHOLE_GRID = "whole grid";

    public StapleOptions {
        if (!Double.isNaN(fixedPrior) && !(fixedPrior >= 0 && fixedPrior <= 1)) {
            throw new IllegalArgumentException("fixed prior must be in [0, 1] or NaN, got " + fixedPrior);
        }
        if (!(tolerance >= 0)) {
            throw new IllegalArgumentException("tolerance must be >= 0, got " + tolerance);
        }
        if (maxIterations < 1) {
            throw new IllegalArgumentException("maxIterations must be >= 1, got " + maxIterations);
        }
        if (region == null || region.isBlank()) {
            throw new IllegalArgumentException("region must be described");
        }
    }

    public static StapleOptions defaults() {
        return new StapleOptions(Double.NaN, DEFAULT_TOLERANCE, DEFAULT_MAX_ITERATIONS, WHOLE_GRID);
    }

    public StapleOptions withFixedPrior(double g) {
        return new StapleOptions(g, tolerance, maxIterations, region);
    }

    public StapleOptions withTolerance(double t) {
        return new StapleOptions(fixedPrior, t, maxIterations, region);
    }

    public StapleOptions withMaxIterations(int n) {
        return new StapleOptions(fixedPrior, tolerance, n, region);
    }

    public StapleOptions withRegion(String r) {
        return new StapleOptions(fixedPrior, tolerance, maxIterations, r);
    }

    public boolean priorIsFixed() {
        return !Double.isNaN(fixedPrior);
    }
}
