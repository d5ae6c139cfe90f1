package org.accordia.agreement;

import org.accordia.stats.Quantiles;

/**
 * Surface distances between the borders of two non-empty masks A and B, from the two directed
 * distance sets: {@code dA} = for every border voxel of A, the Euclidean distance in mm from its
 * centre to the nearest border-voxel centre of B; {@code dB} likewise from B to A.
 *
 * <ul>
 *   <li>{@code hdMm}: Hausdorff distance (Huttenlocher, Klanderman &amp; Rucklidge 1993, IEEE
 *       TPAMI 15:850–863), {@code max(max dA, max dB)}.</li>
 *   <li>{@code hd95Mm}: {@code max(P95(dA), P95(dB))}, each directed 95th percentile by linear
 *       interpolation between order statistics (Hyndman &amp; Fan 1996, type 7).</li>
 *   <li>{@code hd95PooledMm}: the POOLED variant, P95 (type 7) of the union of both sets.</li>
 *   <li>{@code assdMm}: average symmetric surface distance (Taha &amp; Hanbury 2015, BMC Medical
 *       Imaging 15:29), {@code (Σ dA + Σ dB) / (|dA| + |dB|)}.</li>
 *   <li>{@code nsd}: normalised surface distance / surface Dice at tolerance τ (Nikolov et al.
 *       2021, J Med Internet Res 23(7):e26151), VOXEL-BORDER variant: {@code (#{dA ≤ τ} +
 *       #{dB ≤ τ}) / (|dA| + |dB|)}, counting border voxels rather than mesh surface area.</li>
 * </ul>
 * All in mm except {@code nsd} (a fraction in [0, 1]). Both sets must be non-empty (a non-empty
 * mask always has a border voxel); empty masks are handled by the caller (NaN, flagged).
 *
 * @param hdMm Hausdorff distance, mm
 * @param hd95Mm larger of the two directed 95th percentiles, mm
 * @param hd95PooledMm pooled 95th percentile, mm
 * @param assdMm average symmetric surface distance, mm
 * @param nsd voxel-border surface Dice at the tolerance
 * @param toleranceMm the tolerance τ used for {@code nsd}, mm
 */
public record SurfaceMetrics(double hdMm, double hd95Mm, double hd95PooledMm, double assdMm, double nsd,
                             double toleranceMm) {

    /** All distances undefined (NaN), as for a pair with an empty mask. */
    public static SurfaceMetrics undefined(double toleranceMm) {
        return new SurfaceMetrics(Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, toleranceMm);
    }

    /**
     * Computes the metrics from SQUARED directed distances in mm² (as sampled from
     * {@link DistanceTransform}); the arrays are not modified.
     *
     * @param d2A squared distances from A's border voxels to B's border, first {@code nA} used
     * @param d2B squared distances from B's border voxels to A's border, first {@code nB} used
     */
    public static SurfaceMetrics fromSquared(double[] d2A, int nA, double[] d2B, int nB, double toleranceMm) {
        if (nA <= 0 || nB <= 0) {
            throw new IllegalArgumentException("both border sets must be non-empty");
        }
        if (!(toleranceMm >= 0)) {
            throw new IllegalArgumentException("tolerance must be non-negative");
        }
        double[] pooled = new double[nA + nB];
        double sum = 0;
        long within = 0;
        double maxA = 0;
        for (int i = 0; i < nA; i++) {
            double d = Math.sqrt(d2A[i]);
            pooled[i] = d;
            sum += d;
            within += d <= toleranceMm ? 1 : 0;
            maxA = Math.max(maxA, d);
        }
        double maxB = 0;
        for (int i = 0; i < nB; i++) {
            double d = Math.sqrt(d2B[i]);
            pooled[nA + i] = d;
            sum += d;
            within += d <= toleranceMm ? 1 : 0;
            maxB = Math.max(maxB, d);
        }
        if (Double.isInfinite(maxA) || Double.isInfinite(maxB)) {
            throw new IllegalArgumentException("a distance is infinite: the other border set is empty");
        }
        int n = nA + nB;
        double[] tmp = new double[Math.max(nA, nB)];
        System.arraycopy(pooled, 0, tmp, 0, nA);
        double p95A = Quantiles.type7InPlace(tmp, nA, 0.95);
        System.arraycopy(pooled, nA, tmp, 0, nB);
        double p95B = Quantiles.type7InPlace(tmp, nB, 0.95);
        double p95Pooled = Quantiles.type7InPlace(pooled, n, 0.95);
        return new SurfaceMetrics(Math.max(maxA, maxB), Math.max(p95A, p95B), p95Pooled, sum / n,
            (double) within / n, toleranceMm);
    }
}
