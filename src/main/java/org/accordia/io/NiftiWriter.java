package org.accordia.io;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.Locale;
import java.util.zip.Deflater;
import java.util.zip.GZIPOutputStream;

/**
 * Writes single-file NIfTI-1 volumes ({@code .nii.gz} compressed, {@code .nii} raw), little-endian.
 *
 * <p>Header as defined in {@code nifti1.h} (NIfTI Data Format Working Group): sizeof_hdr 348,
 * magic {@code "n+1\0"}, vox_offset 352 (four zero extension bytes after the header), dim[0] = 3
 * (a 2-D grid is written with dim[3] = 1), pixdim[1..3] = spacing in mm, xyzt_units = 2 (mm),
 * scl_slope = 1, scl_inter = 0. The geometry's affine is written exactly as the sform
 * (sform_code = 1, scanner) and as the nearest qform (qform_code = 1): quaternion of the rotation
 * part with qfac = pixdim[0] = -1 for a left-handed grid; a sheared affine keeps its exact sform
 * and gets the nearest rotation in the qform.
 *
 * <p>Output is deterministic (the gzip header written by {@link GZIPOutputStream} carries
 * modification time 0 and no file name) and atomic: the bytes go to a temporary file in the
 * target folder, which is then renamed onto the target.
 */
public final class NiftiWriter {
    static final int HEADER_BYTES = 348;
    static final int VOX_OFFSET = 352;

    static final short DT_UINT8 = 2;
    static final short DT_UINT16 = 512;
    static final short DT_FLOAT32 = 16;

    private NiftiWriter() {
    }

    /**
     * How the bytes of a volume are encoded. The two gzip variants compress differently (speed
     * against size); each is deterministic and any gzip reader decodes both to the same bytes.
     */
    public enum Compression {
        /** Plain {@code .nii}. */
        NONE(0),
        /**
         * gzip for mostly-zero volumes ({@link ZeroRunGzipOutputStream}): long runs of zero bytes
         * as ready-made deflate blocks, the rest at deflate level 1. For outputs written on every
         * run (the consensus files). Measured on a 256×256×128 float32 consensus map of the
         * benchmark study: 5 ms and 64 KB, against 81 ms and 49 KB for {@link #SMALL} and 35 ms
         * and 169 KB for plain level 1 (docs/outputs.md).
         */
        FAST(Deflater.BEST_SPEED),
        /** gzip at zlib's default level 6. For files written once and kept (the demo study). */
        SMALL(Deflater.DEFAULT_COMPRESSION);

        private final int level;

        Compression(int level) {
            this.level = level;
        }
    }

    /**
     * Writes a label mask: uint8 when the largest label is at most 255, else uint16.
     *
     * @throws IllegalArgumentException when a label exceeds 65535 or the name does not end in
     *     .nii or .nii.gz
     */
    public static void writeLabels(Path out, LabelVolume v) throws IOException {
        checkName(out);
        writeAtomically(out, os -> writeLabels(os, v, compressionOf(out)));
    }

    /**
     * Writes a label mask as a complete NIfTI-1 file to {@code os}, encoded as {@code compression};
     * for callers that manage the file themselves (e.g. an atomic output folder). Finishes the gzip
     * stream but does not close {@code os}.
     */
    public static void writeLabels(OutputStream os, LabelVolume v, Compression compression) throws IOException {
        if (v.maxLabel() > 65535) {
            throw new IllegalArgumentException("label " + v.maxLabel() + " exceeds 65535, the largest a uint16 NIfTI mask holds");
        }
        Geometry g = v.geometry();
        int n = v.voxelCount();
        if (v.isCompact()) {
            byte[] data = v.bytes();
            encode(os, compression, g, DT_UINT8, 8, 0, v.maxLabel(), o -> o.write(data, 0, n));
        } else {
            int[] labels = v.ints();
            encode(os, compression, g, DT_UINT16, 16, 0, v.maxLabel(), o -> {
                byte[] buf = new byte[1 << 16];
                int k = 0;
                for (int i = 0; i < n; i++) {
                    int value = labels[i];
                    buf[k++] = (byte) value;
                    buf[k++] = (byte) (value >>> 8);
                    if (k == buf.length) {
                        o.write(buf, 0, k);
                        k = 0;
                    }
                }
                o.write(buf, 0, k);
            });
        }
    }

    /** Writes per-voxel probabilities (or any float map) as float32. */
    public static void writeProbability(Path out, Geometry g, float[] values) throws IOException {
        checkName(out);
        writeAtomically(out, os -> writeProbability(os, g, values, compressionOf(out)));
    }

    /**
     * Writes a float32 map as a complete NIfTI-1 file to {@code os} (see
     * {@link #writeLabels(OutputStream, LabelVolume, Compression)}); does not close {@code os}.
     */
    public static void writeProbability(OutputStream os, Geometry g, float[] values, Compression compression)
            throws IOException {
        if (values.length != g.voxelCount()) {
            throw new IllegalArgumentException("values has " + values.length + " entries, geometry "
                + g.dimsText() + " needs " + g.voxelCount());
        }
        encode(os, compression, g, DT_FLOAT32, 32, 0, 1, o -> writeFloats(o, g, values));
    }

    /** Supplies a float volume one x-row at a time, so that it can be written without a full-grid array. */
    @FunctionalInterface
    public interface FloatRows {
        /** Fills {@code row} (length nx) with row y of slice z, x ascending. */
        void fill(int y, int z, float[] row);
    }

    /**
     * As {@link #writeProbability(OutputStream, Geometry, float[], Compression)} with the values
     * supplied row by row (the same bytes as the full array holding those rows).
     */
    public static void writeProbability(OutputStream os, Geometry g, FloatRows rows, Compression compression)
            throws IOException {
        encode(os, compression, g, DT_FLOAT32, 32, 0, 1, o -> writeRows(o, g, rows));
    }

    /** Writes an intensity image as float32. */
    public static void writeImage(Path out, ImageVolume v) throws IOException {
        checkName(out);
        writeAtomically(out, os -> encode(os, compressionOf(out), v.geometry(), DT_FLOAT32, 32, 0, 0,
            o -> writeFloats(o, v.geometry(), v.data())));
    }

    private static void writeFloats(OutputStream os, Geometry g, float[] values) throws IOException {
        int nx = g.nx();
        int ny = g.ny();
        writeRows(os, g, (y, z, row) -> System.arraycopy(values, nx * (y + ny * z), row, 0, nx));
    }

    /** Little-endian float32 rows, gathered into blocks of about 64 KiB per write (bulk conversion). */
    private static void writeRows(OutputStream os, Geometry g, FloatRows rows) throws IOException {
        int nx = g.nx();
        int rowsPerBlock = Math.max(1, (1 << 14) / nx);
        ByteBuffer bb = ByteBuffer.allocate(4 * nx * rowsPerBlock).order(ByteOrder.LITTLE_ENDIAN);
        java.nio.FloatBuffer fb = bb.asFloatBuffer();
        float[] row = new float[nx];
        int inBlock = 0;
        for (int z = 0; z < g.nz(); z++) {
            for (int y = 0; y < g.ny(); y++) {
                rows.fill(y, z, row);
                fb.put(row);
                if (++inBlock == rowsPerBlock) {
                    os.write(bb.array(), 0, 4 * nx * inBlock);
                    fb.clear();
                    inBlock = 0;
                }
            }
        }
        os.write(bb.array(), 0, 4 * nx * inBlock);
    }

    private static void checkName(Path out) {
        String name = out.getFileName().toString().toLowerCase(Locale.ROOT);
        if (!name.endsWith(".nii") && !name.endsWith(".nii.gz")) {
            throw new IllegalArgumentException("NIfTI output must end in .nii or .nii.gz: " + out);
        }
    }

    @FunctionalInterface
    private interface Body {
        void write(OutputStream os) throws IOException;
    }

    /** By the file name: {@code .nii.gz} → {@link Compression#SMALL}, {@code .nii} → none. */
    private static Compression compressionOf(Path out) {
        return out.getFileName().toString().toLowerCase(Locale.ROOT).endsWith(".gz") ? Compression.SMALL
            : Compression.NONE;
    }

    /** Header then body, gzip-compressed or buffered; finishes the encoding, leaves {@code target} open. */
    private static void encode(OutputStream target, Compression compression, Geometry g, short datatype, int bitpix, double calMin,
                               double calMax, Body body) throws IOException {
        OutputStream shield = new java.io.FilterOutputStream(target) {
            @Override
            public void write(byte[] b, int off, int len) throws IOException {
                out.write(b, off, len);
            }

            @Override
            public void close() throws IOException {
                flush();
            }
        };
        try (OutputStream os = compression == Compression.NONE ? new BufferedOutputStream(shield, 1 << 16)
                : compression == Compression.FAST
                    ? new ZeroRunGzipOutputStream(new BufferedOutputStream(shield, 1 << 16), compression.level)
                    : gzip(shield, compression.level)) {
            os.write(header(g, datatype, bitpix, calMin, calMax));
            body.write(os);
        }
    }

    /** A gzip stream at the given deflate level (the gzip header is the same for every level). */
    private static OutputStream gzip(OutputStream target, int level) throws IOException {
        return new GZIPOutputStream(target, 1 << 16) {
            {
                def.setLevel(level);
            }
        };
    }

    private static void writeAtomically(Path out, Body body) throws IOException {
        Path dir = out.toAbsolutePath().getParent();
        Files.createDirectories(dir);
        // Not Files.createTempFile: that would create the file with owner-only permissions; this
        // keeps the permissions the process's umask gives any new file.
        Path tmp = null;
        OutputStream file = null;
        for (int attempt = 0; file == null; attempt++) {
            tmp = dir.resolve("." + out.getFileName() + "." + ProcessHandle.current().pid() + "."
                + Long.toHexString(System.nanoTime() + attempt) + ".part");
            try {
                file = Files.newOutputStream(tmp, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE);
            } catch (FileAlreadyExistsException e) {
                if (attempt > 100) {
                    throw e;
                }
            }
        }
        boolean done = false;
        try {
            try (OutputStream target = file) {
                body.write(target);
            }
            try {
                Files.move(tmp, out, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, out, StandardCopyOption.REPLACE_EXISTING);
            }
            done = true;
        } finally {
            if (!done) {
                Files.deleteIfExists(tmp);
            }
        }
    }

    /** The 348-byte header plus the 4 extension bytes (all zero), little-endian. */
    static byte[] header(Geometry g, short datatype, int bitpix, double calMin, double calMax) {
        ByteBuffer h = ByteBuffer.allocate(VOX_OFFSET).order(ByteOrder.LITTLE_ENDIAN);
        double[][] a = g.affine();
        double[] q = Quaternions.fromAffine(a);
        h.putInt(0, HEADER_BYTES);
        h.put(38, (byte) 'r'); // "regular", as Analyze 7.5 expects
        short[] dim = {3, (short) g.nx(), (short) g.ny(), (short) g.nz(), 1, 1, 1, 1};
        for (int d = 1; d <= 3; d++) {
            if (g.dims()[d - 1] > Short.MAX_VALUE) {
                throw new IllegalArgumentException("dimension " + g.dims()[d - 1] + " exceeds NIfTI-1's limit of 32767");
            }
        }
        for (int i = 0; i < 8; i++) {
            h.putShort(40 + 2 * i, dim[i]);
        }
        h.putShort(70, datatype);
        h.putShort(72, (short) bitpix);
        float[] pixdim = {(float) q[3], (float) g.spacing(0), (float) g.spacing(1), (float) g.spacing(2), 1, 1, 1, 1};
        for (int i = 0; i < 8; i++) {
            h.putFloat(76 + 4 * i, pixdim[i]);
        }
        h.putFloat(108, VOX_OFFSET);
        h.putFloat(112, 1f); // scl_slope
        h.putFloat(116, 0f); // scl_inter
        h.put(123, (byte) 2); // xyzt_units: NIFTI_UNITS_MM, time unknown
        h.putFloat(124, (float) calMax);
        h.putFloat(128, (float) calMin);
        byte[] descrip = "Accordia".getBytes(StandardCharsets.US_ASCII);
        h.put(148, descrip);
        h.putShort(252, (short) 1); // qform_code: NIFTI_XFORM_SCANNER_ANAT
        h.putShort(254, (short) 1); // sform_code: NIFTI_XFORM_SCANNER_ANAT
        h.putFloat(256, (float) q[0]);
        h.putFloat(260, (float) q[1]);
        h.putFloat(264, (float) q[2]);
        h.putFloat(268, (float) a[0][3]);
        h.putFloat(272, (float) a[1][3]);
        h.putFloat(276, (float) a[2][3]);
        for (int r = 0; r < 3; r++) {
            for (int c = 0; c < 4; c++) {
                h.putFloat(280 + 16 * r + 4 * c, (float) a[r][c]);
            }
        }
        h.put(344, new byte[] {'n', '+', '1', 0});
        return h.array();
    }
}
