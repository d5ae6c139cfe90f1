package org.accordia.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/**
 * Fuzz target for TIFF masks read through ImageJ ({@link ImageJReader}): the bytes are written
 * to a {@code .tif} file and read as labels, as an image and for the geometry, with the default
 * limits. This covers our own directory-chain walk ({@link TiffDirectories}), the size check from
 * ImageJ's {@code TiffDecoder}, and ImageJ's {@code Opener}/{@code FileOpener} behind it. The
 * property: only {@link InputException} escapes; no other exception, no error, no hang (10 s per
 * input, {@link org.accordia.hostile.Bounded}). Seeds (8- and 16-bit, float, stacks, calibrated,
 * big-endian, strips, a directory chain that loops):
 * {@code src/test/resources/org/accordia/io/TiffFuzzTestInputs/read/}.
 */
class TiffFuzzTest {
    private static FuzzFiles files;
    private static final org.accordia.hostile.Bounded BOUNDED = new org.accordia.hostile.Bounded();

    @BeforeAll
    static void scratch() {
        files = new FuzzFiles("accordia-fuzz-tiff");
    }

    @AfterAll
    static void clean() {
        files.close();
    }

    @FuzzTest(maxDuration = "3m")
    void read(byte[] data) {
        BOUNDED.run(() -> FuzzFiles.readAllWays(files.write("input.tif", data), ReadLimits.DEFAULT));
    }
}
