package org.accordia.io;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.stream.Stream;

/**
 * A scratch folder for fuzz targets: one per test class, reused by every input (a fuzzing run
 * calls the target hundreds of thousands of times in one JVM), deleted at the end.
 */
final class FuzzFiles implements AutoCloseable {
    private final Path dir;

    FuzzFiles(String prefix) {
        try {
            dir = Files.createTempDirectory(prefix);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    Path dir() {
        return dir;
    }

    /** Writes {@code content} to {@code name} in the scratch folder, replacing any earlier input. */
    Path write(String name, byte[] content) {
        try {
            return Files.write(dir.resolve(name), content);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Reads the file as labels, as an image and for its geometry. Only {@link InputException}
     * may escape a reader; anything else (a runtime exception, an error) propagates and is a
     * finding.
     */
    static void readAllWays(Path file, ReadLimits limits) {
        try {
            Volumes.readLabels(file, limits);
        } catch (InputException expected) {
            // the one allowed outcome for bad input
        }
        try {
            Volumes.readImage(file, limits);
        } catch (InputException expected) {
            // idem
        }
        try {
            Volumes.readGeometry(file, limits);
        } catch (InputException expected) {
            // idem
        }
    }

    @Override
    public void close() {
        try (Stream<Path> walk = Files.walk(dir)) {
            walk.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
