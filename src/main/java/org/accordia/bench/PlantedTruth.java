package org.accordia.bench;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.accordia.consensus.SignedSurface;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;

/**
 * The planted value of the centre-effect estimand, measured on the grid from the generator itself.
 *
 * <p>Estimand: Δ_c = μ_c − mean over the other centres d of μ_d, where μ_c is the population mean
 * (readers as random, over cases) signed surface distance in mm (positive = outside) of a reader's
 * border relative to one common reference surface per case. The generator draws every reader as
 * {@code { f(x) < centre margin + reader bias + smooth noise }} with bias and noise of mean 0, so the
 * planted μ_c is taken as the mean over the study's cases of the signed surface distance of the
 * case's truth shape as centre c plants it (grown by the centre's margin, with the centre's local
 * inclusion if any; no reader bias, no reader noise) against the unplanted truth shape, as the
 * analysis measures readers against its common reference: the antisymmetric border offset
 * ½ (d(planted → truth) − d(truth → planted)), d from the project's own {@link
 * SignedSurface#meanSignedMm(boolean[], boolean[], int, int, int, double, double, double)}. A centre
 * without a plant has μ_c = 0 exactly (identical masks). One wide reader is an individual deviation,
 * not a centre's: it leaves μ of its centre at 0.
 *
 * <p>On the calibration grid (64 × 64 × 32 at 1 × 1 × 2 mm) a +1.5 mm margin measures about
 * +1.36 mm and −1.5 mm about −1.39 mm: the border voxels lie on the voxel lattice, and distances
 * are taken between voxel centres. One direction alone is not antisymmetric there (+1.45 mm from
 * the grown border inwards, −1.26 mm from the unplanted border outwards; −1.24 and −1.49 for a
 * narrower margin), which is why both directions are averaged, here and in the analysis.
 */
public final class PlantedTruth {
    private PlantedTruth() {
    }

    /**
     * μ_c of every centre of the study, in centre order.
     *
     * @param study the generated study
     * @param scenario what it plants
     */
    public static Map<String, Double> centreMeansMm(DemoGenerator.InMemory study, Scenario scenario) {
        Map<String, Double> mu = new LinkedHashMap<>();
        List<String> centres = study.centres();
        for (int c = 0; c < centres.size(); c++) {
            double margin = c == Scenario.PLANTED_CENTRE ? scenario.centreShiftMm() : 0;
            boolean inclusion = c == Scenario.PLANTED_CENTRE && scenario.inclusionMm() > 0;
            mu.put(centres.get(c), margin == 0 && !inclusion ? 0.0 : meanOverCasesMm(study, margin, inclusion));
        }
        return mu;
    }

    /**
     * The mean over the study's cases of the antisymmetric border offset (mm) of the planted shape
     * ({@link DemoGenerator.InMemory#plantedShape}) against the unplanted truth shape.
     */
    public static double meanOverCasesMm(DemoGenerator.InMemory study, double marginMm, boolean inclusion) {
        double sum = 0;
        for (String caseId : study.caseIds()) {
            boolean[] planted = study.plantedShape(caseId, marginMm, inclusion);
            boolean[] truth = study.plantedShape(caseId, 0, false);
            sum += 0.5 * (signedMm(planted, truth, study.spec()) - signedMm(truth, planted, study.spec()));
        }
        return sum / study.caseIds().size();
    }

    /**
     * Mean signed surface distance (mm, positive = outside) of the border of {@code planted} to the
     * border of {@code truth}, full masks on the spec's grid ({@link SignedSurface}'s plain definition).
     */
    static double signedMm(boolean[] planted, boolean[] truth, DemoSpec grid) {
        return SignedSurface.meanSignedMm(planted, truth, grid.nx(), grid.ny(), grid.nz(), grid.sxMm(), grid.syMm(),
            grid.szMm());
    }

    /** Δ_c = μ_c − mean over the other centres d of μ_d, in the order of {@code mu}; NaN with one centre. */
    public static Map<String, Double> deltasMm(Map<String, Double> mu) {
        Map<String, Double> out = new LinkedHashMap<>();
        double total = mu.values().stream().mapToDouble(Double::doubleValue).sum();
        int g = mu.size();
        for (Map.Entry<String, Double> e : mu.entrySet()) {
            out.put(e.getKey(), g < 2 ? Double.NaN : e.getValue() - (total - e.getValue()) / (g - 1));
        }
        return out;
    }
}
