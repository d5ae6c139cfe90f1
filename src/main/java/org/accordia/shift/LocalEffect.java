package org.accordia.shift;

import java.util.List;

/**
 * How much of one centre's border lies beyond the structure's tolerance from the other centres'
 * consensus, against the typical centre: the measure that sees a part added (or left out) on one
 * side, which the mean signed distance and the volume dilute. See {@link LocalEffects}.
 *
 * @param centre            centre name
 * @param readers           readers contributing
 * @param cases             cases with a border
 * @param toleranceMm       the structure's tolerance τ, mm
 * @param outsideShare      mean over cases of the share of the centre's readers' border more than τ
 *                          outside the other centres' consensus
 * @param outsideExcess     outsideShare minus the typical centre's (the median over centres; with
 *                          two centres, minus the other centre's)
 * @param outsideExcessLo   2.5 % case-bootstrap percentile of outsideExcess
 * @param outsideExcessHi   97.5 % percentile
 * @param insideShare       the same for the border more than τ inside
 * @param insideExcess      insideShare minus the typical centre's
 * @param insideExcessLo    2.5 % percentile
 * @param insideExcessHi    97.5 % percentile
 * @param outsideByDirection share beyond τ outside per direction (+x, −x, +y, −y, +z, −z from the
 *                          consensus centroid; pooled border voxels over readers and cases; NaN
 *                          without border there)
 */
public record LocalEffect(String centre, int readers, int cases, double toleranceMm, double outsideShare,
        double outsideExcess, double outsideExcessLo, double outsideExcessHi, double insideShare, double insideExcess,
        double insideExcessLo, double insideExcessHi, List<Double> outsideByDirection) {
    public LocalEffect {
        outsideByDirection = List.copyOf(outsideByDirection);
    }

    /** Whether the excess interval (outside or inside) lies entirely above {@code minimumShare}. */
    public boolean beyond(double minimumShare) {
        return outsideExcessLo > minimumShare || insideExcessLo > minimumShare;
    }

    /** Whether an excess interval excludes 0 and reaches past {@code minimumShare} without lying beyond it. */
    public boolean crossesMinimum(double minimumShare) {
        return outsideExcessLo > 0 && outsideExcessHi > minimumShare && !(outsideExcessLo > minimumShare)
            || insideExcessLo > 0 && insideExcessHi > minimumShare && !(insideExcessLo > minimumShare);
    }

    /** True when the outside excess is the larger finding (else the inside one). */
    public boolean outsideSide() {
        return !(insideExcess > outsideExcess);
    }

    /** Index (0..5) of the direction with the largest outside share; −1 when none. */
    public int mainDirection() {
        int best = -1;
        for (int d = 0; d < outsideByDirection.size(); d++) {
            double v = outsideByDirection.get(d);
            if (!Double.isNaN(v) && (best < 0 || v > outsideByDirection.get(best))) {
                best = d;
            }
        }
        return best;
    }
}
