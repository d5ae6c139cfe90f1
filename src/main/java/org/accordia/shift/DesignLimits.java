package org.accordia.shift;

import java.math.BigInteger;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.SortedMap;
import java.util.TreeMap;

/**
 * The design limitations of a roster (readers per centre), before any mask is read: a pure
 * function, called by {@code inspect} (to warn before the analysis) and by {@link ShiftAnalysis}
 * (to put the same sentences into the decision).
 *
 * <ul>
 * <li>{@link DesignLimitation#SINGLE_CENTRE}: fewer than two centres with readers.</li>
 * <li>{@link DesignLimitation#CANNOT_REACH_ALPHA}: with N readers in centres of sizes n_g the
 * permutation test has N!/(Π n_g! Π m_s!) distinct partitions (m_s = centres of size s; see
 * {@link PermutationTest#distinctPartitions}); its smallest p is one over that number when it is
 * enumerated, 1/(m + 1) with m Monte Carlo permutations otherwise. Above α the test cannot be
 * significant: two centres of three readers give 10 partitions, p ≥ 0.1; three centres of two
 * give 15, p ≥ 0.067.</li>
 * <li>{@link DesignLimitation#TWO_CENTRES}: exactly two centres.</li>
 * <li>{@link DesignLimitation#ONE_READER_CENTRE}: a centre with one reader (listed by name).</li>
 * </ul>
 */
public final class DesignLimits {
    private DesignLimits() {
    }

    /**
     * @param readersPerCentre centre → number of readers (centres with 0 readers are ignored)
     * @param alpha            the test's level
     * @param exactLimit       enumerate when the distinct partitions are at most this
     * @param permutations     Monte Carlo permutations otherwise
     * @return the limitations, in {@link DesignLimitation} order
     */
    public static List<DesignLimit> of(Map<String, Integer> readersPerCentre, double alpha, long exactLimit,
            int permutations) {
        SortedMap<String, Integer> roster = new TreeMap<>();
        readersPerCentre.forEach((c, n) -> {
            if (n != null && n > 0) {
                roster.put(c, n);
            }
        });
        List<String> centres = List.copyOf(roster.keySet());
        List<DesignLimit> out = new ArrayList<>();
        if (roster.size() < 2) {
            out.add(new DesignLimit(DesignLimitation.SINGLE_CENTRE, centres, 0, null));
            return out;
        }
        int[] sizes = roster.values().stream().mapToInt(Integer::intValue).toArray();
        BigInteger partitions = PermutationTest.distinctPartitions(sizes);
        boolean exact = partitions.compareTo(BigInteger.valueOf(exactLimit)) <= 0;
        long count = exact ? partitions.longValueExact() : permutations + 1L;
        double minP = 1.0 / count;
        if (minP > alpha) {
            out.add(new DesignLimit(DesignLimitation.CANNOT_REACH_ALPHA, centres, count, minP));
        }
        if (roster.size() == 2) {
            out.add(new DesignLimit(DesignLimitation.TWO_CENTRES, centres, count, minP));
        }
        List<String> single = roster.entrySet().stream().filter(e -> e.getValue() == 1).map(Map.Entry::getKey).toList();
        if (!single.isEmpty()) {
            out.add(new DesignLimit(DesignLimitation.ONE_READER_CENTRE, single, count, minP));
        }
        return out;
    }

    /** Readers per centre from a reader → centre map. */
    public static SortedMap<String, Integer> roster(Map<String, String> readerCentre) {
        SortedMap<String, Integer> out = new TreeMap<>();
        readerCentre.values().forEach(c -> out.merge(c, 1, Integer::sum));
        return out;
    }
}
