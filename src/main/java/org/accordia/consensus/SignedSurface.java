package org.accordia.consensus;

import java.util.List;
import org.accordia.agreement.Borders;
import org.accordia.grid.Box;
import org.accordia.agreement.DistanceTransform;
import org.accordia.io.LabelVolume;

/**
 * Mean signed surface distance of a reader's border to a consensus boundary, in mm; positive =
 * the reader's border lies outside the consensus (a wider margin), negative = inside.
 *
 * <p>Convention (distance between borders): border voxels are foreground voxels with a
 * face-neighbour in background (6-connectivity; outside the grid is background — project
 * convention, org.accordia.agreement.Borders). For every border voxel v of the reader, d(v) is
 * the Euclidean distance in mm between voxel centres from v to the nearest border voxel of the
 * consensus; the signed value is +d(v) when v is outside the consensus, −d(v) when inside (a
 * reader border voxel that is itself a consensus border voxel gives 0). The result is the mean
 * over the reader's border voxels; a mask identical to the consensus gives exactly 0. NaN when
 * the reader's mask or the consensus is empty.
 *
 * <p>Voxel work is confined to the union bounding box of all readers' masks grown by one voxel
 * (clipped to the grid): outside the union every reader's pattern is 0, whose consensus is
 * background (W(0) &lt; 0.5); if a consensus contains pattern 0 (W(0) ≥ 0.5, only possible with
 * an unusual prior or region) the whole grid is used. Inside that box, voxels outside it are
 * background for the reader and for the consensus, so borders and distances computed on the box
 * equal those on the full grid.
 */
public final class SignedSurface {
    private SignedSurface() {
    }

    /** A mask over a box of the grid (x fastest within the box). */
    public record BoxMask(Box box, boolean[] mask) {
    }

    /**
     * The thresholded STAPLE consensus (W ≥ 0.5) of the readers in {@code keep}, over the union
     * box of all readers' masks grown by one voxel (everything outside is background).
     *
     * @param masks all readers' masks, bit order, one grid
     * @param structureLabels label values of the structure
     * @param consensus STAPLE result on the histogram restricted to {@code keep}
     * @param keep bits of the readers behind {@code consensus}
     */
    public static BoxMask consensusMask(List<LabelVolume> masks, int[] structureLabels, StapleResult consensus,
            long keep) {
        return consensusMask(masks, structureLabels, consensus, keep, null);
    }

    /**
     * {@link #consensusMask(List, int[], StapleResult, long)} with the union box already known.
     *
     * @param unionBox bounding box of the voxels any reader marks as the structure (as
     *     {@code CaseAgreement.unionBox()}; any box containing them gives the same mask), or null to
     *     compute it
     */
    public static BoxMask consensusMask(List<LabelVolume> masks, int[] structureLabels, StapleResult consensus,
            long keep, Box unionBox) {
        Prepared p = prepare(masks, structureLabels, consensus.weightOfPattern(0) >= StapleResult.CONSENSUS_THRESHOLD,
            unionBox);
        return new BoxMask(p.box, p.consensus(consensus, keep));
    }

    /** Mean signed surface distance (mm) of reader j to the consensus of the readers in {@code keep}. */
    public static double meanSignedMm(List<LabelVolume> masks, int[] structureLabels, int reader,
            StapleResult consensus, long keep) {
        Prepared p = prepare(masks, structureLabels, consensus.weightOfPattern(0) >= StapleResult.CONSENSUS_THRESHOLD);
        return p.meanSignedMm(p.consensus(consensus, keep), new int[] {reader})[0];
    }

    /**
     * Mean signed surface distance (mm) of the border of {@code reader} to the boundary of
     * {@code consensus}, both full masks over one nx×ny×nz grid; the plain definition, used as the
     * base of the box-cropped computation and in tests.
     */
    public static double meanSignedMm(boolean[] reader, boolean[] consensus, int nx, int ny, int nz,
            double sx, double sy, double sz) {
        boolean[] rb = Borders.borderMask(reader, nx, ny, nz);
        boolean[] cb = Borders.borderMask(consensus, nx, ny, nz);
        return mean(rb, consensus, cb, nx, ny, nz, sx, sy, sz);
    }

    private static double mean(boolean[] readerBorder, boolean[] consensus, boolean[] consensusBorder,
            int nx, int ny, int nz, double sx, double sy, double sz) {
        boolean any = false;
        for (boolean b : consensusBorder) {
            if (b) {
                any = true;
                break;
            }
        }
        if (!any) {
            return Double.NaN;
        }
        double[] d2 = DistanceTransform.squaredDistanceMm2(consensusBorder, nx, ny, nz, sx, sy, sz);
        double sum = 0;
        long n = 0;
        for (int i = 0; i < readerBorder.length; i++) {
            if (readerBorder[i]) {
                double d = Math.sqrt(d2[i]);
                sum += consensus[i] ? -d : d;
                n++;
            }
        }
        return n == 0 ? Double.NaN : sum / n;
    }

    static Prepared prepare(List<LabelVolume> masks, int[] structureLabels, boolean fullGrid) {
        return prepare(masks, structureLabels, fullGrid, null);
    }

    /** As above; {@code unionBox} = the readers' union bounding box when known, else null. */
    static Prepared prepare(List<LabelVolume> masks, int[] structureLabels, boolean fullGrid, Box unionBox) {
        Patterns.checkSameGrid(masks);
        boolean[] lut = Patterns.lut(structureLabels);
        int[] d = masks.get(0).geometry().dims();
        Box box = fullGrid ? Box.grid(d[0], d[1], d[2])
            : (unionBox != null ? unionBox : Patterns.unionBox(masks, lut)).grow(1, d[0], d[1], d[2]);
        long[] pat = Patterns.patternsInBox(masks, lut, box);
        return new Prepared(box, pat, masks.size(), masks.get(0).geometry().spacingMm());
    }

    /** The voxel patterns of one case and structure on the working box. */
    static final class Prepared {
        final Box box;
        final long[] pat;
        final int readers;
        final double[] spacing;
        private final boolean[][] readerBorders;

        Prepared(Box box, long[] pat, int readers, double[] spacing) {
            this.box = box;
            this.pat = pat;
            this.readers = readers;
            this.spacing = spacing;
            this.readerBorders = new boolean[readers][];
        }

        /** Border flags of reader j on the box, computed once. */
        boolean[] readerBorder(int j) {
            if (readerBorders[j] == null) {
                readerBorders[j] = Borders.borderMask(reader(j), box.nx(), box.ny(), box.nz());
            }
            return readerBorders[j];
        }

        boolean[] consensus(StapleResult s, long keep) {
            ConsensusLookup look = new ConsensusLookup(s, keep, readers);
            boolean[] c = new boolean[pat.length];
            for (int i = 0; i < pat.length; i++) {
                c[i] = look.inConsensus(pat[i]);
            }
            return c;
        }

        boolean[] reader(int j) {
            boolean[] r = new boolean[pat.length];
            for (int i = 0; i < pat.length; i++) {
                r[i] = (pat[i] >>> j & 1L) != 0;
            }
            return r;
        }

        /**
         * Mean signed distance of the consensus border to each listed reader's boundary (positive =
         * the consensus border lies outside the reader's mask): d(consensus → reader), one distance
         * transform of each reader's border.
         */
        double[] reverseSignedMm(boolean[] consensus, int[] readerIdx) {
            double[] out = new double[readerIdx.length];
            java.util.Arrays.fill(out, Double.NaN);
            if (box.isEmpty()) {
                return out;
            }
            int nx = box.nx();
            int ny = box.ny();
            int nz = box.nz();
            boolean[] cb = Borders.borderMask(consensus, nx, ny, nz);
            for (int k = 0; k < readerIdx.length; k++) {
                boolean[] rb = readerBorder(readerIdx[k]);
                boolean any = false;
                for (boolean b : rb) {
                    if (b) {
                        any = true;
                        break;
                    }
                }
                if (!any) {
                    continue;
                }
                boolean[] r = reader(readerIdx[k]);
                double[] d2 = DistanceTransform.squaredDistanceMm2(rb, nx, ny, nz, spacing[0], spacing[1], spacing[2]);
                double sum = 0;
                long n = 0;
                for (int i = 0; i < cb.length; i++) {
                    if (cb[i]) {
                        double d = Math.sqrt(d2[i]);
                        sum += r[i] ? -d : d;
                        n++;
                    }
                }
                out[k] = n == 0 ? Double.NaN : sum / n;
            }
            return out;
        }

        /** Mean signed distance of each listed reader to one consensus mask on the box. */
        double[] meanSignedMm(boolean[] consensus, int[] readerIdx) {
            return meanSignedMm(consensus, readerIdx, Double.NaN, null);
        }

        /**
         * Mean signed distance of each listed reader to one consensus mask on the box and, when
         * {@code profiles} is not null, each reader's {@link BorderProfile} at {@code toleranceMm}
         * (same distance transform; directions from the consensus centroid).
         */
        double[] meanSignedMm(boolean[] consensus, int[] readerIdx, double toleranceMm, BorderProfile[] profiles) {
            double[] out = new double[readerIdx.length];
            if (profiles != null) {
                java.util.Arrays.fill(profiles, BorderProfile.empty(toleranceMm));
            }
            if (box.isEmpty()) {
                java.util.Arrays.fill(out, Double.NaN);
                return out;
            }
            int nx = box.nx();
            int ny = box.ny();
            int nz = box.nz();
            boolean[] cb = Borders.borderMask(consensus, nx, ny, nz);
            boolean any = false;
            for (boolean b : cb) {
                if (b) {
                    any = true;
                    break;
                }
            }
            if (!any) {
                java.util.Arrays.fill(out, Double.NaN);
                return out;
            }
            double[] d2 = DistanceTransform.squaredDistanceMm2(cb, nx, ny, nz, spacing[0], spacing[1], spacing[2]);
            double[] m = profiles == null ? null
                : BorderProfile.centroidMm(consensus, nx, ny, spacing[0], spacing[1], spacing[2]);
            int nxy = nx * ny;
            for (int k = 0; k < readerIdx.length; k++) {
                boolean[] rb = readerBorder(readerIdx[k]);
                double sum = 0;
                long n = 0;
                long outside = 0;
                long inside = 0;
                long[] bd = new long[BorderProfile.DIRECTIONS];
                long[] od = new long[BorderProfile.DIRECTIONS];
                for (int i = 0; i < rb.length; i++) {
                    if (rb[i]) {
                        double d = Math.sqrt(d2[i]);
                        double signed = consensus[i] ? -d : d;
                        sum += signed;
                        n++;
                        if (m != null) {
                            int dir = BorderProfile.direction(i % nx * spacing[0] - m[0],
                                i / nx % ny * spacing[1] - m[1], i / nxy * spacing[2] - m[2]);
                            bd[dir]++;
                            if (signed > toleranceMm) {
                                outside++;
                                od[dir]++;
                            } else if (signed < -toleranceMm) {
                                inside++;
                            }
                        }
                    }
                }
                out[k] = n == 0 ? Double.NaN : sum / n;
                if (m != null) {
                    profiles[k] = new BorderProfile(toleranceMm, n, outside, inside, bd, od);
                }
            }
            return out;
        }
    }
}
