package org.accordia.analysis;

import java.util.Objects;
import org.accordia.consensus.StapleOptions;
import org.accordia.shift.ShiftSettings;
import org.accordia.study.Protocol;

/**
 * The settings of every step of an analysis, resolved once from the protocol
 * ({@link #from(Protocol)}) with the protocol's one set of defaults (docs/protocol.md). The
 * pipeline reads only these; the report reads only these and the result, so what a run did and
 * what its report says come from one place.
 *
 * @param seed the seed every random generator derives from (protocol {@code seed} or {@code --seed})
 * @param read how volumes are read
 * @param agreement the pairwise agreement step
 * @param consensus the consensus step (STAPLE, reader summaries)
 * @param shift the study-level step (centre shift, variance components, review thresholds)
 */
public record AnalysisSettings(long seed, Read read, Agreement agreement, Consensus consensus, Shift shift) {

    /**
     * Reading.
     *
     * @param geometryToleranceMm protocol {@code geometry_tolerance_mm}
     * @param maxVoxels protocol {@code max_voxels} (or {@code --max-voxels})
     */
    public record Read(double geometryToleranceMm, long maxVoxels) {
    }

    /**
     * Pairwise agreement. The surface tolerance τ is per structure ({@code structures[i].tolerance_mm}).
     *
     * @param hd95 protocol {@code agreement.hd95}: the HD95 variant of every pair
     */
    public record Agreement(Protocol.Hd95Mode hd95) {
        public Agreement {
            Objects.requireNonNull(hd95, "hd95");
        }
    }

    /**
     * Consensus.
     *
     * @param region protocol {@code consensus.region}
     * @param staple the STAPLE options (region in words; convergence tolerance and iteration cap
     *     are the documented defaults of {@link StapleOptions})
     * @param bootstrapResamples protocol {@code consensus.bootstrap_resamples}: reader summaries'
     *     bootstrap (and, through {@link #shift}, the centre and reader effects')
     */
    public record Consensus(Protocol.ConsensusRegion region, StapleOptions staple, int bootstrapResamples) {
    }

    /**
     * The study level.
     *
     * @param distance protocol {@code shift.distance}: the reader-pair distance partitioned
     * @param settings thresholds and resampling sizes of the shift analysis and the review lists
     */
    public record Shift(Protocol.ShiftDistance distance, ShiftSettings settings) {
    }

    /** The STAPLE region in words (reported with every specificity). */
    static String regionWords(Protocol.ConsensusRegion region) {
        return region == Protocol.ConsensusRegion.UNION_MARGIN
            ? "union of all readers' structure grown by the structure's tolerance"
            : StapleOptions.WHOLE_GRID;
    }

    /** Every step's settings from the protocol. */
    public static AnalysisSettings from(Protocol p) {
        return new AnalysisSettings(p.seed(), new Read(p.geometryToleranceMm(), p.maxVoxels()),
            new Agreement(p.agreement().hd95()),
            new Consensus(p.consensus().region(), StapleOptions.defaults().withRegion(regionWords(p.consensus().region())),
                p.consensus().bootstrapResamples()),
            new Shift(p.shift().distance(), shiftSettings(p)));
    }

    /** The same settings with other shift settings (a simulation's fewer resamples); the seed follows them. */
    public AnalysisSettings withShiftSettings(ShiftSettings s) {
        return new AnalysisSettings(s.seed(), read, agreement, consensus, new Shift(shift.distance(), s));
    }

    /**
     * The shift settings a protocol implies. Resampling sizes follow the protocol's
     * {@code consensus.bootstrap_resamples} (B, default 2000): B case-bootstrap resamples for the
     * centre and reader effects, and B/10 (at most the documented defaults 200 and 199) parametric
     * bootstrap resamples for the variance-component intervals and the test of σ²_centre = 0.
     */
    public static ShiftSettings shiftSettings(Protocol p) {
        Protocol.Shift s = p.shift();
        Protocol.Review r = p.review();
        return new ShiftSettings(s.alpha(), s.minimumShiftMm(), s.minimumVolumeShiftPercent(), r.adjudicationDice(),
            r.adjudicationHd95Mm(), r.adjudicationShareForReview(), r.recalibrationToleranceMm(),
            r.recalibrationVolumePercent(), s.permutations(), ShiftSettings.DEFAULT_EXACT_LIMIT,
            p.consensus().bootstrapResamples(),
            Math.min(ShiftSettings.DEFAULT_VARIANCE_RESAMPLES, p.consensus().bootstrapResamples() / 10),
            Math.min(ShiftSettings.DEFAULT_CENTRE_TEST_RESAMPLES, p.consensus().bootstrapResamples() / 10 - 1),
            p.seed());
    }
}
