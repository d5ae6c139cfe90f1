package org.accordia.shift;

/**
 * The systematic effect of one centre (or one reader) against the others' consensus, with 95 %
 * case-bootstrap percentile intervals (see {@link EffectEstimator}).
 *
 * @param group               centre name, or reader id
 * @param centre              the centre (equal to {@code group} for a centre)
 * @param readers             readers contributing
 * @param cases               cases contributing
 * @param signedSurfaceMm     mean signed surface distance, mm (positive = outside)
 * @param signedSurfaceLoMm   2.5 % bootstrap percentile, mm
 * @param signedSurfaceHiMm   97.5 % bootstrap percentile, mm
 * @param volumeRatio         geometric-mean volume ratio (1 = same volume)
 * @param volumeRatioLo       2.5 % bootstrap percentile
 * @param volumeRatioHi       97.5 % bootstrap percentile
 */
public record GroupEffect(
        String group,
        String centre,
        int readers,
        int cases,
        double signedSurfaceMm,
        double signedSurfaceLoMm,
        double signedSurfaceHiMm,
        double volumeRatio,
        double volumeRatioLo,
        double volumeRatioHi) {

    /** Whether the signed-surface interval lies entirely beyond ±minimum on one side. */
    public boolean surfaceBeyond(double minimumMm) {
        return signedSurfaceLoMm > minimumMm || signedSurfaceHiMm < -minimumMm;
    }

    /** Whether the volume-ratio interval lies entirely beyond 1 ± minimum %. */
    public boolean volumeBeyond(double minimumPercent) {
        double m = minimumPercent / 100;
        return volumeRatioLo > 1 + m || volumeRatioHi < 1 - m;
    }

    /** Whether the signed-surface interval excludes 0. */
    public boolean surfaceExcludesZero() {
        return signedSurfaceLoMm > 0 || signedSurfaceHiMm < 0;
    }

    /** Whether the volume-ratio interval excludes 1. */
    public boolean volumeExcludesOne() {
        return volumeRatioLo > 1 || volumeRatioHi < 1;
    }

    /**
     * Whether the effect is detectably non-zero but of uncertain size: the signed-surface interval
     * excludes 0 and reaches past ±minimum without lying entirely beyond it, or the same for the
     * volume ratio around 1 and 1 ± minimum %. An interval entirely between 0 and the minimum
     * (a real but negligible shift) is not uncertain.
     */
    public boolean crossesMinimum(double minimumMm, double minimumPercent) {
        double m = minimumPercent / 100;
        boolean surface = surfaceExcludesZero() && !surfaceBeyond(minimumMm)
                && (signedSurfaceHiMm > minimumMm || signedSurfaceLoMm < -minimumMm);
        boolean volume = volumeExcludesOne() && !volumeBeyond(minimumPercent)
                && (volumeRatioHi > 1 + m || volumeRatioLo < 1 - m);
        return surface || volume;
    }

    /** Whether a point estimate exceeds a minimum effect. */
    public boolean pointBeyond(double minimumMm, double minimumPercent) {
        return Math.abs(signedSurfaceMm) > minimumMm || Math.abs(volumeRatio - 1) * 100 > minimumPercent;
    }

    /**
     * The effect in words, for example "draws 1.4 mm [1.1, 1.7] outside the other centres; volumes
     * 18% [12%, 25%] larger than the other centres".
     *
     * @param others how the comparison is named ("the other centres", "the other readers")
     */
    public String describe(String others) {
        return describe(others, Double.NaN, Double.NaN);
    }

    /**
     * As {@link #describe(String)}, with every number written with enough decimals to stand on the
     * same side of 0 and of ±{@code minimumMm} (or 1 ± {@code minimumPercent} %) as its true value,
     * so a sentence that says an interval lies beyond the minimum shows it ("[1.004, 1.6]", not
     * "[1.0, 1.6]"). NaN minimums: compared with 0 only.
     */
    public String describe(String others, double minimumMm, double minimumPercent) {
        StringBuilder s = new StringBuilder();
        if (Double.isFinite(signedSurfaceMm)) {
            String side = signedSurfaceMm >= 0 ? "outside" : "inside";
            boolean flip = signedSurfaceMm < 0;
            double[] t = Double.isNaN(minimumMm) ? new double[] {0} : new double[] {0, minimumMm};
            s.append("draws ").append(Wording.beside(Math.abs(signedSurfaceMm), 1, t)).append(" mm ")
                    .append(interval(signedSurfaceLoMm, signedSurfaceHiMm, flip, "", 1, t))
                    .append(' ').append(side).append(' ').append(others);
        }
        if (Double.isFinite(volumeRatio)) {
            if (s.length() > 0) {
                s.append("; ");
            }
            double pct = (volumeRatio - 1) * 100;
            String word = pct >= 0 ? "larger" : "smaller";
            double lo = (volumeRatioLo - 1) * 100;
            double hi = (volumeRatioHi - 1) * 100;
            double[] t = Double.isNaN(minimumPercent) ? new double[] {0} : new double[] {0, minimumPercent};
            s.append("volumes ").append(Wording.beside(Math.abs(pct), 0, t)).append("% ")
                    .append(interval(lo, hi, pct < 0, "%", 0, t)).append(' ').append(word).append(" than ")
                    .append(others);
        }
        return s.length() == 0 ? "no usable measurements" : s.toString();
    }

    /**
     * The interval in the direction of the point estimate: as is for a positive estimate, negated
     * and swapped for a negative one, so "inside [0.9, 1.6]" reads in the same direction as the
     * estimate and an interval that crosses 0 shows a negative bound.
     */
    private static String interval(double a, double b, boolean flip, String unit, int decimals, double[] thresholds) {
        if (!Double.isFinite(a) || !Double.isFinite(b)) {
            return "[interval not available]";
        }
        double lo = flip ? -b : a;
        double hi = flip ? -a : b;
        return "[" + Wording.beside(lo, decimals, thresholds) + unit + ", " + Wording.beside(hi, decimals, thresholds)
                + unit + "]";
    }
}
