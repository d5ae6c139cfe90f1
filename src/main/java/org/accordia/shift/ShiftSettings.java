package org.accordia.shift;

import org.accordia.study.Protocol;

/**
 * Thresholds and resampling sizes for the annotation-shift analysis of one study. All distances in
 * mm, all percentages in percent (15 means 15 %), shares as fractions.
 *
 * @param alpha                       significance level of the permutation test (default 0.05)
 * @param minimumShiftMm              smallest centre shift in signed surface distance that
 *                                    matters in practice (default 1.0 mm)
 * @param minimumVolumeShiftPercent   smallest centre shift in volume that matters (default 15 %)
 * @param adjudicationDice            a case goes to adjudication when its median pairwise Dice is
 *                                    below this (default 0.70)
 * @param adjudicationHd95Mm          ... or when any reader pair's HD95 exceeds this (default 10 mm)
 * @param adjudicationShare           verdict {@code review} when more than this share of cases
 *                                    needs adjudication (default 0.20)
 * @param recalibrationToleranceMm    a reader needs recalibration when the interval of their mean
 *                                    signed surface distance lies entirely beyond ± this (1.0 mm)
 * @param recalibrationVolumePercent  ... or their volume-ratio interval entirely beyond ± this (20 %)
 * @param permutations                Monte Carlo permutations when exact enumeration is too large
 *                                    (default 9,999)
 * @param exactLimit                  enumerate all distinct reader partitions when there are at
 *                                    most this many (default 100,000)
 * @param bootstrapResamples          case-bootstrap resamples for centre and reader effects (2,000)
 * @param varianceResamples           parametric-bootstrap resamples for variance-component
 *                                    intervals (default 200)
 * @param centreTestResamples         parametric-bootstrap resamples of the likelihood-ratio test of
 *                                    σ²_centre = 0 (default 199; 0 = use the ½χ²₀ + ½χ²₁ reference)
 * @param seed                        seed of every random generator of the analysis
 */
public record ShiftSettings(
        double alpha,
        double minimumShiftMm,
        double minimumVolumeShiftPercent,
        double adjudicationDice,
        double adjudicationHd95Mm,
        double adjudicationShare,
        double recalibrationToleranceMm,
        double recalibrationVolumePercent,
        int permutations,
        long exactLimit,
        int bootstrapResamples,
        int varianceResamples,
        int centreTestResamples,
        long seed) {

    // Protocol keys take their defaults from the protocol's one set (docs/protocol.md); the seed is
    // the protocol's too, so the library and the command line start from the same one.
    public static final double DEFAULT_ALPHA = Protocol.DEFAULT_ALPHA;
    public static final double DEFAULT_MINIMUM_SHIFT_MM = Protocol.DEFAULT_MINIMUM_SHIFT_MM;
    public static final double DEFAULT_MINIMUM_VOLUME_SHIFT_PERCENT = Protocol.DEFAULT_MINIMUM_VOLUME_SHIFT_PERCENT;
    public static final double DEFAULT_ADJUDICATION_DICE = Protocol.DEFAULT_ADJUDICATION_DICE;
    public static final double DEFAULT_ADJUDICATION_HD95_MM = Protocol.DEFAULT_ADJUDICATION_HD95_MM;
    public static final double DEFAULT_ADJUDICATION_SHARE = Protocol.DEFAULT_ADJUDICATION_SHARE;
    public static final double DEFAULT_RECALIBRATION_TOLERANCE_MM = Protocol.DEFAULT_RECALIBRATION_TOLERANCE_MM;
    public static final double DEFAULT_RECALIBRATION_VOLUME_PERCENT = Protocol.DEFAULT_RECALIBRATION_VOLUME_PERCENT;
    public static final int DEFAULT_PERMUTATIONS = Protocol.DEFAULT_PERMUTATIONS;
    public static final long DEFAULT_EXACT_LIMIT = 100_000L;
    public static final int DEFAULT_BOOTSTRAP_RESAMPLES = Protocol.DEFAULT_BOOTSTRAP_RESAMPLES;
    public static final int DEFAULT_VARIANCE_RESAMPLES = 200;
    public static final int DEFAULT_CENTRE_TEST_RESAMPLES = 199;
    public static final long DEFAULT_SEED = Protocol.DEFAULT_SEED;

    public ShiftSettings {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must lie in (0, 1): " + alpha);
        }
        requireNonNegative("minimumShiftMm", minimumShiftMm);
        requireNonNegative("minimumVolumeShiftPercent", minimumVolumeShiftPercent);
        requireNonNegative("adjudicationHd95Mm", adjudicationHd95Mm);
        requireNonNegative("recalibrationToleranceMm", recalibrationToleranceMm);
        requireNonNegative("recalibrationVolumePercent", recalibrationVolumePercent);
        if (!(adjudicationDice >= 0 && adjudicationDice <= 1)) {
            throw new IllegalArgumentException("adjudicationDice must lie in [0, 1]: " + adjudicationDice);
        }
        if (!(adjudicationShare >= 0 && adjudicationShare <= 1)) {
            throw new IllegalArgumentException("adjudicationShare must lie in [0, 1]: " + adjudicationShare);
        }
        if (minimumVolumeShiftPercent >= 100 || recalibrationVolumePercent >= 100) {
            throw new IllegalArgumentException("volume percentages must be below 100");
        }
        if (permutations < 1 || exactLimit < 1 || bootstrapResamples < 1 || varianceResamples < 0
                || centreTestResamples < 0) {
            throw new IllegalArgumentException("resampling sizes must be positive");
        }
    }

    /** The documented defaults. */
    public static ShiftSettings defaults() {
        return new ShiftSettings(DEFAULT_ALPHA, DEFAULT_MINIMUM_SHIFT_MM, DEFAULT_MINIMUM_VOLUME_SHIFT_PERCENT,
                DEFAULT_ADJUDICATION_DICE, DEFAULT_ADJUDICATION_HD95_MM, DEFAULT_ADJUDICATION_SHARE,
                DEFAULT_RECALIBRATION_TOLERANCE_MM, DEFAULT_RECALIBRATION_VOLUME_PERCENT, DEFAULT_PERMUTATIONS,
                DEFAULT_EXACT_LIMIT, DEFAULT_BOOTSTRAP_RESAMPLES, DEFAULT_VARIANCE_RESAMPLES,
                DEFAULT_CENTRE_TEST_RESAMPLES, DEFAULT_SEED);
    }

    /** A copy with another seed. */
    public ShiftSettings withSeed(long newSeed) {
        return new ShiftSettings(alpha, minimumShiftMm, minimumVolumeShiftPercent, adjudicationDice,
                adjudicationHd95Mm, adjudicationShare, recalibrationToleranceMm, recalibrationVolumePercent,
                permutations, exactLimit, bootstrapResamples, varianceResamples, centreTestResamples, newSeed);
    }

    /** A copy with other resampling sizes (tests and quick runs). */
    public ShiftSettings withResampling(int newPermutations, int newBootstrapResamples, int newVarianceResamples,
            int newCentreTestResamples) {
        return new ShiftSettings(alpha, minimumShiftMm, minimumVolumeShiftPercent, adjudicationDice,
                adjudicationHd95Mm, adjudicationShare, recalibrationToleranceMm, recalibrationVolumePercent,
                newPermutations, exactLimit, newBootstrapResamples, newVarianceResamples, newCentreTestResamples,
                seed);
    }

    private static void requireNonNegative(String name, double value) {
        if (!(value >= 0) || Double.isInfinite(value)) {
            throw new IllegalArgumentException(name + " must be a finite non-negative number: " + value);
        }
    }
}
