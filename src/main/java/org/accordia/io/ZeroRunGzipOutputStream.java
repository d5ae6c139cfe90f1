package org.accordia.io;

import java.io.IOException;
import java.io.OutputStream;
import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.util.concurrent.ConcurrentHashMap;
import java.util.zip.CRC32;
import java.util.zip.Deflater;

/**
 * A gzip writer (RFC 1952, one member, deflate per RFC 1951) for data made mostly of long runs
 * of zero bytes, such as a consensus volume that is empty outside a small box. Any gzip reader
 * decodes it; the output is deterministic.
 *
 * <p>How: the data are cut at every run of at least {@link #MIN_RUN} zero bytes. The stretches in
 * between go through a {@link Deflater} at the given level, which is reset at the start of each
 * stretch (so no back-reference crosses a cut) and sync-flushed at its end (byte-aligned,
 * non-final blocks). A zero run contributes its largest multiple of {@link #UNIT} bytes as
 * ready-made deflate blocks of UNIT·2^k zeros (compressed once per process at level 9, each
 * self-contained and sync-flushed); its remainder is compressed with the next stretch. The last
 * stretch is finished (final block), then CRC-32 and length follow. Deflating a zero run costs as
 * much as any other data (about 40 ms per 32 MB at level 1 here); copying its ready-made blocks
 * costs next to nothing, and the blocks are smaller than level 1 makes.
 *
 * <p>Not thread-safe. {@link #close()} finishes the member and closes the target;
 * {@link #finish()} finishes without closing.
 */
public final class ZeroRunGzipOutputStream extends OutputStream {
    /** Shortest zero run cut out of the deflate stream, bytes. */
    static final int MIN_RUN = 8192;
    /** Granularity of the ready-made zero blocks, bytes. */
    static final int UNIT = 4096;
    /** Largest ready-made block: UNIT·2^MAX_SHIFT zeros (4 MiB). */
    static final int MAX_SHIFT = 10;

    private static final VarHandle LONGS = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);
    private static final byte[] ZEROS = new byte[1 << 16];
    private static final ConcurrentHashMap<Integer, byte[]> ZERO_BLOCKS = new ConcurrentHashMap<>();

    private final OutputStream out;
    private final Deflater deflater;
    private final CRC32 crc = new CRC32();
    private final byte[] buf = new byte[1 << 16];
    private final byte[] one = new byte[1];
    private long size;
    /** Zero bytes seen but not yet passed on (they may be the start of a long run). */
    private long pendingZeros;
    /** Whether the current stretch has fed the deflater since its last reset. */
    private boolean stretchHasData;
    private boolean finished;

    /**
     * @param out where the gzip member goes (written through, not buffered here)
     * @param level deflate level of the stretches between zero runs (0–9, or -1 for zlib's default)
     */
    public ZeroRunGzipOutputStream(OutputStream out, int level) throws IOException {
        this.out = out;
        this.deflater = new Deflater(level, true);
        // RFC 1952 header: magic, CM = 8 (deflate), no flags, MTIME 0, XFL 0, OS 255 (unknown)
        out.write(new byte[] {0x1f, (byte) 0x8b, 8, 0, 0, 0, 0, 0, 0, (byte) 0xff});
    }

    @Override
    public void write(int b) throws IOException {
        one[0] = (byte) b;
        write(one, 0, 1);
    }

    @Override
    public void write(byte[] b, int off, int len) throws IOException {
        if (finished) {
            throw new IOException("gzip stream already finished");
        }
        java.util.Objects.checkFromIndexSize(off, len, b.length);
        crc.update(b, off, len);
        size += len;
        int end = off + len;
        int i = off;
        while (i < end) {
            if (b[i] == 0) {
                int j = firstNonZero(b, i, end);
                pendingZeros += j - i;
                i = j;
                continue;
            }
            // non-zero data at i: settle the zeros before it, then feed up to the next long zero run
            settleZeros();
            int runStart = nextLongZeroRun(b, i, end);
            feed(b, i, runStart - i);
            i = runStart;
        }
    }

    /** Index of the first non-zero byte in [from, end), or end. */
    private static int firstNonZero(byte[] b, int from, int end) {
        int i = from;
        while (i < end && (i & 7) != 0) {
            if (b[i] != 0) {
                return i;
            }
            i++;
        }
        while (i + 8 <= end && (long) LONGS.get(b, i) == 0L) {
            i += 8;
        }
        while (i < end && b[i] == 0) {
            i++;
        }
        return i;
    }

    /**
     * Start of the first zero run in [from, end) that is at least {@link #MIN_RUN} long or reaches
     * {@code end} (a run at the end may go on in the next write); {@code end} when there is none.
     */
    private static int nextLongZeroRun(byte[] b, int from, int end) {
        int i = from;
        while (i < end) {
            if (b[i] != 0) {
                i++;
                continue;
            }
            int j = firstNonZero(b, i, end);
            if (j - i >= MIN_RUN || j == end) {
                return i;
            }
            i = j;
        }
        return end;
    }

    /** Passes on the pending zeros: as ready-made blocks when the run is long, else as data. */
    private void settleZeros() throws IOException {
        long z = pendingZeros;
        pendingZeros = 0;
        if (z >= MIN_RUN) {
            endStretch();
            long units = z / UNIT;
            while (units > 0) {
                int shift = Math.min(MAX_SHIFT, 63 - Long.numberOfLeadingZeros(units));
                out.write(zeroBlock(shift));
                units -= 1L << shift;
            }
            z %= UNIT;
        }
        while (z > 0) {
            int n = (int) Math.min(z, ZEROS.length);
            feed(ZEROS, 0, n);
            z -= n;
        }
    }

    private void feed(byte[] b, int off, int len) throws IOException {
        if (len == 0) {
            return;
        }
        deflater.setInput(b, off, len);
        drain(deflater, buf, out);
        stretchHasData = true;
    }

    /** Sync-flushes the current stretch (byte-aligned, not final) and starts a fresh one. */
    private void endStretch() throws IOException {
        if (!stretchHasData) {
            return;
        }
        syncFlush(deflater, buf, out);
        deflater.reset();
        stretchHasData = false;
    }

    /** UNIT·2^shift zero bytes as self-contained, sync-flushed, non-final deflate blocks. */
    static byte[] zeroBlock(int shift) {
        return ZERO_BLOCKS.computeIfAbsent(shift, s -> {
            Deflater d = new Deflater(Deflater.BEST_COMPRESSION, true);
            try {
                java.io.ByteArrayOutputStream o = new java.io.ByteArrayOutputStream();
                byte[] chunk = new byte[1 << 16];
                long left = (long) UNIT << s;
                byte[] zeros = new byte[UNIT];
                while (left > 0) {
                    int n = (int) Math.min(left, zeros.length);
                    d.setInput(zeros, 0, n);
                    drain(d, chunk, o);
                    left -= n;
                }
                syncFlush(d, chunk, o);
                return o.toByteArray();
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e); // a ByteArrayOutputStream does not fail
            } finally {
                d.end();
            }
        });
    }

    /** Compresses all of the deflater's pending input (no flush), writing what it emits. */
    private static void drain(Deflater d, byte[] buf, OutputStream to) throws IOException {
        while (!d.needsInput()) {
            to.write(buf, 0, d.deflate(buf, 0, buf.length, Deflater.NO_FLUSH));
        }
    }

    /** Sync-flushes the deflater: byte-aligned, non-final blocks, all of them written. */
    private static void syncFlush(Deflater d, byte[] buf, OutputStream to) throws IOException {
        int n;
        do {
            n = d.deflate(buf, 0, buf.length, Deflater.SYNC_FLUSH);
            to.write(buf, 0, n);
        } while (n == buf.length);
    }

    /** Writes the rest of the data, the final block and the trailer; the target stays open. */
    public void finish() throws IOException {
        if (finished) {
            return;
        }
        settleZeros();
        deflater.finish();
        while (!deflater.finished()) {
            int n = deflater.deflate(buf, 0, buf.length);
            out.write(buf, 0, n);
        }
        deflater.end();
        long c = crc.getValue();
        out.write(new byte[] {(byte) c, (byte) (c >>> 8), (byte) (c >>> 16), (byte) (c >>> 24),
            (byte) size, (byte) (size >>> 8), (byte) (size >>> 16), (byte) (size >>> 24)});
        finished = true;
    }

    @Override
    public void close() throws IOException {
        try {
            finish();
        } finally {
            out.close();
        }
    }
}
