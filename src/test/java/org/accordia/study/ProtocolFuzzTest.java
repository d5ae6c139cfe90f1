package org.accordia.study;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.accordia.io.InputException;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/**
 * Fuzz target for the protocol reader (YAML): the bytes are written to {@code protocol.yaml}
 * and loaded. The property: only {@link InputException} escapes (no snakeyaml exception, no
 * ClassCastException, no StackOverflowError from deep nesting, no alias-bomb blow-up), no hang
 * (10 s per input, {@link org.accordia.hostile.Bounded}). Seeds: {@code src/test/resources/org/accordia/study/ProtocolFuzzTestInputs/load/}.
 */
class ProtocolFuzzTest {
    private static Path dir;
    private static final org.accordia.hostile.Bounded BOUNDED = new org.accordia.hostile.Bounded();

    @BeforeAll
    static void scratch() throws IOException {
        dir = Files.createTempDirectory("accordia-fuzz-protocol");
    }

    @AfterAll
    static void clean() throws IOException {
        Files.deleteIfExists(dir.resolve("protocol.yaml"));
        Files.deleteIfExists(dir);
    }

    @FuzzTest(maxDuration = "3m")
    void load(byte[] yaml) {
        BOUNDED.run(() -> loadOnce(yaml));
    }

    private static void loadOnce(byte[] yaml) {
        Path file;
        try {
            file = Files.write(dir.resolve("protocol.yaml"), yaml);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        try {
            Protocol p = ProtocolLoader.load(file);
            if (p == null || p.maxVoxels() < 1) {
                throw new IllegalStateException("a loaded protocol must be complete and valid");
            }
        } catch (InputException expected) {
            // the one allowed outcome for a bad protocol
        }
    }
}
