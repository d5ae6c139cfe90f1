package org.accordia.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.HexFormat;
import java.util.SplittableRandom;
import java.util.zip.GZIPInputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * {@link ZeroRunGzipOutputStream} against gzip readers outside the project: the JDK's
 * {@link GZIPInputStream} (RFC 1952, CRC-32 and length checked) on data with zero runs of every
 * length class around the cut ({@code MIN_RUN} − 1, {@code MIN_RUN}, multiples of {@code UNIT},
 * longer than the largest ready-made block) written in random pieces; and CPython's {@code gzip}
 * module (zlib) on the committed file {@code fixtures/io/zero_runs.bin.gz}, which
 * {@link #main} wrote with this class and {@code fixtures/io/check_zero_runs.py} decoded
 * (SHA-256 and length in {@code zero_runs_expected.json}).
 */
class ZeroRunGzipTest {
    static final Path DIR = Path.of("src/test/resources/fixtures/io");

    /** Data with zero runs of the interesting lengths between random non-zero stretches; deterministic. */
    static byte[] sample(long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        int minRun = ZeroRunGzipOutputStream.MIN_RUN;
        int unit = ZeroRunGzipOutputStream.UNIT;
        int biggest = unit << ZeroRunGzipOutputStream.MAX_SHIFT;
        int[] runs = {0, 1, 7, 8, 100, minRun - 1, minRun, minRun + 1, 3 * unit, 3 * unit + 5, 65_536, 65_537,
            biggest, biggest + unit + 3, 2 * biggest + 1};
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        for (int k = 0; k < runs.length; k++) {
            int data = rnd.nextInt(1, 3000);
            for (int i = 0; i < data; i++) {
                // non-zero bytes with scattered short zero stretches, like float data
                o.write(rnd.nextInt(4) == 0 ? 0 : rnd.nextInt(1, 256));
            }
            o.write(new byte[runs[k]], 0, runs[k]);
        }
        o.write(new byte[100], 0, 100); // ends on zeros shorter than a cut
        return o.toByteArray();
    }

    static byte[] compress(byte[] data, SplittableRandom pieces) throws IOException {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        try (ZeroRunGzipOutputStream z = new ZeroRunGzipOutputStream(o, 1)) {
            int i = 0;
            while (i < data.length) {
                int n = pieces == null ? data.length - i : Math.min(data.length - i, 1 + pieces.nextInt(pieces.nextBoolean() ? 16 : 200_000));
                if (n == 1) {
                    z.write(data[i]);
                } else {
                    z.write(data, i, n);
                }
                i += n;
            }
        }
        return o.toByteArray();
    }

    static byte[] gunzip(byte[] gz) throws IOException {
        try (GZIPInputStream in = new GZIPInputStream(new ByteArrayInputStream(gz))) {
            return in.readAllBytes();
        }
    }

    @ParameterizedTest
    @ValueSource(longs = {1, 2, 3})
    void roundTripsWhateverTheWritePieces(long seed) throws IOException {
        byte[] data = sample(seed);
        byte[] whole = compress(data, null);
        assertArrayEquals(data, gunzip(whole));
        for (int trial = 0; trial < 3; trial++) {
            byte[] pieces = compress(data, new SplittableRandom(seed * 31 + trial));
            assertArrayEquals(data, gunzip(pieces));
            assertArrayEquals(whole, pieces, "the same bytes however the data arrive");
        }
        // the long runs cost next to nothing: far smaller than the data
        assertTrue(whole.length < data.length / 100, whole.length + " bytes for " + data.length);
    }

    @Test
    void edgeCases() throws IOException {
        for (byte[] data : new byte[][] {new byte[0], new byte[1], {5}, new byte[ZeroRunGzipOutputStream.MIN_RUN],
            new byte[(ZeroRunGzipOutputStream.UNIT << ZeroRunGzipOutputStream.MAX_SHIFT) * 2 + 3]}) {
            assertArrayEquals(data, gunzip(compress(data, null)), data.length + " bytes");
        }
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ZeroRunGzipOutputStream z = new ZeroRunGzipOutputStream(o, 1);
        z.write(new byte[] {1, 2, 3});
        z.finish();
        z.finish(); // idempotent
        assertThrows(IOException.class, () -> z.write(4));
        // RFC 1952 header: magic, deflate, no flags, MTIME 0
        byte[] b = o.toByteArray();
        assertArrayEquals(new byte[] {0x1f, (byte) 0x8b, 8, 0, 0, 0, 0, 0}, java.util.Arrays.copyOf(b, 8));
    }

    @Test
    void pythonGzipDecodesTheCommittedFile() throws Exception {
        JsonNode expected = new ObjectMapper().readTree(DIR.resolve("zero_runs_expected.json").toFile());
        byte[] data = sample(expected.get("seed").asLong());
        assertEquals(expected.get("length").asLong(), data.length);
        assertEquals(expected.get("sha256").asText(), HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(data)));
        assertArrayEquals(data, gunzip(Files.readAllBytes(DIR.resolve("zero_runs.bin.gz"))));
    }

    /** Writes the committed fixture: {@code java -cp target/classes:target/test-classes org.accordia.io.ZeroRunGzipTest DIR}. */
    public static void main(String[] args) throws IOException {
        Files.write(Path.of(args[0]).resolve("zero_runs.bin.gz"), compress(sample(20261202L), null));
    }
}
