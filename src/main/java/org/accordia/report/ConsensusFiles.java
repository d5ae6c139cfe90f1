package org.accordia.report;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.TreeSet;
import org.accordia.grid.Box;
import org.accordia.agreement.CaseAgreement;
import org.accordia.analysis.CaseRecord;
import org.accordia.analysis.CaseSink;
import org.accordia.analysis.StructureCase;
import org.accordia.consensus.CaseReferences;
import org.accordia.consensus.ConsensusOutputs;
import org.accordia.io.Geometry;
import org.accordia.io.ImageVolume;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.accordia.study.LoadedCase;
import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

/**
 * The per-case outputs of a run, made while the case's volumes are in memory ({@link CaseSink}):
 *
 * <ul>
 *   <li>{@code consensus/<case>/<structure>_probability.nii.gz}: the STAPLE probability W that a
 *       voxel belongs to the structure (all readers), float32 in [0, 1];</li>
 *   <li>{@code consensus/<case>/<structure>_consensus.nii.gz}: the thresholded consensus
 *       (W ≥ 0.5), uint8, 1 inside, 0 outside;</li>
 *   <li>{@code consensus/<case>/labels_consensus.nii.gz} when the study has several label values:
 *       the multi-label STAPLE consensus, one label per voxel, ties written as the undecided value
 *       (the largest label value + 1).</li>
 * </ul>
 * Case and structure names pass through {@link OutputFolder#safeFileName}; every file is written
 * by {@link OutputFolder#writeAtomically}, gzip at deflate's fastest level
 * ({@link NiftiWriter.Compression#FAST}: these files are rewritten on every run, and compressing the
 * zeros of a full-grid map at the default level took longer than any other output step).
 *
 * <p>For the report's pictures it keeps, at any time, only the {@code keep} most contentious cases
 * seen so far (largest disagreement score, ties by case name, so the choice does not depend on the
 * order in which cases finish): for each, the slice of greatest disagreement of its least-agreed
 * structure ({@link DisagreementSlice}), cropped in-plane to the readers' union grown by a
 * margin, with each reader's mask on it and the probability map as a fallback background.
 * Thread-safe.
 */
public final class ConsensusFiles implements CaseSink {
    /** In-plane margin around the readers' union on the pictures, voxels. */
    static final int PICTURE_MARGIN_VOXELS = 12;

    /** Encoding of every file written here. */
    private static final NiftiWriter.Compression GZIP = NiftiWriter.Compression.FAST;

    /**
     * One candidate picture: a slice cropped to {@code box} in-plane.
     *
     * @param caseId the case
     * @param structure the structure shown
     * @param score the case's disagreement score
     * @param z the slice (full-grid index)
     * @param disputedVoxels voxels of the slice marked by some but not all readers
     * @param box the in-plane crop (z range is the single slice)
     * @param geometry the case's grid
     * @param readers the readers, case order
     * @param masks each reader's mask on the cropped slice
     * @param probability the STAPLE probability on the cropped slice
     * @param image the case's image on the cropped slice (cropped while the case was in memory),
     *     or null when the case has no image
     */
    public record Picture(String caseId, String structure, double score, int z, long disputedVoxels, Box box,
                          Geometry geometry, List<ReaderId> readers, List<boolean[]> masks, float[] probability,
                          float[] image) {
    }

    private final OutputFolder folder;
    private final int keep;
    private final TreeSet<Picture> best = new TreeSet<>(ORDER);
    private static final Comparator<Picture> ORDER = Comparator
        .comparingDouble((Picture p) -> Double.isNaN(p.score()) ? Double.NEGATIVE_INFINITY : -p.score())
        .thenComparing(Picture::caseId);

    /**
     * @param folder where to write, or {@code null} to write nothing (pictures only)
     * @param keep how many candidate pictures to keep (at least 0)
     */
    public ConsensusFiles(OutputFolder folder, int keep) {
        this.folder = folder;
        this.keep = Math.max(0, keep);
    }

    /** The kept pictures, most contentious first. */
    public synchronized List<Picture> pictures() {
        return new ArrayList<>(best);
    }

    /** The folder of one case's consensus files, relative to the output folder. */
    public static String caseFolder(String caseId) {
        return "consensus/" + OutputFolder.safeFileName(caseId);
    }

    @Override
    public void accept(CaseWork work) throws IOException, InputException {
        LoadedCase lc = work.loaded();
        CaseRecord rec = work.record();
        List<LabelVolume> masks = lc.masks();
        String dir = caseFolder(lc.caseId());
        for (int s = 0; s < rec.structures().size(); s++) {
            StructureCase sc = rec.structures().get(s);
            CaseReferences refs = work.references().get(s);
            Structure st = sc.structure();
            int[] labels = st.labelArray();
            if (folder != null) {
                String stem = dir + "/" + OutputFolder.safeFileName(st.name());
                Box union = sc.agreement().unionBox();
                ConsensusOutputs.BoxMap w = ConsensusOutputs.probabilityInBox(masks, labels, refs.all(), union);
                folder.writeAtomically(stem + "_probability.nii.gz",
                    out -> NiftiWriter.writeProbability(out, lc.geometry(), w::fillRow, GZIP));
                LabelVolume bin = ConsensusOutputs.binaryConsensus(masks, labels, refs.all(),
                    refs.keepMask("all", 0), 1, union);
                folder.writeAtomically(stem + "_consensus.nii.gz", out -> NiftiWriter.writeLabels(out, bin, GZIP));
            }
        }
        if (folder != null && work.multiLabel() != null) {
            LabelVolume ml = ConsensusOutputs.labelConsensus(masks, work.multiLabel(),
                work.multiLabel().histogram().nonzeroBox());
            folder.writeAtomically(dir + "/labels_consensus.nii.gz", out -> NiftiWriter.writeLabels(out, ml, GZIP));
        }
        if (keep > 0 && masks.size() >= 2) {
            considerPicture(work);
        }
    }

    private void considerPicture(CaseWork work) throws InputException {
        CaseRecord rec = work.record();
        synchronized (this) {
            if (best.size() >= keep) {
                Picture worst = best.last();
                Picture probe = new Picture(rec.caseId(), "", rec.disagreementScore(), 0, 0, Box.EMPTY, null,
                    List.of(), List.of(), null, null);
                if (ORDER.compare(probe, worst) >= 0) {
                    return; // cannot enter the top list
                }
            }
        }
        Picture p = picture(work);
        if (p == null) {
            return;
        }
        synchronized (this) {
            best.add(p);
            while (best.size() > keep) {
                best.pollLast();
            }
        }
    }

    /** The picture of the case's least-agreed structure, or null when every mask is empty. */
    static Picture picture(CaseWork work) throws InputException {
        CaseRecord rec = work.record();
        int pick = -1;
        for (int s = 0; s < rec.structures().size(); s++) {
            double m = rec.structures().get(s).agreement().medianDice();
            if (!Double.isNaN(m) && !rec.structures().get(s).agreement().unionBox().isEmpty()
                && (pick < 0 || m < rec.structures().get(pick).agreement().medianDice())) {
                pick = s;
            }
        }
        if (pick < 0) {
            return null;
        }
        StructureCase sc = rec.structures().get(pick);
        CaseAgreement ca = sc.agreement();
        LoadedCase lc = work.loaded();
        Geometry g = lc.geometry();
        Box union = ca.unionBox();
        // the slice of greatest disagreement within the union box
        List<boolean[]> inBox = masksInBox(lc.masks(), sc.structure(), union);
        DisagreementSlice slice = DisagreementSlice.find(inBox, union.nx(), union.ny(), union.nz(), union.z0());
        Box crop = new Box(Math.max(0, union.x0() - PICTURE_MARGIN_VOXELS), Math.max(0, union.y0() - PICTURE_MARGIN_VOXELS),
            slice.z(), Math.min(g.nx(), union.x1() + PICTURE_MARGIN_VOXELS),
            Math.min(g.ny(), union.y1() + PICTURE_MARGIN_VOXELS), slice.z() + 1);
        List<boolean[]> masks = masksInBox(lc.masks(), sc.structure(), crop);
        ConsensusOutputs.BoxMap w = ConsensusOutputs.probabilityInBox(lc.masks(), sc.structure().labelArray(),
            work.references().get(pick).all(), union);
        float[] prob = new float[crop.size()];
        for (int i = 0, y = crop.y0(); y < crop.y1(); y++) {
            for (int x = crop.x0(); x < crop.x1(); x++) {
                prob[i++] = w.at(x, y, crop.z0());
            }
        }
        ImageVolume image = work.image().read();
        float[] background = null;
        if (image != null) {
            background = new float[crop.size()];
            for (int i = 0; i < background.length; i++) {
                background[i] = image.data()[crop.gridIndex(i, g.nx(), g.ny())];
            }
        }
        return new Picture(rec.caseId(), sc.structure().name(), rec.disagreementScore(), slice.z(),
            slice.disagreementVoxels(), crop, g, lc.readers(), masks, prob, background);
    }

    /** Each reader's structure membership over a box (x fastest within the box). */
    static List<boolean[]> masksInBox(List<LabelVolume> volumes, Structure structure, Box box) {
        boolean[] table = structure.byteTable();
        List<boolean[]> out = new ArrayList<>();
        for (LabelVolume m : volumes) {
            Geometry g = m.geometry();
            boolean[] b = new boolean[box.size()];
            for (int i = 0; i < b.length; i++) {
                int v = m.label(box.gridIndex(i, g.nx(), g.ny()));
                b[i] = v < 256 ? table[v] : structure.covers(v);
            }
            out.add(b);
        }
        return out;
    }
}
