package org.accordia.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/**
 * Fuzz target for the NIfTI reader (NIfTI-1 and -2, raw and gzip): the bytes are written to a
 * {@code .nii} file (the reader detects gzip from the magic bytes, not the name) and read as
 * labels, as an image and for the geometry, with the default limits. The property: only
 * {@link InputException} escapes; no other exception, no error (no OutOfMemoryError: every
 * allocation is bounded by the file's size), no hang (10 s per input, {@link org.accordia.hostile.Bounded}).
 *
 * <p>In {@code mvn verify} this replays the committed seeds in
 * {@code src/test/resources/org/accordia/io/NiftiFuzzTestInputs/read/}; see docs/fuzzing.md for
 * a fuzzing run.
 */
class NiftiFuzzTest {
    private static FuzzFiles files;
    private static final org.accordia.hostile.Bounded BOUNDED = new org.accordia.hostile.Bounded();

    @BeforeAll
    static void scratch() {
        files = new FuzzFiles("accordia-fuzz-nifti");
    }

    @AfterAll
    static void clean() {
        files.close();
    }

    @FuzzTest(maxDuration = "3m")
    void read(byte[] data) {
        BOUNDED.run(() -> FuzzFiles.readAllWays(files.write("input.nii", data), ReadLimits.DEFAULT));
    }
}
