package org.accordia.demo;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledIfSystemProperty;
import org.junit.jupiter.api.io.TempDir;

/**
 * Time to generate one case of the benchmark study (9 readers, 256x256x128): computing the masks
 * and image, and writing them, against the whole-grid oracle in the same run. Not run by default:
 * {@code mvn -o test -Dtest=DemoGeneratorBenchmark -Daccordia.bench=true}. Prints; asserts only that
 * the fast and the oracle paths agree.
 */
@EnabledIfSystemProperty(named = "accordia.bench", matches = "true")
class DemoGeneratorBenchmark {
    @Test
    void oneLargeCase(@TempDir Path tmp) throws Exception {
        DemoSpec spec = DemoSpec.defaults().withRoster(20, 3, 3).withGrid(256, 256, 128, 0.8, 0.8, 2.5);
        DemoGenerator.Plan plan = DemoGenerator.plan(spec);
        Geometry g = Geometry.axisAligned(256, 256, 128, 0.8, 0.8, 2.5);
        DemoGenerator.generateCase(spec, plan, 1, g); // warm-up
        int caseIndex = 2;
        long t0 = System.nanoTime();
        DemoGenerator.CaseData data = DemoGenerator.generateCase(spec, plan, caseIndex, g);
        long t1 = System.nanoTime();
        for (int r = 0; r < data.masks().size(); r++) {
            NiftiWriter.writeLabels(tmp.resolve("m" + r + ".nii.gz"), data.masks().get(r));
        }
        long t2 = System.nanoTime();
        NiftiWriter.writeImage(tmp.resolve("img.nii.gz"), data.image());
        long t3 = System.nanoTime();
        List<LabelVolume> slow = DemoGenerator.generateCase(spec, plan, caseIndex, g, true).masks();
        long t4 = System.nanoTime();
        for (int r = 0; r < slow.size(); r++) {
            assertEquals(java.util.Arrays.hashCode(slow.get(r).bytes()), java.util.Arrays.hashCode(data.masks().get(r).bytes()));
        }
        System.out.printf(Locale.ROOT,
            "demo case 256x256x128, 9 readers: compute %.2f s (whole-grid oracle %.2f s, ratio %.1fx), "
                + "write masks %.2f s, write image %.2f s (%d bytes)%n",
            (t1 - t0) / 1e9, (t4 - t3) / 1e9, (double) (t4 - t3) / (t1 - t0), (t2 - t1) / 1e9, (t3 - t2) / 1e9,
            Files.size(tmp.resolve("img.nii.gz")));
    }
}
