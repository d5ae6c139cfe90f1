package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.junit.jupiter.api.Test;

/** The planted centre effect: the signed-surface measure on a hand-computed case, the Δ arithmetic, the generator's grids. */
class PlantedTruthTest {

    @Test
    void cubeGrownByOneVoxelAgainstItsCoreMatchesTheHandCount() {
        // a 6x6x6 cube (voxels 2..7) against the 4x4x4 cube inside it (3..6), 1 mm voxels. Border of
        // the big cube: 216 - 64 = 152 voxels, all outside the small cube. Nearest border voxel of the
        // small cube: face voxels (16 per face, 96) at 1 mm, edge voxels (4 per edge, 48) at sqrt(2) mm,
        // corners (8) at sqrt(3) mm. Mean = (96 + 48 sqrt 2 + 8 sqrt 3) / 152 = 1.169327 mm (by hand).
        DemoSpec grid = new DemoSpec(1, 1, 1, 1, 10, 10, 10, 1, 1, 1, 0, 0, 0, 0, 0);
        boolean[] big = new boolean[1000];
        boolean[] small = new boolean[1000];
        for (int z = 0; z < 10; z++) {
            for (int y = 0; y < 10; y++) {
                for (int x = 0; x < 10; x++) {
                    int i = x + 10 * (y + 10 * z);
                    big[i] = x >= 2 && x <= 7 && y >= 2 && y <= 7 && z >= 2 && z <= 7;
                    small[i] = x >= 3 && x <= 6 && y >= 3 && y <= 6 && z >= 3 && z <= 6;
                }
            }
        }
        double hand = (96 + 48 * Math.sqrt(2) + 8 * Math.sqrt(3)) / 152;
        assertEquals(hand, PlantedTruth.signedMm(big, small, grid), 1e-12);
        // the other way round each of the small cube's 56 border voxels lies inside the big cube with
        // a border voxel of the big cube one step outward along an axis (corners too: (3,3,3) has
        // (2,3,3)): mean -1 mm exactly (by hand)
        assertEquals(-1.0, PlantedTruth.signedMm(small, big, grid), 1e-12);
        assertEquals(0.0, PlantedTruth.signedMm(small, small, grid), 0.0);
    }

    @Test
    void deltaIsTheCentreAgainstTheMeanOfTheOthers() {
        Map<String, Double> mu = new LinkedHashMap<>();
        mu.put("esterhaven", 0.0);
        mu.put("norvale", 1.35);
        mu.put("quillbay", 0.0);
        Map<String, Double> d = PlantedTruth.deltasMm(mu);
        // 1.35 - (0 + 0)/2 and 0 - (1.35 + 0)/2 (arithmetic)
        assertEquals(1.35, d.get("norvale"), 1e-12);
        assertEquals(-0.675, d.get("esterhaven"), 1e-12);
        assertEquals(-0.675, d.get("quillbay"), 1e-12);
        assertEquals(0.0, d.values().stream().mapToDouble(Double::doubleValue).sum(), 1e-12, "effects sum to 0");
    }

    @Test
    void plantedMarginOnTheCalibrationGridMeasuresSomewhatLess() {
        Scenario plus = Scenario.all(1.5, 6, 3).get(1);
        DemoSpec base = new DemoSpec(1, 6, 3, 3, 64, 64, 32, 1, 1, 2, 0, 0, 0, 0.3, 0.5);
        DemoGenerator.InMemory study = DemoGenerator.inMemory(plus.spec(base, 20261202L, 0), plus.extras());
        Map<String, Double> mu = PlantedTruth.centreMeansMm(study, plus);
        assertEquals(List.of("esterhaven", "norvale", "quillbay"), List.copyOf(mu.keySet()));
        assertEquals(0.0, mu.get("esterhaven"), 0.0);
        // border voxels lie on the lattice and distances are taken between voxel centres, so a
        // +1.5 mm margin measures a little under 1.5 mm on 1 x 1 x 2 mm voxels
        assertTrue(mu.get("norvale") > 1.2 && mu.get("norvale") < 1.5, "measured " + mu.get("norvale"));
    }
}
