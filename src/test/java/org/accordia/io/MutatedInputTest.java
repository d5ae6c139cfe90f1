package org.accordia.io;

import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.stream.Stream;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The reader contract (VolumeReader): for any damaged file, only {@link InputException} escapes.
 * Every committed fixture is damaged in seeded random ways (byte flips in the header region,
 * random bytes anywhere, truncation, appended bytes) and read as labels, as an image and for its
 * geometry.
 */
class MutatedInputTest {
    @TempDir
    Path dir;

    static Stream<Path> fixtures() throws IOException {
        List<Path> out = new ArrayList<>();
        for (String area : new String[] {"nifti", "itk"}) {
            try (var files = Files.list(Path.of("src/test/resources/fixtures", area))) {
                files.filter(p -> Volumes.isVolumeFile(p)).sorted().forEach(out::add);
            }
        }
        return out.stream();
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("fixtures")
    void onlyInputExceptionEscapes(Path fixture) throws IOException {
        byte[] original = Files.readAllBytes(fixture);
        String name = fixture.getFileName().toString();
        Random rnd = new Random(name.hashCode());
        // Detached headers need their data files beside the mutated copy.
        try (var files = Files.list(fixture.getParent())) {
            for (Path p : files.filter(p -> p.toString().endsWith(".raw")).toList()) {
                Files.copy(p, dir.resolve(p.getFileName()), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
            }
        }
        for (int trial = 0; trial < 24; trial++) {
            byte[] b = original.clone();
            switch (trial % 4) {
                case 0 -> {
                    int flips = 1 + rnd.nextInt(4);
                    for (int k = 0; k < flips; k++) {
                        int at = rnd.nextInt(Math.min(b.length, 600));
                        b[at] ^= (byte) (1 << rnd.nextInt(8));
                    }
                }
                case 1 -> {
                    for (int k = 0; k < 6; k++) {
                        b[rnd.nextInt(b.length)] = (byte) rnd.nextInt(256);
                    }
                }
                case 2 -> b = java.util.Arrays.copyOf(b, rnd.nextInt(b.length));
                default -> {
                    b = java.util.Arrays.copyOf(b, b.length + 1 + rnd.nextInt(64));
                    for (int k = original.length; k < b.length; k++) {
                        b[k] = (byte) rnd.nextInt(256);
                    }
                }
            }
            Path f = Files.write(dir.resolve(name), b);
            ReadLimits limits = ReadLimits.DEFAULT.withMaxVoxels(1 << 16);
            try {
                Volumes.readLabels(f, limits);
            } catch (InputException expected) {
                // fine
            } catch (RuntimeException | Error e) {
                fail(name + " trial " + trial + " (labels): " + e, e);
            }
            try {
                Volumes.readImage(f, limits);
            } catch (InputException expected) {
                // fine
            } catch (RuntimeException | Error e) {
                fail(name + " trial " + trial + " (image): " + e, e);
            }
            try {
                Volumes.readGeometry(f, limits);
            } catch (InputException expected) {
                // fine
            } catch (RuntimeException | Error e) {
                fail(name + " trial " + trial + " (geometry): " + e, e);
            }
        }
    }
}
