package org.accordia.consensus;

import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;
import java.util.TreeSet;
import org.accordia.agreement.PatternHistogram;
import org.accordia.io.LabelVolume;

/**
 * The reference consensuses of one case and structure, and every reader's performance against
 * them, all from the decision-pattern histogram (no voxel pass):
 * <ul>
 *   <li>{@code all}: STAPLE of all readers; the reader's sensitivity and specificity are STAPLE's
 *       own p_j and q_j; Dice and volume ratio against its thresholded consensus (W ≥ 0.5).</li>
 *   <li>{@code others}: STAPLE of every reader but j (histogram restricted to them), thresholded
 *       at W ≥ 0.5; reader j's sensitivity, specificity, Dice and volume ratio against it are
 *       counted over the FULL histogram, since the consensus is a function of the other readers'
 *       bits. Needs at least two readers.</li>
 *   <li>{@code other_centres}: STAPLE of the readers of every centre but reader j's own; one run
 *       per centre. Not produced for a reader whose centre is the only one.</li>
 * </ul>
 * Cost: 1 + R + (number of centres with readers elsewhere) STAPLE runs, each on at most 2^R'
 * distinct patterns. Sensitivity = TP/(TP+FN), specificity = TN/(TN+FP) within the histogram's
 * region, Dice = 2TP/(2TP+FP+FN), volume ratio = reader volume / thresholded consensus volume.
 *
 * @param caseId case identifier
 * @param label structure name
 * @param readers reader names, in histogram bit order
 * @param centres centre of each reader, aligned with {@code readers}
 * @param histogram the full decision-pattern histogram
 * @param voxelVolumeMl volume of one voxel in ml
 * @param all STAPLE of all readers
 * @param others STAPLE of all but reader j, per reader (null entries when only one reader)
 * @param otherCentres per centre c, STAPLE of the readers outside c (absent when none)
 */
public record CaseReferences(String caseId, String label, List<String> readers, List<String> centres,
        PatternHistogram histogram, double voxelVolumeMl, StapleResult all, List<StapleResult> others,
        TreeMap<String, StapleResult> otherCentres) {

    public CaseReferences {
        readers = List.copyOf(readers);
        centres = List.copyOf(centres);
        others = java.util.Collections.unmodifiableList(new ArrayList<>(others));
        otherCentres = new TreeMap<>(otherCentres);
    }

    @Override
    public TreeMap<String, StapleResult> otherCentres() {
        return new TreeMap<>(otherCentres);
    }

    /** Runs the 1 + R + C STAPLE fits. */
    public static CaseReferences compute(String caseId, String label, List<String> readers, List<String> centres,
            PatternHistogram histogram, double voxelVolumeMl, StapleOptions options) {
        int r = histogram.readers();
        if (readers.size() != r || centres.size() != r) {
            throw new IllegalArgumentException("one reader name and centre per histogram bit expected");
        }
        StapleResult all = BinaryStaple.run(histogram, options);
        List<StapleResult> others = new ArrayList<>();
        long full = r == 64 ? -1L : (1L << r) - 1;
        for (int j = 0; j < r; j++) {
            others.add(r < 2 ? null : BinaryStaple.run(histogram.restrictTo(full & ~(1L << j)), options));
        }
        TreeMap<String, StapleResult> oc = new TreeMap<>();
        for (String c : new TreeSet<>(centres)) {
            long keep = full & ~centreMask(centres, c);
            if (keep != 0) {
                oc.put(c, BinaryStaple.run(histogram.restrictTo(keep), options));
            }
        }
        return new CaseReferences(caseId, label, readers, centres, histogram, voxelVolumeMl, all, others, oc);
    }

    /** Bits of the readers of centre {@code c}. */
    static long centreMask(List<String> centres, String c) {
        long m = 0;
        for (int j = 0; j < centres.size(); j++) {
            if (centres.get(j).equals(c)) {
                m |= 1L << j;
            }
        }
        return m;
    }

    long fullMask() {
        return (1L << histogram.readers()) - 1;
    }

    /** Readers (bits) behind the reference of the given kind for reader j; 0 when there is none. */
    public long keepMask(String reference, int j) {
        return switch (reference) {
            case ReaderPerformance.REFERENCE_ALL -> fullMask();
            case ReaderPerformance.REFERENCE_OTHERS -> histogram.readers() < 2 ? 0 : fullMask() & ~(1L << j);
            case ReaderPerformance.REFERENCE_OTHER_CENTRES -> fullMask() & ~centreMask(centres, centres.get(j));
            default -> throw new IllegalArgumentException("unknown reference " + reference);
        };
    }

    /** The STAPLE result behind the reference of the given kind for reader j, or null. */
    public StapleResult staple(String reference, int j) {
        return switch (reference) {
            case ReaderPerformance.REFERENCE_ALL -> all;
            case ReaderPerformance.REFERENCE_OTHERS -> others.get(j);
            case ReaderPerformance.REFERENCE_OTHER_CENTRES -> otherCentres.get(centres.get(j));
            default -> throw new IllegalArgumentException("unknown reference " + reference);
        };
    }

    /** References in row order. */
    static final List<String> KINDS = List.of(ReaderPerformance.REFERENCE_ALL, ReaderPerformance.REFERENCE_OTHERS,
        ReaderPerformance.REFERENCE_OTHER_CENTRES);

    /**
     * One row per reader and available reference (order: reference all, others, other_centres;
     * readers in bit order within each), signed surface distance NaN (see
     * {@link #rowsWithSurfaces}).
     */
    public List<ReaderPerformance> rows() {
        List<ReaderPerformance> out = new ArrayList<>();
        for (String kind : KINDS) {
            for (int j = 0; j < readers.size(); j++) {
                StapleResult s = staple(kind, j);
                if (s != null) {
                    out.add(row(kind, j, s, keepMask(kind, j)));
                }
            }
        }
        return out;
    }

    private ReaderPerformance row(String kind, int j, StapleResult s, long keep) {
        ConsensusLookup look = new ConsensusLookup(s, keep, histogram.readers());
        long tp = 0;
        long fp = 0;
        long fn = 0;
        long tn = 0;
        for (int i = 0; i < histogram.size(); i++) {
            long p = histogram.pattern(i);
            long n = histogram.count(i);
            boolean c = look.inConsensus(p);
            boolean rd = (p >>> j & 1L) != 0;
            if (rd && c) {
                tp += n;
            } else if (rd) {
                fp += n;
            } else if (c) {
                fn += n;
            } else {
                tn += n;
            }
        }
        double sens;
        double spec;
        if (kind.equals(ReaderPerformance.REFERENCE_ALL)) {
            sens = s.sensitivity(j);
            spec = s.specificity(j);
        } else {
            sens = tp + fn == 0 ? Double.NaN : (double) tp / (tp + fn);
            spec = tn + fp == 0 ? Double.NaN : (double) tn / (tn + fp);
        }
        double dice = 2 * tp + fp + fn == 0 ? Double.NaN : 2.0 * tp / (2 * tp + fp + fn);
        long vol = tp + fp;
        long cons = tp + fn;
        double ratio = cons == 0 ? (vol == 0 ? Double.NaN : Double.POSITIVE_INFINITY) : (double) vol / cons;
        return new ReaderPerformance(caseId, label, readers.get(j), centres.get(j), sens, spec, dice,
            vol * voxelVolumeMl, ratio, Double.NaN, kind);
    }

    /** A consensus mask compared by content. */
    private record MaskKey(boolean[] mask, int hash) {
        MaskKey(boolean[] mask) {
            this(mask, java.util.Arrays.hashCode(mask));
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof MaskKey k && k.hash == hash && java.util.Arrays.equals(k.mask, mask);
        }

        @Override
        public int hashCode() {
            return hash;
        }
    }

    /**
     * {@link #rows()} with the mean signed surface distance of each reader to each reference
     * consensus filled in (see {@link SignedSurface}); one voxel pass over the union box of the
     * readers' masks grown by one voxel, one distance transform per distinct consensus mask (references
     * whose masks coincide share it).
     *
     * @param masks the readers' label volumes, in histogram bit order, on one grid
     * @param structureLabels the label values that make up this structure
     */
    public List<ReaderPerformance> rowsWithSurfaces(List<LabelVolume> masks, int[] structureLabels) {
        return rowsWithSurfaces(masks, structureLabels, null);
    }

    /**
     * {@link #rowsWithSurfaces(List, int[])} with the union box already known.
     *
     * @param unionBox bounding box of the voxels any reader marks as the structure (as
     *     {@code CaseAgreement.unionBox()}; any box containing them gives the same rows), or null to
     *     compute it
     */
    public List<ReaderPerformance> rowsWithSurfaces(List<LabelVolume> masks, int[] structureLabels,
            org.accordia.grid.Box unionBox) {
        return rowsWithSurfaces(masks, structureLabels, unionBox, Double.NaN);
    }

    /**
     * {@link #rowsWithSurfaces(List, int[], org.accordia.grid.Box)} with each row's
     * {@link BorderProfile} at the structure's tolerance (same distance transforms); no profile
     * when {@code toleranceMm} is NaN.
     */
    public List<ReaderPerformance> rowsWithSurfaces(List<LabelVolume> masks, int[] structureLabels,
            org.accordia.grid.Box unionBox, double toleranceMm) {
        boolean profile = !Double.isNaN(toleranceMm);
        if (masks.size() != readers.size()) {
            throw new IllegalArgumentException("one mask per reader expected");
        }
        List<ReaderPerformance> base = rows();
        // group rows by the set of readers behind their reference: one consensus and one distance
        // transform per distinct set
        java.util.LinkedHashMap<Long, List<Integer>> byKeep = new java.util.LinkedHashMap<>();
        java.util.Map<Long, StapleResult> stapleOf = new java.util.HashMap<>();
        List<Integer> readerOfRow = new ArrayList<>();
        boolean fullGrid = false;
        int k = 0;
        for (String kind : KINDS) {
            for (int j = 0; j < readers.size(); j++) {
                StapleResult s = staple(kind, j);
                if (s == null) {
                    continue;
                }
                long keep = keepMask(kind, j);
                byKeep.computeIfAbsent(keep, x -> new ArrayList<>()).add(k++);
                stapleOf.put(keep, s);
                readerOfRow.add(j);
                fullGrid |= s.weightOfPattern(0) >= StapleResult.CONSENSUS_THRESHOLD;
            }
        }
        SignedSurface.Prepared prep = SignedSurface.prepare(masks, structureLabels, fullGrid, unionBox);
        // reader sets whose consensus masks are identical share one border and one distance
        // transform (about a quarter of the 13 per structure in the benchmark study): rows grouped by mask
        java.util.LinkedHashMap<MaskKey, List<Integer>> byMask = new java.util.LinkedHashMap<>();
        for (var e : byKeep.entrySet()) {
            MaskKey key = new MaskKey(prep.consensus(stapleOf.get(e.getKey()), e.getKey()));
            byMask.computeIfAbsent(key, x -> new ArrayList<>()).addAll(e.getValue());
        }
        double[] mm = new double[base.size()];
        BorderProfile[] profiles = new BorderProfile[base.size()];
        double[] offset = new double[base.size()];
        java.util.Arrays.fill(offset, Double.NaN);
        for (var e : byMask.entrySet()) {
            List<Integer> rowsOf = e.getValue();
            int[] idx = new int[rowsOf.size()];
            for (int t = 0; t < idx.length; t++) {
                idx[t] = readerOfRow.get(rowsOf.get(t));
            }
            BorderProfile[] got = profile ? new BorderProfile[idx.length] : null;
            double[] v = prep.meanSignedMm(e.getKey().mask(), idx, toleranceMm, got);
            for (int t = 0; t < idx.length; t++) {
                mm[rowsOf.get(t)] = v[t];
                if (got != null) {
                    profiles[rowsOf.get(t)] = got[t];
                }
            }
            // the all-reader reference: also the reverse direction, for the antisymmetric border offset
            List<Integer> allRows = new ArrayList<>();
            for (int row : rowsOf) {
                if (base.get(row).reference().equals(ReaderPerformance.REFERENCE_ALL)) {
                    allRows.add(row);
                }
            }
            if (!allRows.isEmpty()) {
                int[] ai = allRows.stream().mapToInt(readerOfRow::get).toArray();
                double[] rev = prep.reverseSignedMm(e.getKey().mask(), ai);
                for (int t = 0; t < ai.length; t++) {
                    offset[allRows.get(t)] = 0.5 * (mm[allRows.get(t)] - rev[t]);
                }
            }
        }
        List<ReaderPerformance> out = new ArrayList<>(base.size());
        for (int t = 0; t < base.size(); t++) {
            out.add(base.get(t).withSurface(mm[t], profiles[t]).withBorderOffsetMm(offset[t]));
        }
        return out;
    }
}
