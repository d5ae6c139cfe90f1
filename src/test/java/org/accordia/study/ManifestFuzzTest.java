package org.accordia.study;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.stream.Stream;
import org.accordia.io.Geometry;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;
import org.accordia.io.ReadLimits;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/**
 * Fuzz target for the manifest reader: the bytes become {@code manifest.csv} in a study folder
 * holding three small masks ({@code a.nii.gz}, {@code b.nii.gz}, {@code sub/c.nii}) and a file
 * that is not a volume ({@code notes.txt}); the study is loaded and, when that succeeds,
 * inspected (every listed mask read). The property: loading throws nothing but
 * {@link InputException}; inspection throws nothing at all (it collects problems). No hang
 * (10 s per input). Seeds: {@code src/test/resources/org/accordia/study/ManifestFuzzTestInputs/load/}.
 */
class ManifestFuzzTest {
    private static Path root;
    private static final org.accordia.hostile.Bounded BOUNDED = new org.accordia.hostile.Bounded();

    @BeforeAll
    static void study() throws IOException {
        root = Files.createTempDirectory("accordia-fuzz-manifest");
        Geometry g = Geometry.axisAligned(4, 4, 2, 1, 1, 1);
        byte[] a = new byte[32];
        a[5] = 1;
        byte[] b = new byte[32];
        b[5] = 1;
        b[6] = 2;
        NiftiWriter.writeLabels(root.resolve("a.nii.gz"), LabelVolume.ofBytes(g, a));
        NiftiWriter.writeLabels(root.resolve("b.nii.gz"), LabelVolume.ofBytes(g, b));
        Files.createDirectories(root.resolve("sub"));
        NiftiWriter.writeLabels(root.resolve("sub/c.nii"), LabelVolume.ofBytes(Geometry.axisAligned(2, 2, 2, 1, 1, 1), new byte[8]));
        Files.writeString(root.resolve("notes.txt"), "not a volume\n");
    }

    @AfterAll
    static void clean() throws IOException {
        try (Stream<Path> walk = Files.walk(root)) {
            walk.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        }
    }

    @FuzzTest(maxDuration = "3m")
    void load(byte[] manifest) {
        BOUNDED.run(() -> loadOnce(manifest));
    }

    private static void loadOnce(byte[] manifest) {
        Path file;
        try {
            file = Files.write(root.resolve(StudyLoader.MANIFEST), manifest);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        Study study;
        try {
            study = StudyLoader.load(root, LoadOptions.DEFAULT);
        } catch (InputException expected) {
            return;
        }
        Inspector.inspect(study, Protocol.defaults(), ReadLimits.DEFAULT.withMaxVoxels(1 << 16), 1);
        if (!Files.isRegularFile(file)) {
            throw new IllegalStateException("the manifest disappeared");
        }
    }
}
