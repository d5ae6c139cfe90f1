package org.accordia.shift;

import java.util.List;

/**
 * The within/between-centre partition of squared reader distances, pooled over cases (each case a
 * stratum), with AMOVA variance components.
 *
 * @param ssBetween          pooled between-centre sum of squares
 * @param ssWithin           pooled within-centre sum of squares
 * @param ssTotal            pooled total sum of squares
 * @param dfBetween          Σ over cases of (G_c − 1)
 * @param dfWithin           Σ over cases of (N_c − G_c)
 * @param pseudoF            (ssBetween/dfBetween)/(ssWithin/dfWithin); NaN when undefined
 * @param n0                 pooled unbalanced-group coefficient (df-weighted mean of the per-case n0)
 * @param sigma2Between      raw (untruncated, may be negative) between-centre component
 * @param sigma2Within       within-centre component (= MS_within)
 * @param betweenShare       Φ = max(0, σ²_between)/(max(0, σ²_between) + σ²_within); NaN when both are 0
 * @param casesUsed          cases that contributed at least one reader pair
 * @param readers            readers that appear in at least one used case (sorted)
 * @param notes              what was dropped and why, in words
 */
public record PartitionResult(
        double ssBetween,
        double ssWithin,
        double ssTotal,
        int dfBetween,
        int dfWithin,
        double pseudoF,
        double n0,
        double sigma2Between,
        double sigma2Within,
        double betweenShare,
        int casesUsed,
        List<String> readers,
        List<String> notes) {

    public PartitionResult {
        readers = List.copyOf(readers);
        notes = List.copyOf(notes);
    }

    public double msBetween() {
        return dfBetween > 0 ? ssBetween / dfBetween : Double.NaN;
    }

    public double msWithin() {
        return dfWithin > 0 ? ssWithin / dfWithin : Double.NaN;
    }
}
