package org.accordia.io;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Locale;
import java.util.zip.GZIPInputStream;
import java.util.zip.ZipException;

/**
 * Reads single-file NIfTI-1 and NIfTI-2 volumes ({@code .nii}, {@code .nii.gz}).
 *
 * <p>Header layouts from {@code nifti1.h} and {@code nifti2.h} (NIfTI Data Format Working
 * Group). Conventions (see docs/formats.md):
 * <ul>
 *   <li>Compression is detected from the gzip magic bytes, not the file name.</li>
 *   <li>Byte order from sizeof_hdr (348 or 540) read in both orders; magic must be "n+1"/"n+2"
 *       (detached "ni1"/"ni2" .hdr/.img pairs are refused).</li>
 *   <li>dim[0] must be 2..7; dims beyond the third must be 1; a 2-D image gets nz = 1.</li>
 *   <li>Data types: int8..uint64, float32, float64; others (RGB, complex, float128, binary) are
 *       refused as "unsupported datatype N".</li>
 *   <li>scl_slope/scl_inter applied when the slope is finite, non-zero and the pair is not (1, 0);
 *       a non-finite intercept counts as 0.</li>
 *   <li>Affine: sform when sform_code &gt; 0, else qform when qform_code &gt; 0 (qfac from
 *       pixdim[0], negative means -1), else diag(spacing) with zero offset ("method 1").</li>
 *   <li>Spatial unit from xyzt_units: metre x1000, mm x1, micron x0.001; unknown (0) is taken as
 *       mm. Spacing = |pixdim[1..3]| in mm.</li>
 * </ul>
 */
public final class NiftiReader implements VolumeReader {
    static final int NIFTI1_HEADER = 348;
    static final int NIFTI2_HEADER = 540;

    @Override
    public String formatName() {
        return "NIfTI";
    }

    @Override
    public boolean accepts(Path file) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        return name.endsWith(".nii") || name.endsWith(".nii.gz");
    }

    @Override
    public LabelVolume readLabels(Path file, ReadLimits limits) throws InputException {
        Header h = readHeader(file, limits);
        return Payload.readLabels(file, h.layout, h.geometry, h.scaled, h.slope, h.inter);
    }

    @Override
    public ImageVolume readImage(Path file, ReadLimits limits) throws InputException {
        Header h = readHeader(file, limits);
        return Payload.readImage(file, h.layout, h.geometry, h.scaled, h.slope, h.inter);
    }

    @Override
    public Geometry readGeometry(Path file, ReadLimits limits) throws InputException {
        return readHeader(file, limits).geometry;
    }

    @Override
    public long bytesRead(Path file, ReadLimits limits) throws InputException {
        Header h = readHeader(file, limits);
        return Payload.bytesRead(file, h.layout, h.geometry.voxelCount());
    }

    /** What the header says, checked. */
    record Header(int version, Geometry geometry, Payload.Layout layout, boolean scaled, double slope, double inter,
                  int datatype, int sformCode, int qformCode, double unitMm) {
    }

    static Header readHeader(Path file, ReadLimits limits) throws InputException {
        InputFiles.requireRegular(file);
        long size = Payload.fileSize(file, file);
        byte[] raw = new byte[NIFTI2_HEADER];
        boolean gzip;
        int got;
        try (InputStream fileIn = Files.newInputStream(file)) {
            byte[] magic = new byte[2];
            int m = Payload.readFully(fileIn, magic, 2);
            gzip = m == 2 && (magic[0] & 0xFF) == 0x1F && (magic[1] & 0xFF) == 0x8B;
        } catch (NoSuchFileException e) {
            throw new InputException(file, "file not found");
        } catch (IOException e) {
            throw new InputException(file, "cannot read: " + e.getMessage(), e);
        }
        try (InputStream fileIn = Files.newInputStream(file);
             InputStream in = gzip ? new GZIPInputStream(fileIn, 4096) : fileIn) {
            got = Payload.readFully(in, raw, raw.length);
        } catch (EOFException e) {
            throw new InputException(file, "truncated header: the gzip stream ends inside the header", e);
        } catch (ZipException e) {
            throw new InputException(file, "corrupt gzip stream: " + e.getMessage(), e);
        } catch (IOException e) {
            throw new InputException(file, "cannot read: " + e.getMessage(), e);
        }
        if (got < 4) {
            throw new InputException(file, "truncated header: " + got + " bytes, a NIfTI header needs 348");
        }
        ByteBuffer le = ByteBuffer.wrap(raw).order(ByteOrder.LITTLE_ENDIAN);
        ByteBuffer be = ByteBuffer.wrap(raw).order(ByteOrder.BIG_ENDIAN);
        int sizeLe = le.getInt(0);
        int sizeBe = be.getInt(0);
        ByteBuffer h;
        int version;
        if (sizeLe == NIFTI1_HEADER || sizeLe == NIFTI2_HEADER) {
            h = le;
            version = sizeLe == NIFTI1_HEADER ? 1 : 2;
        } else if (sizeBe == NIFTI1_HEADER || sizeBe == NIFTI2_HEADER) {
            h = be;
            version = sizeBe == NIFTI1_HEADER ? 1 : 2;
        } else {
            throw new InputException(file, "bad header: sizeof_hdr reads " + sizeLe + " (little-endian) and " + sizeBe
                + " (big-endian); expected 348 (NIfTI-1) or 540 (NIfTI-2)");
        }
        int hdrBytes = version == 1 ? NIFTI1_HEADER : NIFTI2_HEADER;
        if (got < hdrBytes) {
            throw new InputException(file, "truncated header: " + got + " bytes, NIfTI-" + version + " needs " + hdrBytes);
        }
        return version == 1 ? parse1(file, h, size, gzip, limits) : parse2(file, h, size, gzip, limits);
    }

    private static Header parse1(Path file, ByteBuffer h, long size, boolean gzip, ReadLimits limits) throws InputException {
        checkMagic(file, h, 344, '1');
        long[] dim = new long[8];
        for (int i = 0; i < 8; i++) {
            dim[i] = h.getShort(40 + 2 * i);
        }
        double[] pixdim = new double[8];
        for (int i = 0; i < 8; i++) {
            pixdim[i] = h.getFloat(76 + 4 * i);
        }
        double[][] srow = new double[3][4];
        for (int r = 0; r < 3; r++) {
            for (int c = 0; c < 4; c++) {
                srow[r][c] = h.getFloat(280 + 16 * r + 4 * c);
            }
        }
        double voxOffset = h.getFloat(108);
        return build(file, 1, h.order(), size, gzip, limits, h.getShort(70), dim, pixdim, voxOffset,
            h.getFloat(112), h.getFloat(116), h.get(123) & 0xFF, h.getShort(252), h.getShort(254),
            new double[] {h.getFloat(256), h.getFloat(260), h.getFloat(264)},
            new double[] {h.getFloat(268), h.getFloat(272), h.getFloat(276)}, srow);
    }

    private static Header parse2(Path file, ByteBuffer h, long size, boolean gzip, ReadLimits limits) throws InputException {
        checkMagic(file, h, 4, '2');
        long[] dim = new long[8];
        for (int i = 0; i < 8; i++) {
            dim[i] = h.getLong(16 + 8 * i);
        }
        double[] pixdim = new double[8];
        for (int i = 0; i < 8; i++) {
            pixdim[i] = h.getDouble(104 + 8 * i);
        }
        double[][] srow = new double[3][4];
        for (int r = 0; r < 3; r++) {
            for (int c = 0; c < 4; c++) {
                srow[r][c] = h.getDouble(400 + 32 * r + 8 * c);
            }
        }
        return build(file, 2, h.order(), size, gzip, limits, h.getShort(12), dim, pixdim, h.getLong(168),
            h.getDouble(176), h.getDouble(184), h.getInt(500), h.getInt(344), h.getInt(348),
            new double[] {h.getDouble(352), h.getDouble(360), h.getDouble(368)},
            new double[] {h.getDouble(376), h.getDouble(384), h.getDouble(392)}, srow);
    }

    private static void checkMagic(Path file, ByteBuffer h, int at, char version) throws InputException {
        byte m0 = h.get(at);
        byte m1 = h.get(at + 1);
        byte m2 = h.get(at + 2);
        byte m3 = h.get(at + 3);
        if (m0 == 'n' && m1 == '+' && m2 == version && m3 == 0) {
            return;
        }
        if (m0 == 'n' && m1 == 'i' && m2 == version && m3 == 0) {
            throw new InputException(file, "header magic \"ni" + version + "\" marks a detached .hdr/.img pair, which is not"
                + " supported; convert it to a single-file .nii or .nii.gz");
        }
        throw new InputException(file, "bad magic: expected \"n+" + version + "\" at byte " + at + ", found "
            + printable(new byte[] {m0, m1, m2, m3}) + " (not a NIfTI-" + version + " file)");
    }

    private static String printable(byte[] b) {
        StringBuilder sb = new StringBuilder("\"");
        for (byte x : b) {
            if (x >= 32 && x < 127) {
                sb.append((char) x);
            } else {
                sb.append(String.format(Locale.ROOT, "\\x%02x", x & 0xFF));
            }
        }
        return sb.append('"').toString();
    }

    static SampleType sampleType(int datatype) {
        return switch (datatype) {
            case 256 -> SampleType.INT8;
            case 2 -> SampleType.UINT8;
            case 4 -> SampleType.INT16;
            case 512 -> SampleType.UINT16;
            case 8 -> SampleType.INT32;
            case 768 -> SampleType.UINT32;
            case 1024 -> SampleType.INT64;
            case 1280 -> SampleType.UINT64;
            case 16 -> SampleType.FLOAT32;
            case 64 -> SampleType.FLOAT64;
            default -> null;
        };
    }

    private static String datatypeName(int datatype) {
        return switch (datatype) {
            case 1 -> "binary";
            case 32 -> "complex64";
            case 128 -> "RGB24";
            case 1536 -> "float128";
            case 1792 -> "complex128";
            case 2048 -> "complex256";
            case 2304 -> "RGBA32";
            default -> "unknown";
        };
    }

    private static Header build(Path file, int version, ByteOrder order, long size, boolean gzip, ReadLimits limits,
                                int datatype, long[] dim, double[] pixdim, double voxOffset, double slope, double inter,
                                int xyztUnits, int qformCode, int sformCode, double[] quatern, double[] qoffset,
                                double[][] srow) throws InputException {
        long ndim = dim[0];
        if (ndim < 2 || ndim > 7) {
            throw new InputException(file, "dim[0] = " + ndim + " (must be 2..7; is the byte order wrong?)");
        }
        long[] used = new long[(int) ndim];
        System.arraycopy(dim, 1, used, 0, (int) ndim);
        for (int i = 0; i < used.length; i++) {
            if (used[i] <= 0) {
                throw new InputException(file, "dim[" + (i + 1) + "] = " + used[i] + " (must be positive)");
            }
        }
        Payload.voxelCount(file, used, limits);
        for (int i = 4; i <= ndim; i++) {
            if (dim[i] != 1) {
                throw new InputException(file, "dim[" + i + "] = " + dim[i] + ": a " + ndim + "-D series with " + dim[i]
                    + (i == 4 ? " time points" : " entries along dimension " + i) + " is not a single 3-D volume");
            }
        }
        SampleType type = sampleType(datatype);
        if (type == null) {
            throw new InputException(file, "unsupported datatype " + datatype + " (" + datatypeName(datatype) + ")");
        }
        int[] dims = {(int) dim[1], (int) dim[2], ndim >= 3 ? (int) dim[3] : 1};

        double unit = switch (xyztUnits & 0x07) {
            case 1 -> 1000.0; // NIFTI_UNITS_METER
            case 3 -> 0.001;  // NIFTI_UNITS_MICRON
            default -> 1.0;   // NIFTI_UNITS_MM, or unknown: taken as mm
        };
        double[] spacing = new double[3];
        for (int a = 0; a < 3; a++) {
            double p = Math.abs(pixdim[a + 1]) * unit;
            if (!(p > 0) || Double.isInfinite(p)) {
                if (dims[a] == 1) {
                    p = 1.0;
                } else {
                    throw new InputException(file, "pixdim[" + (a + 1) + "] = " + pixdim[a + 1] + " is not a valid voxel size");
                }
            }
            spacing[a] = p;
        }

        double[][] affine;
        if (sformCode > 0) {
            affine = new double[4][4];
            for (int r = 0; r < 3; r++) {
                for (int c = 0; c < 4; c++) {
                    if (!Double.isFinite(srow[r][c])) {
                        throw new InputException(file, "sform row " + r + " holds a non-finite value");
                    }
                    affine[r][c] = srow[r][c] * unit;
                }
            }
            affine[3][3] = 1;
        } else if (qformCode > 0) {
            for (double v : new double[] {quatern[0], quatern[1], quatern[2], qoffset[0], qoffset[1], qoffset[2]}) {
                if (!Double.isFinite(v)) {
                    throw new InputException(file, "qform holds a non-finite value");
                }
            }
            double qfac = pixdim[0] < 0 ? -1 : 1;
            affine = Quaternions.qformAffine(quatern[0], quatern[1], quatern[2], qfac, spacing[0], spacing[1], spacing[2],
                qoffset[0] * unit, qoffset[1] * unit, qoffset[2] * unit);
        } else {
            affine = new double[][] {
                {spacing[0], 0, 0, 0},
                {0, spacing[1], 0, 0},
                {0, 0, spacing[2], 0},
                {0, 0, 0, 1}
            };
        }

        int hdrBytes = version == 1 ? NIFTI1_HEADER : NIFTI2_HEADER;
        if (!(voxOffset >= hdrBytes) || voxOffset != Math.rint(voxOffset) || voxOffset > Long.MAX_VALUE / 2) {
            throw new InputException(file, "vox_offset " + voxOffset + " is not a whole byte offset at or after the "
                + hdrBytes + "-byte header");
        }
        long offset = (long) voxOffset;
        if (!gzip && offset > size) {
            throw new InputException(file, "vox_offset " + offset + " is beyond the end of the file (" + size + " bytes)");
        }
        boolean scaled = Double.isFinite(slope) && slope != 0 && !(slope == 1 && (inter == 0 || !Double.isFinite(inter)));
        double in = Double.isFinite(inter) ? inter : 0;
        Geometry g = new Geometry(dims, spacing, affine);
        Payload.Layout layout = gzip
            ? new Payload.Layout(file, 0, Payload.Compression.GZIP, offset, false, type, order)
            : new Payload.Layout(file, offset, Payload.Compression.RAW, 0, false, type, order);
        return new Header(version, g, layout, scaled, slope, in, datatype, sformCode, qformCode, unit);
    }
}
