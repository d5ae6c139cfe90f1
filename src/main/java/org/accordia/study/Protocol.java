package org.accordia.study;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import java.util.SortedSet;
import org.accordia.io.InputException;
import org.accordia.io.ReadLimits;

/**
 * The analysis settings of a study, read from a YAML protocol file by {@link ProtocolLoader} or
 * taken from {@link #defaults()}. Every key, type, default and meaning is documented in
 * docs/protocol.md. Immutable.
 *
 * @param study optional display name of the study, or {@code null}
 * @param structures the structures to analyse; empty means one structure per label value present
 *     ({@link #structuresFor(SortedSet)})
 * @param geometryToleranceMm how far spacing and affine entries of one case's volumes may differ
 * @param maxVoxels the largest voxel count a single volume may declare
 * @param seed the seed every random generator derives from
 * @param agreement pairwise agreement settings
 * @param consensus consensus (STAPLE) settings
 * @param shift annotation-shift test settings
 * @param review decision thresholds
 */
public record Protocol(String study, List<Structure> structures, double geometryToleranceMm, long maxVoxels,
                       long seed, Agreement agreement, Consensus consensus, Shift shift, Review review) {

    // The one set of defaults (docs/protocol.md); the step settings (e.g. shift.ShiftSettings) refer to these.
    public static final double DEFAULT_GEOMETRY_TOLERANCE_MM = 0.001;
    /** The default seed of every random generator, for the command line and the library alike. */
    public static final long DEFAULT_SEED = 20261202L;
    public static final int DEFAULT_BOOTSTRAP_RESAMPLES = 2000;
    public static final double DEFAULT_ALPHA = 0.05;
    public static final int DEFAULT_PERMUTATIONS = 9999;
    public static final double DEFAULT_MINIMUM_SHIFT_MM = 1.0;
    public static final double DEFAULT_MINIMUM_VOLUME_SHIFT_PERCENT = 15;
    public static final double DEFAULT_ADJUDICATION_DICE = 0.70;
    public static final double DEFAULT_ADJUDICATION_HD95_MM = 10.0;
    public static final double DEFAULT_RECALIBRATION_TOLERANCE_MM = 1.0;
    public static final double DEFAULT_RECALIBRATION_VOLUME_PERCENT = 20;
    public static final double DEFAULT_ADJUDICATION_SHARE = 0.20;

    /** How HD95 is summarised from the two directed distance sets. */
    public enum Hd95Mode {
        /** The larger of the two directed 95th percentiles (default). */
        PER_DIRECTION("per_direction"),
        /** The 95th percentile of both directed sets pooled; labelled "pooled" wherever reported. */
        POOLED("pooled");

        private final String key;

        Hd95Mode(String key) {
            this.key = key;
        }

        public String key() {
            return key;
        }
    }

    /** Where the STAPLE estimate is computed. */
    public enum ConsensusRegion {
        /** Every voxel of the grid. */
        GRID("grid"),
        /** The union of all readers' structure grown by the structure's tolerance (default). */
        UNION_MARGIN("union_margin");

        private final String key;

        ConsensusRegion(String key) {
            this.key = key;
        }

        public String key() {
            return key;
        }
    }

    /** The per-case distance between two readers used by the shift test. */
    public enum ShiftDistance {
        ONE_MINUS_JACCARD("one_minus_jaccard"),
        HD95("hd95"),
        ONE_MINUS_NSD("one_minus_nsd");

        private final String key;

        ShiftDistance(String key) {
            this.key = key;
        }

        public String key() {
            return key;
        }
    }

    /** @param hd95 how HD95 is summarised (default per_direction) */
    public record Agreement(Hd95Mode hd95) {
        public Agreement {
            Objects.requireNonNull(hd95, "hd95");
        }
    }

    /**
     * @param region where STAPLE runs (default grid)
     * @param bootstrapResamples bootstrap resamples for intervals of reader performance (default
     *     2000, at least 100)
     */
    public record Consensus(ConsensusRegion region, int bootstrapResamples) {
        public Consensus {
            Objects.requireNonNull(region, "region");
            if (bootstrapResamples < 100) {
                throw new IllegalArgumentException("bootstrap_resamples must be at least 100");
            }
        }
    }

    /**
     * @param distance the reader-to-reader distance tested (default one_minus_jaccard)
     * @param alpha significance level, in (0, 1) (default 0.05)
     * @param permutations Monte Carlo permutations when exact enumeration is too large (default
     *     9999, at least 99)
     * @param minimumShiftMm smallest between-centre margin shift that matters, in mm (default 1.0)
     * @param minimumVolumeShiftPercent smallest between-centre volume shift that matters, in
     *     percent (default 15)
     */
    public record Shift(ShiftDistance distance, double alpha, int permutations, double minimumShiftMm,
                        double minimumVolumeShiftPercent) {
        public Shift {
            Objects.requireNonNull(distance, "distance");
            if (!(alpha > 0 && alpha < 1)) {
                throw new IllegalArgumentException("alpha must lie in (0, 1)");
            }
            if (permutations < 99) {
                throw new IllegalArgumentException("permutations must be at least 99");
            }
            if (!(minimumShiftMm >= 0) || Double.isInfinite(minimumShiftMm)) {
                throw new IllegalArgumentException("minimum_shift_mm must be at least 0");
            }
            if (!(minimumVolumeShiftPercent >= 0) || Double.isInfinite(minimumVolumeShiftPercent)) {
                throw new IllegalArgumentException("minimum_volume_shift_percent must be at least 0");
            }
        }
    }

    /**
     * @param adjudicationDice a case whose median pairwise Dice is below this is adjudicated (default
     *     0.70, in [0, 1])
     * @param adjudicationHd95Mm a case where any pair's HD95 exceeds this is adjudicated (default 10)
     * @param recalibrationToleranceMm a reader whose margin departs from the consensus by more than
     *     this is proposed for recalibration (default 1.0)
     * @param recalibrationVolumePercent ... or whose volume departs by more than this percent
     *     (default 20)
     * @param adjudicationShareForReview share of cases to adjudicate at or above which a structure's
     *     verdict is at least "review" (default 0.20, in (0, 1])
     */
    public record Review(double adjudicationDice, double adjudicationHd95Mm, double recalibrationToleranceMm,
                         double recalibrationVolumePercent, double adjudicationShareForReview) {
        public Review {
            if (!(adjudicationDice >= 0 && adjudicationDice <= 1)) {
                throw new IllegalArgumentException("adjudication_dice must lie in [0, 1]");
            }
            positive(adjudicationHd95Mm, "adjudication_hd95_mm");
            positive(recalibrationToleranceMm, "recalibration_tolerance_mm");
            positive(recalibrationVolumePercent, "recalibration_volume_percent");
            if (!(adjudicationShareForReview > 0 && adjudicationShareForReview <= 1)) {
                throw new IllegalArgumentException("adjudication_share_for_review must lie in (0, 1]");
            }
        }
    }

    public Protocol {
        structures = List.copyOf(structures);
        Set<String> names = new HashSet<>();
        for (Structure s : structures) {
            if (!names.add(s.name())) {
                throw new IllegalArgumentException("structure name '" + s.name() + "' is used twice");
            }
        }
        positive(geometryToleranceMm, "geometry_tolerance_mm");
        if (maxVoxels < 1 || maxVoxels > ReadLimits.ARRAY_LIMIT) {
            throw new IllegalArgumentException("max_voxels must lie in [1, " + ReadLimits.ARRAY_LIMIT + "]");
        }
        Objects.requireNonNull(agreement, "agreement");
        Objects.requireNonNull(consensus, "consensus");
        Objects.requireNonNull(shift, "shift");
        Objects.requireNonNull(review, "review");
    }

    private static void positive(double v, String key) {
        if (!(v > 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException(key + " must be positive");
        }
    }

    /** Every default, as documented in docs/protocol.md. */
    public static Protocol defaults() {
        return new Protocol(null, List.of(), DEFAULT_GEOMETRY_TOLERANCE_MM, ReadLimits.ARRAY_LIMIT, DEFAULT_SEED,
            new Agreement(Hd95Mode.PER_DIRECTION),
            new Consensus(ConsensusRegion.UNION_MARGIN, DEFAULT_BOOTSTRAP_RESAMPLES),
            new Shift(ShiftDistance.ONE_MINUS_JACCARD, DEFAULT_ALPHA, DEFAULT_PERMUTATIONS, DEFAULT_MINIMUM_SHIFT_MM,
                DEFAULT_MINIMUM_VOLUME_SHIFT_PERCENT),
            new Review(DEFAULT_ADJUDICATION_DICE, DEFAULT_ADJUDICATION_HD95_MM, DEFAULT_RECALIBRATION_TOLERANCE_MM,
                DEFAULT_RECALIBRATION_VOLUME_PERCENT, DEFAULT_ADJUDICATION_SHARE));
    }

    /** Reads a protocol file (see {@link ProtocolLoader}). */
    public static Protocol load(Path file) throws InputException {
        return ProtocolLoader.load(file);
    }

    /** True when the protocol names its structures (otherwise one per label present). */
    public boolean hasExplicitStructures() {
        return !structures.isEmpty();
    }

    /**
     * The structures to analyse for the label values present in a study: the protocol's own, or,
     * when it names none, one structure per label value present (named "label_&lt;v&gt;").
     */
    public List<Structure> structuresFor(SortedSet<Integer> labelsPresent) {
        if (!structures.isEmpty()) {
            return structures;
        }
        List<Structure> out = new ArrayList<>();
        for (int v : labelsPresent) {
            if (v >= 1) {
                out.add(Structure.ofLabel(v));
            }
        }
        return out;
    }

    public Protocol withSeed(long newSeed) {
        return new Protocol(study, structures, geometryToleranceMm, maxVoxels, newSeed, agreement, consensus, shift, review);
    }

    public Protocol withMaxVoxels(long newMax) {
        return new Protocol(study, structures, geometryToleranceMm, newMax, seed, agreement, consensus, shift, review);
    }

    /** The reading limits this protocol implies. */
    public ReadLimits readLimits(boolean allowPathEscape) {
        return new ReadLimits(maxVoxels, allowPathEscape);
    }
}
