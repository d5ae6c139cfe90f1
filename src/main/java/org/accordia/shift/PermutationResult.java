package org.accordia.shift;

/**
 * Result of the reader-level permutation test of the pooled pseudo-F.
 *
 * @param pseudoF        observed pooled pseudo-F
 * @param pValue         exact: share of distinct reader partitions with F* ≥ F (observed counted);
 *                       Monte Carlo: (1 + #{F* ≥ F})/(1 + m); NaN when the test is not applicable
 * @param permutations   distinct partitions enumerated (exact) or random permutations drawn
 * @param exact          whether all distinct partitions were enumerated
 * @param minP           the smallest p-value this design can produce
 * @param canReachAlpha  whether minP ≤ α
 * @param statement      a plain sentence on what the design can show (empty when nothing to say)
 */
public record PermutationResult(
        double pseudoF,
        double pValue,
        long permutations,
        boolean exact,
        double minP,
        boolean canReachAlpha,
        String statement) {
}
