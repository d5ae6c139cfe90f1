package org.accordia.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/**
 * Fuzz targets for the MetaImage reader. {@link #local} writes the bytes as a {@code .mha} file
 * (header and {@code ElementDataFile = LOCAL} data in one); {@link #detached} writes them as a
 * {@code .mhd} header beside the data files of {@link NrrdFuzzTest#writeDataFiles}. The property:
 * only {@link InputException} escapes, no error, no hang (10 s per input, {@link org.accordia.hostile.Bounded}). Seeds:
 * {@code src/test/resources/org/accordia/io/MetaImageFuzzTestInputs/<method>/}.
 */
class MetaImageFuzzTest {
    private static FuzzFiles files;
    private static final org.accordia.hostile.Bounded BOUNDED = new org.accordia.hostile.Bounded();

    @BeforeAll
    static void scratch() {
        files = new FuzzFiles("accordia-fuzz-mha");
        NrrdFuzzTest.writeDataFiles(files);
    }

    @AfterAll
    static void clean() {
        files.close();
    }

    @FuzzTest(maxDuration = "3m")
    void local(byte[] data) {
        BOUNDED.run(() -> FuzzFiles.readAllWays(files.write("input.mha", data), ReadLimits.DEFAULT));
    }

    @FuzzTest(maxDuration = "3m")
    void detached(byte[] header) {
        BOUNDED.run(() -> FuzzFiles.readAllWays(files.write("input.mhd", header), ReadLimits.DEFAULT));
    }
}
