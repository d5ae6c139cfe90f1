package org.accordia.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.io.UncheckedIOException;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/**
 * Fuzz targets for the NRRD reader. {@link #attached} writes the bytes as a {@code .nrrd} file
 * (header and data in one); {@link #detached} writes them as a {@code .nhdr} header with small
 * data files beside it ({@code data.raw}: 64 bytes 0..63; {@code data.raw.gz}: the same
 * gzip-compressed; {@code lines.txt}: three text lines then 64 bytes) for the header to name.
 * The property: only {@link InputException} escapes, no error, no hang (10 s per input, {@link org.accordia.hostile.Bounded}).
 * Seeds: {@code src/test/resources/org/accordia/io/NrrdFuzzTestInputs/<method>/}.
 */
class NrrdFuzzTest {
    private static FuzzFiles files;
    private static final org.accordia.hostile.Bounded BOUNDED = new org.accordia.hostile.Bounded();

    @BeforeAll
    static void scratch() throws IOException {
        files = new FuzzFiles("accordia-fuzz-nrrd");
        writeDataFiles(files);
    }

    /** The data files a detached header may point at (shared with the MetaImage target). */
    static void writeDataFiles(FuzzFiles f) {
        byte[] data = new byte[64];
        for (int i = 0; i < data.length; i++) {
            data[i] = (byte) i;
        }
        f.write("data.raw", data);
        try {
            f.write("data.raw.gz", TestFiles.gzip(data));
            f.write("data.zlib", TestFiles.zlib(data));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        f.write("lines.txt", TestFiles.concat(TestFiles.ascii("one\ntwo\nthree\n"), data));
    }

    @AfterAll
    static void clean() {
        files.close();
    }

    @FuzzTest(maxDuration = "3m")
    void attached(byte[] data) {
        BOUNDED.run(() -> FuzzFiles.readAllWays(files.write("input.nrrd", data), ReadLimits.DEFAULT));
    }

    @FuzzTest(maxDuration = "3m")
    void detached(byte[] header) {
        BOUNDED.run(() -> FuzzFiles.readAllWays(files.write("input.nhdr", header), ReadLimits.DEFAULT));
    }
}
