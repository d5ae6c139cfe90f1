package org.accordia.io;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.Channels;
import java.nio.channels.FileChannel;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Locale;
import java.util.zip.GZIPInputStream;
import java.util.zip.Inflater;
import java.util.zip.InflaterInputStream;
import java.util.zip.ZipException;

/**
 * The bounded payload decoder shared by the NIfTI, NRRD and MetaImage readers.
 *
 * <p>It reads exactly the declared number of bytes, in chunks of at most {@value #CHUNK_BYTES}
 * bytes, from a raw region of a file or from a gzip or zlib stream starting at a file offset, and
 * converts them in bulk into a {@link LabelVolume} or an {@link ImageVolume}. Before anything is
 * allocated it checks the declared voxel count against {@link ReadLimits#maxVoxels()} and 64-bit
 * overflow, and checks that the file can hold the payload: a raw payload must fit in the file; a
 * compressed payload must not exceed what the compressed bytes could expand to (deflate expands at
 * most about 1032:1). After the declared bytes it tries to read a single further byte from a
 * compressed stream: finding one is an error ("payload larger than declared"), so a gzip bomb is
 * inflated only to the declared size plus one byte. Trailing bytes after a raw payload are
 * ignored.
 */
final class Payload {
    /** Bytes decoded per chunk; a multiple of every sample size. */
    static final int CHUNK_BYTES = 1 << 20;

    /** Upper bound of deflate's expansion ratio (a 258-byte match costs at least 2 bits). */
    private static final long DEFLATE_MAX_RATIO = 1032;

    private static final int STREAM_BUFFER = 1 << 16;

    private Payload() {
    }

    /** How the payload bytes are stored. */
    enum Compression {
        RAW, GZIP, ZLIB;

        String label() {
            return this == GZIP ? "gzip" : "zlib";
        }
    }

    /**
     * Where the payload lies and how to decode it.
     *
     * @param dataFile the file holding the payload (may differ from the header file)
     * @param fileOffset byte offset in {@code dataFile} where the raw payload or the compressed
     *     stream starts (ignored for a raw payload when {@code dataAtEnd})
     * @param compression raw, gzip or zlib
     * @param skipDecompressed bytes of decompressed data to discard before the payload (NIfTI
     *     header inside a .nii.gz, NRRD byte skip on compressed data)
     * @param dataAtEnd for raw data: the payload is the last bytes of the file (NRRD byte skip -1,
     *     MetaImage HeaderSize -1)
     * @param type the sample type
     * @param order the byte order of multi-byte samples
     */
    record Layout(Path dataFile, long fileOffset, Compression compression, long skipDecompressed,
                  boolean dataAtEnd, SampleType type, ByteOrder order) {
    }

    /**
     * How many leading bytes of {@code file} a read of this payload uses: for a raw payload in the
     * file, up to the end of the payload (bytes after it are never read); for a compressed payload,
     * the compressed stream, bounded by the declared bytes plus 0.1 % and 1 MiB (deflate's stored
     * blocks add 5 bytes per 64 KiB; the rest covers gzip headers); for a header whose payload
     * lies in another file, the header text read ({@link TextHeaders#MAX_HEADER_BYTES} at most).
     */
    static long bytesRead(Path file, Layout l, long voxels) throws InputException {
        long size = fileSize(file, file);
        if (!l.dataFile().equals(file) && !l.dataFile().equals(realOrSelf(file))) {
            return Math.min(size, TextHeaders.MAX_HEADER_BYTES);
        }
        if (l.compression() == Compression.RAW && l.dataAtEnd()) {
            return size;
        }
        long payload = voxels * l.type().bytes();
        long end = l.compression() == Compression.RAW ? l.fileOffset() + payload
            : l.fileOffset() + l.skipDecompressed() + payload + payload / 1000 + (1 << 20);
        return Math.min(size, Math.max(0, end));
    }

    private static Path realOrSelf(Path file) {
        try {
            return file.toRealPath();
        } catch (IOException e) {
            return file;
        }
    }

    /**
     * The product of the declared dimensions, refused when any is not positive, when the product
     * overflows 64 bits, or when it exceeds the limit.
     */
    static long voxelCount(Path file, long[] dims, ReadLimits limits) throws InputException {
        long n = 1;
        for (int d = 0; d < dims.length; d++) {
            if (dims[d] <= 0) {
                throw new InputException(file, "dimension " + (d + 1) + " is " + dims[d] + " (must be positive)");
            }
        }
        try {
            for (long d : dims) {
                n = Math.multiplyExact(n, d);
            }
        } catch (ArithmeticException e) {
            throw new InputException(file, "declared dimensions " + join(dims) + " overflow a 64-bit voxel count");
        }
        if (n > limits.maxVoxels()) {
            throw new InputException(file, "declares " + n + " voxels (" + join(dims)
                + "), more than the limit of " + limits.maxVoxels());
        }
        return n;
    }

    static String join(long[] dims) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < dims.length; i++) {
            if (i > 0) {
                sb.append('x');
            }
            sb.append(dims[i]);
        }
        return sb.toString();
    }

    // ---------------------------------------------------------------- labels

    /**
     * Reads the payload as labels, applying {@code value * slope + inter} when {@code scaled}.
     * Every value must be integral, finite, non-negative and at most {@link Integer#MAX_VALUE};
     * the first offending value is named in the error.
     */
    static LabelVolume readLabels(Path file, Layout layout, Geometry g, boolean scaled, double slope, double inter)
            throws InputException {
        long count = g.voxelCount();
        checkFits(file, layout, count);
        checkHeap(file, count, count, "label");
        LabelBuilder out = new LabelBuilder((int) count);
        SampleType t = layout.type();
        ChunkSink sink;
        if (t == SampleType.UINT8 && !scaled) {
            // Fast path: bytes go straight from the file or the inflater into the label array.
            stream(file, layout, count, null, out.bytes);
            return LabelVolume.ofBytes(g, out.bytes);
        } else if (!t.isFloating() && !scaled) {
            long[] tmp = new long[chunkSamples(count, t)];
            sink = (buf, first, n) -> {
                t.decodeLongs(buf, tmp, n);
                for (int i = 0; i < n; i++) {
                    long v = tmp[i];
                    if (v < 0 && t != SampleType.UINT64) {
                        throw new InputException(file, "negative label value " + v + " at voxel " + where(g, first + i));
                    }
                    if (v < 0 || v > Integer.MAX_VALUE) {
                        throw new InputException(file, "label value " + Long.toUnsignedString(v)
                            + " exceeds the largest supported label " + Integer.MAX_VALUE + " at voxel " + where(g, first + i));
                    }
                    out.put(first + i, (int) v);
                }
            };
        } else {
            double[] tmp = new double[chunkSamples(count, t)];
            sink = (buf, first, n) -> {
                t.decodeDoubles(buf, tmp, n);
                for (int i = 0; i < n; i++) {
                    double v = scaled ? tmp[i] * slope + inter : tmp[i];
                    if (Double.isNaN(v)) {
                        throw new InputException(file, "label value NaN at voxel " + where(g, first + i));
                    }
                    if (v != Math.rint(v) || Double.isInfinite(v)) {
                        throw new InputException(file, "non-integral label value " + fmt(v)
                            + " at voxel " + where(g, first + i) + (scaled ? " (after scaling)" : ""));
                    }
                    if (v < 0) {
                        throw new InputException(file, "negative label value " + fmt(v) + " at voxel " + where(g, first + i));
                    }
                    if (v > Integer.MAX_VALUE) {
                        throw new InputException(file, "label value " + fmt(v) + " exceeds the largest supported label "
                            + Integer.MAX_VALUE + " at voxel " + where(g, first + i));
                    }
                    out.put(first + i, (int) v);
                }
            };
        }
        stream(file, layout, count, sink, null);
        return out.ints != null ? LabelVolume.ofInts(g, out.ints) : LabelVolume.ofBytes(g, out.bytes);
    }

    // ---------------------------------------------------------------- images

    /** Reads the payload as floats, applying {@code value * slope + inter} when {@code scaled}. */
    static ImageVolume readImage(Path file, Layout layout, Geometry g, boolean scaled, double slope, double inter)
            throws InputException {
        long count = g.voxelCount();
        checkFits(file, layout, count);
        checkHeap(file, count, 4 * count, "image");
        float[] out = new float[(int) count];
        SampleType t = layout.type();
        ChunkSink sink;
        if (t == SampleType.FLOAT32 && !scaled) {
            sink = (buf, first, n) -> buf.asFloatBuffer().get(out, first, n);
        } else {
            double[] tmp = new double[chunkSamples(count, t)];
            sink = (buf, first, n) -> {
                t.decodeDoubles(buf, tmp, n);
                for (int i = 0; i < n; i++) {
                    out[first + i] = (float) (scaled ? tmp[i] * slope + inter : tmp[i]);
                }
            };
        }
        stream(file, layout, count, sink, null);
        return new ImageVolume(g, out);
    }

    /**
     * Refuses, before allocating, a volume whose array alone is larger than the most the Java heap
     * may ever hold ({@link Runtime#maxMemory()}): such a read could only end in an
     * OutOfMemoryError. Deterministic for a given heap size; a volume that fits the heap but not
     * beside everything else in memory is left to the command line's out-of-memory message.
     */
    static void checkHeap(Path file, long count, long bytes, String what) throws InputException {
        long max = Runtime.getRuntime().maxMemory();
        if (max != Long.MAX_VALUE && bytes > max) {
            throw new InputException(file, "the " + what + " volume of " + count + " voxels needs " + mib(bytes)
                + " MiB, more than the " + mib(max) + " MiB the Java heap may use (raise the heap with -Xmx, "
                + "e.g. ACCORDIA_JAVA_OPTS=-Xmx16g, or lower --max-voxels to refuse such volumes sooner)");
        }
    }

    private static long mib(long bytes) {
        return (bytes + (1 << 20) - 1) >> 20;
    }

    /** Samples per chunk: a full chunk, or the whole payload when smaller. */
    private static int chunkSamples(long count, SampleType t) {
        return (int) Math.min(count, CHUNK_BYTES / t.bytes());
    }

    // ---------------------------------------------------------------- streaming core

    /** Receives {@code n} samples starting at the buffer's position; sample {@code first} is the first. */
    @FunctionalInterface
    private interface ChunkSink {
        void accept(ByteBuffer buf, int first, int n) throws InputException;
    }

    /** Refuses, before any allocation, a payload the file cannot hold. */
    static void checkFits(Path file, Layout l, long count) throws InputException {
        long nbytes = Math.multiplyExact(count, (long) l.type().bytes());
        long size = fileSize(file, l.dataFile());
        if (l.compression() == Compression.RAW) {
            long start = l.dataAtEnd() ? size - nbytes : l.fileOffset();
            if (start < 0 || size - start < nbytes) {
                long found = l.dataAtEnd() ? size : Math.max(0, size - start);
                throw new InputException(file, "truncated data: expected " + nbytes + " bytes, found " + found
                    + dataFileNote(file, l));
            }
        } else {
            long available = size - l.fileOffset();
            if (available <= 0) {
                throw new InputException(file, "truncated data: expected " + nbytes + " bytes, found 0" + dataFileNote(file, l));
            }
            if (available < Long.MAX_VALUE / (2 * DEFLATE_MAX_RATIO)) {
                long most = available * DEFLATE_MAX_RATIO + 1024;
                long needed = l.skipDecompressed() + nbytes;
                if (needed < 0 || needed > most) {
                    throw new InputException(file, "truncated data: expected " + nbytes + " bytes"
                        + (l.skipDecompressed() > 0 ? " starting at byte " + l.skipDecompressed() : "") + ", but " + available
                        + " bytes of " + l.compression().label() + " data can expand to at most " + most + dataFileNote(file, l));
                }
            }
        }
    }

    private static String dataFileNote(Path file, Layout l) {
        return l.dataFile().equals(file) ? "" : " in data file " + l.dataFile();
    }

    static long fileSize(Path reported, Path file) throws InputException {
        try {
            return java.nio.file.Files.size(file);
        } catch (NoSuchFileException e) {
            throw new InputException(reported, reported.equals(file) ? "file not found" : "data file not found: " + file);
        } catch (IOException e) {
            throw new InputException(reported, "cannot read " + file + ": " + e.getMessage(), e);
        }
    }

    /**
     * Streams the payload in chunks to {@code sink}, or, when {@code direct} is given (one-byte
     * samples only), reads it straight into that array.
     */
    private static void stream(Path file, Layout l, long count, ChunkSink sink, byte[] direct) throws InputException {
        int sampleBytes = l.type().bytes();
        long nbytes = count * sampleBytes;
        int chunk = (int) Math.min(CHUNK_BYTES, Math.max(8, (nbytes + 7) / 8 * 8));
        byte[] buf = direct != null ? direct : new byte[chunk];
        ByteBuffer bb = ByteBuffer.wrap(buf).order(l.order());
        try (FileChannel ch = FileChannel.open(l.dataFile(), StandardOpenOption.READ)) {
            long size = ch.size();
            if (l.compression() == Compression.RAW) {
                long pos = l.dataAtEnd() ? size - nbytes : l.fileOffset();
                if (pos < 0 || size - pos < nbytes) {
                    throw new InputException(file, "truncated data: expected " + nbytes + " bytes, found "
                        + Math.max(0, size - Math.max(pos, 0)) + dataFileNote(file, l));
                }
                long done = 0;
                while (done < nbytes) {
                    int want = (int) Math.min(chunk, nbytes - done);
                    if (direct != null) {
                        bb.clear().position((int) done).limit((int) done + want);
                    } else {
                        bb.clear().limit(want);
                    }
                    int start = bb.position();
                    while (bb.hasRemaining()) {
                        int r = ch.read(bb, pos + done + bb.position() - start);
                        if (r < 0) {
                            throw new InputException(file, "truncated data: expected " + nbytes + " bytes, found "
                                + (done + bb.position() - start) + dataFileNote(file, l));
                        }
                    }
                    if (sink != null) {
                        bb.position(0);
                        sink.accept(bb, (int) (done / sampleBytes), want / sampleBytes);
                    }
                    done += want;
                }
                return;
            }
            ch.position(l.fileOffset());
            InputStream raw = Channels.newInputStream(ch);
            long done = 0;
            int inBuf = (int) Math.max(512, Math.min(STREAM_BUFFER, size - l.fileOffset()));
            try (InputStream in = l.compression() == Compression.GZIP
                    ? new GZIPInputStream(raw, inBuf)
                    : new InflaterInputStream(raw, new Inflater(), inBuf)) {
                long skip = l.skipDecompressed();
                byte[] scratch = direct != null ? new byte[(int) Math.min(chunk, Math.max(1, skip))] : buf;
                while (skip > 0) {
                    int want = (int) Math.min(scratch.length, skip);
                    if (readFully(in, scratch, 0, want) < want) {
                        throw new InputException(file, "truncated data: the " + l.compression().label()
                            + " stream ends before the payload starts (at byte " + l.skipDecompressed() + ")" + dataFileNote(file, l));
                    }
                    skip -= want;
                }
                while (done < nbytes) {
                    int want = (int) Math.min(chunk, nbytes - done);
                    int got = direct != null ? readFully(in, direct, (int) done, want) : readFully(in, buf, 0, want);
                    if (got < want) {
                        throw new InputException(file, "truncated data: expected " + nbytes + " bytes, found "
                            + (done + got) + dataFileNote(file, l));
                    }
                    if (sink != null) {
                        bb.clear().limit(want);
                        sink.accept(bb, (int) (done / sampleBytes), want / sampleBytes);
                    }
                    done += want;
                }
                if (in.read() >= 0) {
                    throw new InputException(file, "payload larger than declared: the " + l.compression().label()
                        + " stream holds more than the declared " + nbytes + " bytes" + dataFileNote(file, l));
                }
            } catch (EOFException e) {
                throw new InputException(file, "truncated data: expected " + nbytes + " bytes, found " + done
                    + " (the " + l.compression().label() + " stream ends early)" + dataFileNote(file, l), e);
            } catch (ZipException e) {
                throw new InputException(file, "corrupt " + l.compression().label() + " stream: " + e.getMessage()
                    + dataFileNote(file, l), e);
            }
        } catch (NoSuchFileException e) {
            throw new InputException(file, l.dataFile().equals(file) ? "file not found" : "data file not found: " + l.dataFile());
        } catch (IOException e) {
            throw new InputException(file, "cannot read " + l.dataFile() + ": " + e.getMessage(), e);
        }
    }

    /** Reads until {@code len} bytes or end of stream; returns the number read. */
    static int readFully(InputStream in, byte[] buf, int len) throws IOException {
        return readFully(in, buf, 0, len);
    }

    /** Reads into {@code buf[off, off + len)} until full or end of stream; returns the number read. */
    static int readFully(InputStream in, byte[] buf, int off, int len) throws IOException {
        int done = 0;
        while (done < len) {
            int r = in.read(buf, off + done, len - done);
            if (r < 0) {
                break;
            }
            done += r;
        }
        return done;
    }

    static String where(Geometry g, long index) {
        long nx = g.nx();
        long ny = g.ny();
        long x = index % nx;
        long y = (index / nx) % ny;
        long z = index / (nx * ny);
        return "(" + x + ", " + y + ", " + z + ")";
    }

    private static String fmt(double v) {
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return String.format(Locale.ROOT, "%s", v);
    }

    /** Label store that starts with one byte per voxel and widens to ints at the first label above 255. */
    private static final class LabelBuilder {
        byte[] bytes;
        int[] ints;

        LabelBuilder(int n) {
            bytes = new byte[n];
        }

        void put(int i, int v) {
            if (ints != null) {
                ints[i] = v;
            } else if (v <= 255) {
                bytes[i] = (byte) v;
            } else {
                ints = new int[bytes.length];
                for (int k = 0; k < i; k++) {
                    ints[k] = bytes[k] & 0xFF;
                }
                bytes = null;
                ints[i] = v;
            }
        }
    }
}
