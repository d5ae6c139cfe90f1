package org.accordia.demo;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.accordia.agreement.DistanceTransform;
import org.accordia.consensus.SignedSurface;
import org.accordia.io.LabelVolume;
import org.accordia.study.LoadedCase;
import org.accordia.study.ReaderId;
import org.junit.jupiter.api.Test;

/**
 * The generator's simulation plants (unequal rosters, one wide reader, a local inclusion),
 * checked on the masks they produce: geometry measured on the grid, not the constants planted.
 * Reader bias and boundary noise are switched off where a reader's mask is compared with the truth,
 * so every difference is the plant's.
 *
 * <p>Measured here once (12 cases, seed 11): the inclusion's reach 5.4–7.0 mm (mean 6.2) for the
 * planted 6 mm, its mean signed surface distance against the truth 0.44–0.74 mm.
 */
class ExtraPlantsTest {
    /** 1 × 1 × 2 mm voxels, as in the calibration; no bias, no noise, no centre shift. */
    private static final DemoSpec QUIET = new DemoSpec(11, 12, 3, 3, 64, 64, 32, 1, 1, 2, 0, 0, 0, 0, 0);

    private static boolean[] fg(LabelVolume v) {
        boolean[] out = new boolean[v.voxelCount()];
        for (int i = 0; i < out.length; i++) {
            out[i] = v.label(i) != 0;
        }
        return out;
    }

    private static LabelVolume mask(LoadedCase c, String centre, String reader) {
        return c.masks().get(c.readers().indexOf(new ReaderId(reader, centre)));
    }

    @Test
    void localInclusionIsOneSidedAndReachesAboutThePlantedDistance() {
        double planted = 6.0;
        DemoGenerator.InMemory study = DemoGenerator.inMemory(QUIET, ExtraPlants.NONE.withInclusion(1, planted));
        assertEquals("norvale", study.inclusionCentre());
        int nx = QUIET.nx();
        int ny = QUIET.ny();
        int nz = QUIET.nz();
        double reachSum = 0;
        for (String caseId : study.caseIds()) {
            LoadedCase c = study.load(caseId);
            boolean[] truth = fg(mask(c, "esterhaven", "est1"));
            boolean[] incl = fg(mask(c, "norvale", "nor2"));
            // the other centres draw the truth itself; the inclusion centre adds to it, never removes
            assertArrayEquals(truth, fg(mask(c, "quillbay", "qui3")), caseId);
            assertArrayEquals(truth, study.plantedShape(caseId, 0, false), caseId);
            assertArrayEquals(incl, study.plantedShape(caseId, 0, true), caseId);
            double[] lesion = new double[3];
            double[] extra = new double[3];
            int nLesion = 0;
            int nExtra = 0;
            for (int i = 0; i < truth.length; i++) {
                assertTrue(!truth[i] || incl[i], "the inclusion removes nothing");
                double[] p = {i % nx, (i / nx) % ny, 2.0 * (i / (nx * ny))};
                if (truth[i]) {
                    nLesion++;
                    for (int d = 0; d < 3; d++) {
                        lesion[d] += p[d];
                    }
                } else if (incl[i]) {
                    nExtra++;
                    for (int d = 0; d < 3; d++) {
                        extra[d] += p[d];
                    }
                }
            }
            assertTrue(nExtra >= 50, caseId + ": extra voxels " + nExtra);
            double[] u = new double[3];
            double norm = 0;
            for (int d = 0; d < 3; d++) {
                lesion[d] /= nLesion;
                extra[d] /= nExtra;
                u[d] = extra[d] - lesion[d];
                norm += u[d] * u[d];
            }
            norm = Math.sqrt(norm);
            // one-sided: every added voxel lies on the far side of the plane through the lesion's
            // centroid perpendicular to the direction of the added part
            double[] d2 = DistanceTransform.squaredDistanceMm2(truth, nx, ny, nz, 1, 1, 2);
            double reach = 0;
            for (int i = 0; i < truth.length; i++) {
                if (incl[i] && !truth[i]) {
                    double[] p = {i % nx, (i / nx) % ny, 2.0 * (i / (nx * ny))};
                    double along = 0;
                    for (int d = 0; d < 3; d++) {
                        along += (p[d] - lesion[d]) * u[d] / norm;
                    }
                    assertTrue(along > 0, caseId + ": an added voxel on the near side (" + along + " mm)");
                    reach = Math.max(reach, Math.sqrt(d2[i]));
                }
            }
            // the farthest added voxel centre lies about the planted distance from the lesion's voxel
            // centres: within a voxel (half diagonal 1.22 mm at 1 x 1 x 2 mm) and the deformation's
            // change over the inclusion
            assertTrue(reach > planted - 1.5 && reach <= planted + 1.25, caseId + ": reach " + reach + " mm");
            reachSum += reach;
            // and its mean signed surface distance is far below the reach: local, not a margin
            double msd = SignedSurface.meanSignedMm(incl, truth, nx, ny, nz, 1, 1, 2);
            assertTrue(msd > 0.1 && msd < planted / 3, caseId + ": mean signed distance " + msd);
        }
        double meanReach = reachSum / study.caseIds().size();
        assertEquals(planted, meanReach, 0.5, "mean reach over the cases");
    }

    @Test
    void oneWideReaderDrawsItsMarginAndNobodyElseMoves() {
        DemoGenerator.InMemory study = DemoGenerator.inMemory(QUIET, ExtraPlants.NONE.withWideReader(2, 0, 1.5));
        assertEquals(new ReaderId("qui1", "quillbay"), study.wideReader());
        assertNull(study.inclusionCentre());
        for (String caseId : study.caseIds().subList(0, 2)) {
            LoadedCase c = study.load(caseId);
            boolean[] truth = study.plantedShape(caseId, 0, false);
            double wide = SignedSurface.meanSignedMm(fg(mask(c, "quillbay", "qui1")), truth, 64, 64, 32, 1, 1, 2);
            double planted = SignedSurface.meanSignedMm(study.plantedShape(caseId, 1.5, false), truth, 64, 64, 32, 1, 1,
                2);
            assertEquals(planted, wide, 1e-12, caseId + ": the wide reader draws the truth grown by its margin");
            assertTrue(wide > 1.0 && wide < 1.7, caseId + ": measured " + wide + " mm");
            for (ReaderId r : c.readers()) {
                if (!r.equals(study.wideReader())) {
                    assertArrayEquals(truth, fg(mask(c, r.centre(), r.reader())), r.label());
                }
            }
        }
    }

    @Test
    void unequalRostersIncludingAOneReaderCentre() {
        DemoGenerator.InMemory study = DemoGenerator.inMemory(QUIET.withPlants(1.5, 0, 0),
            ExtraPlants.NONE.withRoster(List.of(3, 2, 1)));
        List<ReaderId> expected = List.of(new ReaderId("est1", "esterhaven"), new ReaderId("est2", "esterhaven"),
            new ReaderId("est3", "esterhaven"), new ReaderId("nor1", "norvale"), new ReaderId("nor2", "norvale"),
            new ReaderId("qui1", "quillbay"));
        assertEquals(expected, study.readers());
        LoadedCase c = study.load(study.caseIds().get(0));
        assertEquals(expected, c.readers());
        assertEquals(6, c.masks().size());
        // the shifted centre (norvale, two readers) still draws wider than the one-reader centre
        String id = study.caseIds().get(1);
        LoadedCase d = study.load(id);
        boolean[] truth = study.plantedShape(id, 0, false);
        for (String r : List.of("nor1", "nor2")) {
            double mm = SignedSurface.meanSignedMm(fg(mask(d, "norvale", r)), truth, 64, 64, 32, 1, 1, 2);
            assertTrue(mm > 1.0, r + " " + mm);
        }
        double one = SignedSurface.meanSignedMm(fg(mask(d, "quillbay", "qui1")), truth, 64, 64, 32, 1, 1, 2);
        assertEquals(0.0, one, 1e-12, "the one-reader centre draws the truth");
        assertEquals(List.of("est1", "est2", "est3"), study.truth().centres().get(0).readers());
        assertEquals(List.of("qui1"), study.truth().centres().get(2).readers());
    }

    @Test
    void noExtrasGiveTheSameStudyAndBadExtrasAreRefused() {
        DemoSpec s = QUIET.withPlants(1.5, 1, 1).withSeed(5);
        LoadedCase a = DemoGenerator.inMemory(s).load("case02");
        LoadedCase b = DemoGenerator.inMemory(s, ExtraPlants.NONE).load("case02");
        for (int r = 0; r < a.masks().size(); r++) {
            assertArrayEquals(a.masks().get(r).bytes(), b.masks().get(r).bytes());
        }
        assertThrows(IllegalArgumentException.class, () -> DemoGenerator.inMemory(s, ExtraPlants.NONE.withRoster(
            List.of(3, 3))));
        assertThrows(IllegalArgumentException.class, () -> DemoGenerator.inMemory(s, ExtraPlants.NONE.withWideReader(
            2, 3, 1.5)));
        assertThrows(IllegalArgumentException.class, () -> ExtraPlants.NONE.withInclusion(1, -1));
    }
}
