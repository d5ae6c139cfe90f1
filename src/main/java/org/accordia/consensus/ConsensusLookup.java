package org.accordia.consensus;

import java.util.HashMap;
import java.util.Map;
import org.accordia.agreement.PatternHistogram;

/**
 * Maps a FULL decision pattern (bit j = reader j among all readers) to the thresholded STAPLE
 * consensus (W ≥ 0.5) of a subset of readers: the pattern is compressed to the subset's bits and
 * looked up in the subset's STAPLE result. Memoised (dense table up to 16 readers).
 */
final class ConsensusLookup {
    private final StapleResult result;
    private final long keep;
    private final byte[] dense; // 0 unknown, 1 background, 2 consensus
    private final Map<Long, Boolean> memo;

    ConsensusLookup(StapleResult result, long keep, int allReaders) {
        if (Long.bitCount(keep) != result.readers()) {
            throw new IllegalArgumentException("keep mask and STAPLE result disagree on the number of readers");
        }
        this.result = result;
        this.keep = keep;
        this.dense = allReaders <= 16 ? new byte[1 << allReaders] : null;
        this.memo = dense == null ? new HashMap<>() : null;
    }

    boolean inConsensus(long fullPattern) {
        if (dense != null) {
            int k = (int) fullPattern;
            if (dense[k] == 0) {
                dense[k] = (byte) (result.patternInConsensus(PatternHistogram.compress(fullPattern, keep)) ? 2 : 1);
            }
            return dense[k] == 2;
        }
        return memo.computeIfAbsent(fullPattern, p -> result.patternInConsensus(PatternHistogram.compress(p, keep)));
    }

    double weight(long fullPattern) {
        return result.weightOfPattern(PatternHistogram.compress(fullPattern, keep));
    }
}
